// Reads the form-encoded parameters of "create a Checkout Session" the way the real API checks them.
import { StripeApiProblem, type Metadata } from './stripe-shapes'

export interface LineItemInput {
  name: string
  description: string | null
  currency: string
  unitAmount: number
  quantity: number
}

export interface CreateSessionInput {
  lineItems: LineItemInput[]
  currency: string
  amountTotal: number
  successUrl: string | null
  cancelUrl: string | null
  clientReferenceId: string | null
  customerEmail: string | null
  metadata: Metadata
  expiresAt: number | null
  expand: string[]
}

// Parameters the real endpoint takes that change nothing in this fake; anything else is refused,
// so the app cannot come to depend on a parameter the real service would reject.
const ACCEPTED_AND_IGNORED = new Set([
  'allow_promotion_codes',
  'billing_address_collection',
  'customer_creation',
  'locale',
  'payment_intent_data',
  'payment_method_types',
  'phone_number_collection',
  'submit_type',
])
const HANDLED = new Set([
  'mode',
  'line_items',
  'success_url',
  'cancel_url',
  'client_reference_id',
  'customer_email',
  'metadata',
  'expires_at',
  'expand',
  'ui_mode',
])

const MAX_AMOUNT = 99_999_999
const EXPIRY_MIN_S = 30 * 60
const EXPIRY_MAX_S = 24 * 60 * 60

type Body = Record<string, unknown>

function isBody(value: unknown): value is Body {
  return typeof value === 'object' && value !== null && !Array.isArray(value)
}

function missing(param: string): StripeApiProblem {
  return StripeApiProblem.invalid(`Missing required param: ${param}.`, { code: 'parameter_missing', param })
}

function optionalString(body: Body, key: string, param: string, maxLength = 5000): string | null {
  const value = body[key]
  if (value === undefined || value === '') return null
  if (typeof value !== 'string') throw StripeApiProblem.invalid(`Invalid string: ${param}`, { code: 'parameter_invalid_string', param })
  if (value.length > maxLength) {
    throw StripeApiProblem.invalid(`${param} is longer than ${maxLength} characters.`, { code: 'parameter_invalid_string', param })
  }
  return value
}

function requiredString(body: Body, key: string, param: string, maxLength?: number): string {
  const value = optionalString(body, key, param, maxLength)
  if (value === null) throw missing(param)
  return value
}

function integer(value: string, param: string, min: number): number {
  if (!/^-?[0-9]+$/.test(value)) throw StripeApiProblem.invalid(`Invalid integer: ${value}`, { code: 'parameter_invalid_integer', param })
  const parsed = Number(value)
  if (!Number.isSafeInteger(parsed) || parsed < min) {
    throw StripeApiProblem.invalid(`${param} must be at least ${min}.`, { code: 'parameter_invalid_integer', param })
  }
  return parsed
}

function url(body: Body, key: string): string | null {
  const value = optionalString(body, key, key, 5000)
  if (value === null) return null
  let parsed: URL
  try {
    parsed = new URL(value)
  } catch {
    throw StripeApiProblem.invalid('Not a valid URL', { code: 'url_invalid', param: key })
  }
  if (parsed.protocol !== 'http:' && parsed.protocol !== 'https:') {
    throw StripeApiProblem.invalid('Not a valid URL', { code: 'url_invalid', param: key })
  }
  return value
}

/** qs turns `a[0]`..`a[20]` into an array and longer lists into an object keyed by index. */
function listOf(value: unknown, param: string): unknown[] {
  if (Array.isArray(value)) return value
  if (isBody(value)) {
    const keys = Object.keys(value)
    if (keys.every((key) => /^[0-9]+$/.test(key))) {
      return keys.sort((a, b) => Number(a) - Number(b)).map((key) => value[key])
    }
  }
  throw StripeApiProblem.invalid(`Invalid array: ${param}`, { code: 'parameter_invalid_array', param })
}

export function currencyDigits(currency: string): number | null {
  try {
    return new Intl.NumberFormat('en', { style: 'currency', currency: currency.toUpperCase() }).resolvedOptions()
      .maximumFractionDigits ?? null
  } catch {
    return null
  }
}

function metadata(value: unknown): Metadata {
  if (value === undefined || value === '') return {}
  if (!isBody(value)) throw StripeApiProblem.invalid('Invalid object: metadata', { code: 'parameter_invalid_object', param: 'metadata' })
  const out: Metadata = {}
  for (const [key, entry] of Object.entries(value)) {
    const param = `metadata[${key}]`
    if (typeof entry !== 'string') throw StripeApiProblem.invalid(`Invalid string: ${param}`, { code: 'parameter_invalid_string', param })
    if (key.length > 40 || entry.length > 500) {
      throw StripeApiProblem.invalid('Metadata keys are limited to 40 characters and values to 500.', { param })
    }
    if (entry !== '') out[key] = entry
  }
  if (Object.keys(out).length > 50) throw StripeApiProblem.invalid('Metadata holds at most 50 keys.', { param: 'metadata' })
  return out
}

