// The mail module: outbox (enqueue in the caller's transaction), worker, transport, templates.
import type { DataSource } from 'typeorm'
import type { Config } from '../config'
import { OutboxWorker, type OutboxWorkerSettings } from './outbox-worker'
import { createMailTransport } from './transport'

export { enqueueMail, InvalidMailError, type OutgoingMail, type OutboxAttachment } from './outbox'
export { OutboxWorker, type OutboxRunResult, type OutboxWorkerOptions, type OutboxWorkerSettings } from './outbox-worker'
export { createMailTransport, smtpOptions, type MailTransport } from './transport'
export * from './templates'

export interface MailService {
  worker: OutboxWorker
  /** Stops the worker (after its batch in flight) and closes the transport. */
  stop(): Promise<void>
}

/** The worker and transport the configuration asks for (SMTP_*, MAIL_FROM, DATA_DIR). */
export function createMailService(dataSource: DataSource, config: Config, overrides: Partial<OutboxWorkerSettings> = {}): MailService {
  const transport = createMailTransport(config)
  const worker = new OutboxWorker(dataSource, transport, { from: config.MAIL_FROM, dataDir: config.DATA_DIR, ...overrides })
  return {
    worker,
    stop: async () => {
      await worker.stop()
      transport.close()
    },
  }
}
