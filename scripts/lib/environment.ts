import path from 'node:path'
import { sessionSecret } from './services'

export interface LocalPorts {
  app: number
  db: number
  smtp: number
  mailbox: number
  payments: number
}

/** The environment of a local run: the caller's variables win over these defaults. */
export function localEnvironment(dataDir: string, ports: LocalPorts, database: string): NodeJS.ProcessEnv {
  const host = '127.0.0.1'
  const defaults: NodeJS.ProcessEnv = {
    HOST: host,
    PORT: String(ports.app),
    DATA_DIR: dataDir,
    DB_HOST: host,
    DB_PORT: String(ports.db),
    DB_NAME: database,
    DB_USER: 'spinwright',
    DB_PASSWORD: 'spinwright-local',
    SESSION_SECRET: sessionSecret(dataDir),
    SMTP_HOST: host,
    SMTP_PORT: String(ports.smtp),
    MAILBOX_URL: `http://${host}:${ports.mailbox}`,
    STRIPE_API_URL: `http://${host}:${ports.payments}`,
    STRIPE_SECRET_KEY: 'sk_test_spinwright_local_fake',
    STRIPE_WEBHOOK_SECRET: 'whsec_spinwright_local_fake',
    PAY_PUBLIC_URL: `http://${host}:${ports.payments}`,
    MAIL_SMTP_PORT: String(ports.smtp),
    MAIL_HTTP_PORT: String(ports.mailbox),
    MAIL_DIR: path.join(dataDir, 'mailbox'),
    PAY_PORT: String(ports.payments),
    PAY_WEBHOOK_URL: `http://${host}:${ports.app}/api/payments/webhook`,
  }
  const merged: NodeJS.ProcessEnv = { ...defaults }
  for (const [key, value] of Object.entries(process.env)) if (value !== undefined) merged[key] = value
  merged.PAY_WEBHOOK_URL = process.env.PAY_WEBHOOK_URL ?? `http://${host}:${merged.PORT}/api/payments/webhook`
  return merged
}
