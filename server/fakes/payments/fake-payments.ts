// Starts the fake payment API on loopback for `npm start`, `npm test` and specs.
import { createServer } from 'node:http'
import { createFakePaymentsApp, type FakePaymentsApp } from './payments-app'
import type { DeliveryResult, WebhookRetryOptions } from './webhook-sender'

export { createFakePaymentsApp } from './payments-app'
export type { FakePaymentsApp, FakePaymentsAppOptions, FakeEventSummary } from './payments-app'
export type { DeliveryResult, WebhookRetryOptions } from './webhook-sender'

export interface FakePaymentsOptions {
  /** 0 picks a free port. */
  port: number
  /** Loopback by default. */
  host?: string
  /** The app's webhook endpoint; null records events without sending them. */
  webhookUrl: string | null
  webhookSecret: string
  /** Origin for the hosted page links when the browser reaches the fake by another name. */
  publicBaseUrl?: string
  webhookRetry?: WebhookRetryOptions
}

export interface FakePaymentsHandle {
  port: number
  /** Base URL of the fake, e.g. http://127.0.0.1:4242 */
  url: string
  close(): Promise<void>
  resend(eventId: string): Promise<DeliveryResult>
  /** The in-process app, for inspecting recorded events. */
  fake: FakePaymentsApp
}

export async function startFakePayments(options: FakePaymentsOptions): Promise<FakePaymentsHandle> {
  const host = options.host ?? '127.0.0.1'
  const fake = createFakePaymentsApp({
    webhookUrl: options.webhookUrl,
    webhookSecret: options.webhookSecret,
    publicBaseUrl: options.publicBaseUrl,
    webhookRetry: options.webhookRetry,
  })
  const server = createServer(fake.app)
  const port = await new Promise<number>((resolve, reject) => {
    server.once('error', reject)
    server.listen(options.port, host, () => {
      server.off('error', reject)
      const address = server.address()
      if (address === null || typeof address === 'string') reject(new Error('server has no TCP address'))
      else resolve(address.port)
    })
  }).catch((error: unknown) => {
    fake.dispose()
    throw error
  })
  const url = `http://${host.includes(':') ? `[${host}]` : host}:${port}`
  if (!options.publicBaseUrl) fake.setPublicBaseUrl(url)

  let closing: Promise<void> | null = null
  return {
    port,
    url,
    fake,
    resend: (eventId) => fake.resend(eventId),
    close() {
      closing ??= new Promise<void>((resolve) => {
        fake.dispose()
        server.close(() => resolve())
        // The SDK keeps connections alive; without this close() would wait for them to time out.
        server.closeAllConnections()
      })
      return closing
    },
  }
}
