// Settings of the local fakes, read once from the environment and checked before anything starts.
import { z } from 'zod'

const port = (fallback: number) =>
  z.coerce.number().int().min(0, 'must be 0 (any free port) or a port number').max(65535).default(fallback)

const schema = z.object({
  MAIL_SMTP_PORT: port(2525),
  MAIL_HTTP_PORT: port(2580),
  MAIL_DIR: z.string().min(1).default('data/mail'),
  PAY_PORT: port(4242),
  PAY_WEBHOOK_URL: z.url({ protocol: /^https?$/, error: 'set it to the app\'s webhook endpoint, e.g. http://127.0.0.1:3000/api/payments/webhook' }),
  STRIPE_WEBHOOK_SECRET: z.string().min(1, 'set it to the webhook signing secret the app verifies with (whsec_...)'),
  PAY_PUBLIC_URL: z.url({ protocol: /^https?$/ }).optional(),
})

export interface FakesConfig {
  mail: { smtpPort: number; httpPort: number; dir: string }
  payments: { port: number; webhookUrl: string; webhookSecret: string; publicBaseUrl?: string }
}

export function readFakesConfig(env: Record<string, string | undefined>): FakesConfig {
  // An empty variable means "not set", as in most shells' `VAR= command`.
  const present = Object.fromEntries(Object.entries(env).filter(([, value]) => value !== undefined && value !== ''))
  const parsed = schema.safeParse(present)
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join('.')}: ${issue.message}`)
    throw new Error(`The local fakes cannot start; fix these environment variables:\n${lines.join('\n')}`)
  }
  const c = parsed.data
  return {
    mail: { smtpPort: c.MAIL_SMTP_PORT, httpPort: c.MAIL_HTTP_PORT, dir: c.MAIL_DIR },
    payments: {
      port: c.PAY_PORT,
      webhookUrl: c.PAY_WEBHOOK_URL,
      webhookSecret: c.STRIPE_WEBHOOK_SECRET,
      ...(c.PAY_PUBLIC_URL ? { publicBaseUrl: c.PAY_PUBLIC_URL } : {}),
    },
  }
}
