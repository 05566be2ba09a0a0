// The SMTP transport, made from configuration only: the local fake by default, a real server
// (implicit TLS or STARTTLS, with credentials) when SMTP_* say so.
import nodemailer, { type SendMailOptions } from 'nodemailer'
import type SMTPTransport from 'nodemailer/lib/smtp-transport'
import type { Config } from '../config'

/** The one thing the outbox worker needs from a transport; nodemailer's Transporter fits it. */
export interface MailTransport {
  sendMail(mail: SendMailOptions): Promise<{ messageId?: string; response?: string }>
}

export type SmtpSettings = Pick<Config, 'SMTP_HOST' | 'SMTP_PORT' | 'SMTP_SECURE' | 'SMTP_USER' | 'SMTP_PASSWORD'>

const LOOPBACK = new Set(['127.0.0.1', '::1', 'localhost'])

/** nodemailer options for the configured server (exported so the choice can be tested). */
export function smtpOptions(settings: SmtpSettings): SMTPTransport.Options {
  const auth = settings.SMTP_USER ? { user: settings.SMTP_USER, pass: settings.SMTP_PASSWORD ?? '' } : undefined
  return {
    host: settings.SMTP_HOST,
    port: settings.SMTP_PORT,
    // true: TLS from the first byte (port 465). false: plain, upgraded with STARTTLS when offered.
    secure: settings.SMTP_SECURE,
    // Credentials never travel in the clear to a remote server: insist on STARTTLS there.
    requireTLS: !settings.SMTP_SECURE && auth !== undefined && !LOOPBACK.has(settings.SMTP_HOST),
    auth,
    // A server that is down should fail the attempt quickly; the outbox retries later.
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 60_000,
  }
}

export function createMailTransport(settings: SmtpSettings): MailTransport & { close(): void } {
  return nodemailer.createTransport(smtpOptions(settings))
}
