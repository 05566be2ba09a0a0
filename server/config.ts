// Configuration, read once from the environment and validated; a bad value stops start-up with a
// message naming the variable. .env.example documents every variable.
import { z } from 'zod'

const bool = z.enum(['true', 'false', '1', '0']).transform((value) => value === 'true' || value === '1')
const port = z.coerce.number().int().min(0).max(65535)

const schema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().min(1).default('127.0.0.1'),
  PORT: port.default(8080),
  PUBLIC_URL: z.url().optional(),
  DATA_DIR: z.string().min(1).default('.data'),
  DB_HOST: z.string().min(1).default('127.0.0.1'),
  DB_PORT: port.default(3307),
  DB_NAME: z.string().regex(/^[A-Za-z0-9_]+$/, { error: 'letters, digits and _ only' }).default('spinwright'),
  DB_USER: z.string().min(1).default('spinwright'),
  DB_PASSWORD: z.string().default('spinwright-local'),
  SESSION_SECRET: z.string().min(32, { error: 'must be at least 32 characters' }),
  COOKIE_SECURE: z.enum(['auto', 'true', 'false']).default('auto'),
  TRUST_PROXY: bool.default(false),
  COMPRESS_RESPONSES: bool.default(true),
  // Worker threads for duty study runs (0: in the app's own thread); by default one per core, at most 4, none on one core.
  SELECTION_WORKERS: z.coerce.number().int().min(0).max(16).optional(),
  // Catalogues smaller than this run in the app's own thread: passing a study to workers costs more than it saves there.
  SELECTION_POOL_MIN_VARIANTS: z.coerce.number().int().min(0).default(10_000),
  SIGNIN_LIMIT_PER_IP: z.coerce.number().int().positive().default(30),
  SIGNIN_LIMIT_PER_ACCOUNT: z.coerce.number().int().positive().default(10),
  SIGNIN_WINDOW_MINUTES: z.coerce.number().int().positive().default(15),
  SMTP_HOST: z.string().min(1).default('127.0.0.1'),
  SMTP_PORT: port.default(2525),
  SMTP_SECURE: bool.default(false),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().min(3).default('Spinwright at Ashcombe Motor Works <quotes@ashcombe.test>'),
  MAILBOX_URL: z.url().default('http://127.0.0.1:2580'),
  STRIPE_SECRET_KEY: z.string().regex(/^sk_test_/, { error: 'must be a test-mode key (sk_test_...)' }).default('sk_test_spinwright_local_fake'),
  STRIPE_WEBHOOK_SECRET: z.string().min(8).default('whsec_spinwright_local_fake'),
  STRIPE_API_URL: z.url().optional(),
})

export type Config = z.infer<typeof schema>

export class ConfigError extends Error {}

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = schema.safeParse(env)
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join('.')}: ${issue.message}`)
    throw new ConfigError(`invalid configuration; set these environment variables:\n${lines.join('\n')}`)
  }
  return parsed.data
}