function lineItem(value: unknown, index: number): LineItemInput {
  const at = `line_items[${index}]`
  if (!isBody(value)) throw StripeApiProblem.invalid(`Invalid object: ${at}`, { code: 'parameter_invalid_object', param: at })
  for (const key of Object.keys(value)) {
    if (key !== 'price_data' && key !== 'quantity') {
      throw StripeApiProblem.invalid(`Received unknown parameter: ${at}[${key}] (this fake supports price_data and quantity only)`, {
        code: 'parameter_unknown',
        param: `${at}[${key}]`,
      })
    }
  }
  const priceData = value.price_data
  if (!isBody(priceData)) throw missing(`${at}[price_data]`)
  const currency = requiredString(priceData, 'currency', `${at}[price_data][currency]`).toLowerCase()
  if (!/^[a-z]{3}$/.test(currency) || currencyDigits(currency) === null) {
    throw StripeApiProblem.invalid(`Invalid currency: ${currency}.`, { param: `${at}[price_data][currency]` })
  }
  const unitAmount = integer(requiredString(priceData, 'unit_amount', `${at}[price_data][unit_amount]`), `${at}[price_data][unit_amount]`, 0)
  const productData = priceData.product_data
  if (!isBody(productData)) throw missing(`${at}[price_data][product_data]`)
  const name = requiredString(productData, 'name', `${at}[price_data][product_data][name]`, 250)
  const description = optionalString(productData, 'description', `${at}[price_data][product_data][description]`, 500)
  const quantity = integer(requiredString(value, 'quantity', `${at}[quantity]`), `${at}[quantity]`, 1)
  return { name, description, currency, unitAmount, quantity }
}

export function parseCreateSession(body: unknown, nowSeconds: number): CreateSessionInput {
  const params = isBody(body) ? body : {}
  for (const key of Object.keys(params)) {
    if (!HANDLED.has(key) && !ACCEPTED_AND_IGNORED.has(key)) {
      throw StripeApiProblem.invalid(`Received unknown parameter: ${key}`, { code: 'parameter_unknown', param: key })
    }
  }

  const mode = requiredString(params, 'mode', 'mode')
  if (mode !== 'payment') {
    throw StripeApiProblem.invalid(`This fake supports mode=payment only, not ${mode}.`, { code: 'parameter_invalid_string', param: 'mode' })
  }
  const uiMode = optionalString(params, 'ui_mode', 'ui_mode')
  if (uiMode !== null && uiMode !== 'hosted') {
    throw StripeApiProblem.invalid('This fake serves the hosted checkout page only (ui_mode=hosted).', { param: 'ui_mode' })
  }

  if (params.line_items === undefined) throw missing('line_items')
  const lineItems = listOf(params.line_items, 'line_items').map(lineItem)
  const first = lineItems[0]
  if (!first) throw missing('line_items')
  if (lineItems.length > 100) throw StripeApiProblem.invalid('A Checkout Session holds at most 100 line items.', { param: 'line_items' })
  if (lineItems.some((item) => item.currency !== first.currency)) {
    throw StripeApiProblem.invalid('All line items must use the same currency.', { param: 'line_items' })
  }
  const amountTotal = lineItems.reduce((sum, item) => sum + item.unitAmount * item.quantity, 0)
  if (amountTotal <= 0 || amountTotal > MAX_AMOUNT) {
    throw StripeApiProblem.invalid(`The total must be above 0 and at most ${MAX_AMOUNT} in the smallest currency unit.`, {
      code: 'amount_too_large',
      param: 'line_items',
    })
  }

  const customerEmail = optionalString(params, 'customer_email', 'customer_email', 800)
  if (customerEmail !== null && !/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(customerEmail)) {
    throw StripeApiProblem.invalid(`Invalid email address: ${customerEmail}`, { code: 'email_invalid', param: 'customer_email' })
  }

  let expiresAt: number | null = null
  const expiresRaw = optionalString(params, 'expires_at', 'expires_at')
  if (expiresRaw !== null) {
    expiresAt = integer(expiresRaw, 'expires_at', 0)
    if (expiresAt < nowSeconds + EXPIRY_MIN_S - 5 || expiresAt > nowSeconds + EXPIRY_MAX_S + 5) {
      throw StripeApiProblem.invalid('expires_at must be between 30 minutes and 24 hours from now.', {
        code: 'parameter_invalid_integer',
        param: 'expires_at',
      })
    }
  }

  return {
    lineItems,
    currency: first.currency,
    amountTotal,
    successUrl: url(params, 'success_url'),
    cancelUrl: url(params, 'cancel_url'),
    clientReferenceId: optionalString(params, 'client_reference_id', 'client_reference_id', 200),
    customerEmail,
    metadata: metadata(params.metadata),
    expiresAt,
    expand: parseExpand(params.expand),
  }
}

/** `expand[]` as sent in a query string or a body; only known names matter to callers. */
export function parseExpand(value: unknown): string[] {
  if (value === undefined || value === '') return []
  const list = typeof value === 'string' ? [value] : listOf(value, 'expand')
  return list.map((entry, index) => {
    if (typeof entry !== 'string') {
      throw StripeApiProblem.invalid(`Invalid string: expand[${index}]`, { code: 'parameter_invalid_string', param: `expand[${index}]` })
    }
    return entry
  })
}
