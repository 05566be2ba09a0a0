// The few payment API objects the fake serves, with the field names and value types the Stripe SDK expects.
import { randomInt } from 'node:crypto'

export type Metadata = Record<string, string>

export interface CheckoutSession {
  id: string
  object: 'checkout.session'
  after_expiration: null
  allow_promotion_codes: null
  amount_subtotal: number
  amount_total: number
  billing_address_collection: null
  cancel_url: string | null
  client_reference_id: string | null
  created: number
  currency: string
  customer: null
  customer_creation: 'if_required'
  customer_details: { email: string | null; name: string | null; phone: null; address: null; tax_exempt: 'none'; tax_ids: [] } | null
  customer_email: string | null
  expires_at: number
  invoice: null
  livemode: false
  locale: null
  metadata: Metadata
  mode: 'payment'
  payment_intent: string | PaymentIntent | null
  payment_method_types: ['card']
  payment_status: 'unpaid' | 'paid'
  status: 'open' | 'complete' | 'expired'
  submit_type: null
  subscription: null
  success_url: string | null
  total_details: { amount_discount: number; amount_shipping: number; amount_tax: number }
  ui_mode: 'hosted'
  /** Only while the session is open, as the real API does. */
  url: string | null
}

export interface PaymentIntent {
  id: string
  object: 'payment_intent'
  amount: number
  amount_capturable: 0
  amount_received: number
  capture_method: 'automatic'
  client_secret: string
  confirmation_method: 'automatic'
  created: number
  currency: string
  customer: null
  description: string | null
  last_payment_error: null
  latest_charge: string
  livemode: false
  metadata: Metadata
  payment_method: string
  payment_method_types: ['card']
  receipt_email: string | null
  status: 'succeeded'
}

export interface WebhookEvent {
  id: string
  object: 'event'
  api_version: string
  created: number
  data: { object: CheckoutSession }
  livemode: false
  pending_webhooks: number
  request: { id: string | null; idempotency_key: string | null }
  type: 'checkout.session.completed' | 'checkout.session.expired'
}

export interface StripeErrorBody {
  error: {
    type: 'invalid_request_error' | 'idempotency_error' | 'api_error' | 'card_error'
    message: string
    code?: string
    param?: string
    decline_code?: string
  }
}

/** An error the fake answers with Stripe's error JSON. */
export class StripeApiProblem extends Error {
  constructor(
    readonly status: number,
    readonly body: StripeErrorBody,
  ) {
    super(body.error.message)
  }

  static invalid(message: string, extra: { code?: string; param?: string } = {}): StripeApiProblem {
    return new StripeApiProblem(400, { error: { type: 'invalid_request_error', message, ...extra } })
  }

  static missing(kind: string, id: string, param: string): StripeApiProblem {
    return new StripeApiProblem(404, {
      error: { type: 'invalid_request_error', code: 'resource_missing', param, message: `No such ${kind}: '${id}'` },
    })
  }
}

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789'

export function randomToken(length: number): string {
  let out = ''
  for (let i = 0; i < length; i += 1) out += ALPHABET[randomInt(ALPHABET.length)]
  return out
}

export function newId(prefix: string, length = 24): string {
  return `${prefix}${randomToken(length)}`
}

/** Shapes of ids this fake hands out; anything else is refused before any lookup. */
export const SESSION_ID = /^cs_test_[A-Za-z0-9]{24,64}$/
export const PAYMENT_INTENT_ID = /^pi_test_[A-Za-z0-9]{24}$/
export const EVENT_ID = /^evt_[A-Za-z0-9]{24}$/

export function unixNow(nowMs: number): number {
  return Math.floor(nowMs / 1000)
}
