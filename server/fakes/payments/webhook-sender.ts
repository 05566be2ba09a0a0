// Signs events the way the payment API does and posts them to the app, retrying a few times with backoff.
import Stripe from 'stripe'
import type { WebhookEvent } from './stripe-shapes'

export interface DeliveryAttempt {
  at: string
  /** HTTP status the endpoint answered, or null when it could not be reached. */
  status: number | null
  error: string | null
}

export interface DeliveryResult {
  eventId: string
  delivered: boolean
  status: number | null
  error: string | null
}

export interface WebhookRetryOptions {
  /** Attempts in all, the first one included (default 5). */
  attempts?: number
  /** Wait before the second attempt; doubles each time (default 250 ms). */
  baseDelayMs?: number
  maxDelayMs?: number
  /** Per attempt (default 5 s). */
  timeoutMs?: number
}

export interface Delivery {
  /** Settles after the first attempt. */
  first: Promise<DeliveryResult>
  /** Settles once delivered or out of attempts. */
  done: Promise<DeliveryResult>
}

export class WebhookSender {
  private readonly attempts: number
  private readonly baseDelayMs: number
  private readonly maxDelayMs: number
  private readonly timeoutMs: number
  private readonly stop = new AbortController()
  private readonly waits = new Set<{ timer: NodeJS.Timeout; wake: () => void }>()

  constructor(
    private readonly url: string | null,
    private readonly secret: string,
    retry: WebhookRetryOptions = {},
  ) {
    this.attempts = Math.max(1, retry.attempts ?? 5)
    this.baseDelayMs = retry.baseDelayMs ?? 250
    this.maxDelayMs = retry.maxDelayMs ?? 4000
    this.timeoutMs = retry.timeoutMs ?? 5000
  }

  /** Sends one event; each attempt is appended to `log` as it finishes. */
  deliver(event: WebhookEvent, log: DeliveryAttempt[]): Delivery {
    // Pretty-printed like the real service; the signature covers these exact bytes.
    const payload = JSON.stringify(event, null, 2)
    let settleFirst: (result: DeliveryResult) => void = () => undefined
    const first = new Promise<DeliveryResult>((resolve) => {
      settleFirst = resolve
    })
    const done = (async (): Promise<DeliveryResult> => {
      let last: DeliveryResult = { eventId: event.id, delivered: false, status: null, error: 'not sent' }
      for (let attempt = 0; attempt < this.attempts && !this.stop.signal.aborted; attempt += 1) {
        if (attempt > 0) await this.wait(Math.min(this.baseDelayMs * 2 ** (attempt - 1), this.maxDelayMs))
        if (this.stop.signal.aborted) break
        last = await this.attempt(event.id, payload)
        log.push({ at: new Date().toISOString(), status: last.status, error: last.error })
        if (attempt === 0) settleFirst(last)
        if (last.delivered || this.url === null) break
      }
      settleFirst(last)
      return last
    })()
    return { first, done }
  }

  /** Cancels waiting retries and requests in flight. */
  dispose(): void {
    this.stop.abort()
    for (const wait of this.waits) {
      clearTimeout(wait.timer)
      wait.wake()
    }
    this.waits.clear()
  }

  private async attempt(eventId: string, payload: string): Promise<DeliveryResult> {
    if (this.url === null) return { eventId, delivered: false, status: null, error: 'no webhook URL configured' }
    const header = Stripe.webhooks.generateTestHeaderString({ payload, secret: this.secret })
    try {
      const res = await fetch(this.url, {
        method: 'POST',
        headers: {
          'Content-Type': 'application/json; charset=utf-8',
          'Stripe-Signature': header,
          'User-Agent': 'SpinwrightFakePayments/1.0',
        },
        body: payload,
        redirect: 'manual',
        signal: AbortSignal.any([this.stop.signal, AbortSignal.timeout(this.timeoutMs)]),
      })
      await res.arrayBuffer().catch(() => undefined)
      const delivered = res.status >= 200 && res.status < 300
      return { eventId, delivered, status: res.status, error: delivered ? null : `endpoint answered ${res.status}` }
    } catch (error) {
      return { eventId, delivered: false, status: null, error: describe(error) }
    }
  }

  private wait(ms: number): Promise<void> {
    return new Promise((resolve) => {
      const entry = {
        timer: setTimeout(() => {
          this.waits.delete(entry)
          resolve()
        }, ms),
        wake: resolve,
      }
      entry.timer.unref()
      this.waits.add(entry)
    })
  }
}

function describe(error: unknown): string {
  if (error instanceof Error) {
    const cause = error.cause instanceof Error ? `: ${error.cause.message}` : ''
    return `${error.message}${cause}`
  }
  return String(error)
}
