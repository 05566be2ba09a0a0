// The one Stripe SDK client of the server. STRIPE_API_URL points it at the local fake of the payment
// API; without it the SDK talks to Stripe's own (test-mode, since config only admits sk_test_ keys).
import Stripe from 'stripe'
import type { Config } from '../config'

// A deposit start holds the quote's row lock while it waits for the payment API: keep the wait short.
const TIMEOUT_MS = 20_000

export function createStripeClient(config: Pick<Config, 'STRIPE_SECRET_KEY' | 'STRIPE_API_URL'>): Stripe {
  if (!config.STRIPE_API_URL) return new Stripe(config.STRIPE_SECRET_KEY, { timeout: TIMEOUT_MS })
  const url = new URL(config.STRIPE_API_URL)
  const protocol = url.protocol === 'https:' ? 'https' : 'http'
  return new Stripe(config.STRIPE_SECRET_KEY, {
    host: url.hostname.replace(/^\[(.*)\]$/, '$1'),
    port: url.port === '' ? (protocol === 'https' ? 443 : 80) : Number(url.port),
    protocol,
    // Retries are ours to decide (each create carries an idempotency key).
    maxNetworkRetries: 0,
    telemetry: false,
    timeout: TIMEOUT_MS,
  })
}

/**
 * True when the payment API could not be reached or failed on its side (an operational fault the
 * buyer can retry later), as opposed to a request we built wrongly.
 */
export function isPaymentApiDown(error: unknown): boolean {
  if (error instanceof Stripe.errors.StripeConnectionError) return true
  if (error instanceof Stripe.errors.StripeAPIError) return true
  if (error instanceof Stripe.errors.StripeRateLimitError) return true
  return error instanceof Stripe.errors.StripeError && (error.statusCode ?? 0) >= 500
}

/** Our key refused: a configuration fault, reported to the buyer as the service being unavailable. */
export function isPaymentApiMisconfigured(error: unknown): boolean {
  return error instanceof Stripe.errors.StripeAuthenticationError || error instanceof Stripe.errors.StripePermissionError
}

/** The API does not know the object (e.g. the local fake restarted and forgot its sessions). */
export function isMissingResource(error: unknown): boolean {
  return error instanceof Stripe.errors.StripeInvalidRequestError && error.code === 'resource_missing'
}
