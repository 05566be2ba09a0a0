// Express app of the fake payment API: the Checkout Session subset a deposit needs, the hosted test
// checkout page, and signed webhooks. State lives in memory; a restart forgets everything.
import express, { type NextFunction, type Request, type Response } from 'express'
import Stripe from 'stripe'
import { PAGE_CSP, renderCheckoutPage, renderNoticePage, type CheckoutFormValues } from './checkout-page'
import { parseCreateSession, parseExpand, type LineItemInput } from './session-params'
import {
  EVENT_ID,
  PAYMENT_INTENT_ID,
  SESSION_ID,
  StripeApiProblem,
  newId,
  randomToken,
  unixNow,
  type CheckoutSession,
  type PaymentIntent,
  type WebhookEvent,
} from './stripe-shapes'
import { WebhookSender, type DeliveryAttempt, type DeliveryResult, type WebhookRetryOptions } from './webhook-sender'

export interface FakePaymentsAppOptions {
  /** Where events are posted; null records them without sending. */
  webhookUrl: string | null
  /** Signing secret shared with the app (whsec_...). */
  webhookSecret: string
  /** Origin the browser reaches the hosted page on; by default the Host of each create request. */
  publicBaseUrl?: string
  webhookRetry?: WebhookRetryOptions
  /** Clock in milliseconds, for tests of natural expiry. */
  now?: () => number
}

export interface FakeEventSummary {
  id: string
  type: WebhookEvent['type']
  created: number
  sessionId: string
  delivered: boolean
  deliveries: DeliveryAttempt[]
}

export interface FakePaymentsApp {
  app: express.Express
  /** Sends a recorded event again (same id and body, fresh signature); settles after the first attempt. */
  resend(eventId: string): Promise<DeliveryResult>
  events(): FakeEventSummary[]
  /** Used by startFakePayments once the real port is known. */
  setPublicBaseUrl(url: string): void
  /** Stops retries and the expiry sweep. */
  dispose(): void
}

interface SessionRecord {
  session: CheckoutSession
  lineItems: LineItemInput[]
  apiVersion: string
}

interface EventRecord {
  event: WebhookEvent
  delivered: boolean
  deliveries: DeliveryAttempt[]
}

interface StoredReply {
  fingerprint: string
  status: number
  body: unknown
}

interface RequestInfo {
  id: string | null
  idempotencyKey: string | null
}

const CARD_OK = '4242424242424242'
const CARD_DECLINES: Record<string, { code: string; message: string }> = {
  '4000000000000002': { code: 'generic_decline', message: 'Your card was declined.' },
  '4000000000009995': { code: 'insufficient_funds', message: 'Your card was declined: insufficient funds.' },
}
const DEFAULT_EXPIRY_S = 24 * 60 * 60
const MAX_IDEMPOTENCY_KEYS = 10_000

export function createFakePaymentsApp(options: FakePaymentsAppOptions): FakePaymentsApp {
  const now = options.now ?? Date.now
  let publicBaseUrl = options.publicBaseUrl?.replace(/\/+$/, '') ?? null
  const sender = new WebhookSender(options.webhookUrl, options.webhookSecret, options.webhookRetry)
  const sessions = new Map<string, SessionRecord>()
  const paymentIntents = new Map<string, PaymentIntent>()
  const events = new Map<string, EventRecord>()
  const replies = new Map<string, StoredReply>()

  function emit(record: SessionRecord, type: WebhookEvent['type'], request: RequestInfo): { id: string; first: Promise<DeliveryResult> } {
    const event: WebhookEvent = {
      id: newId('evt_'),
      object: 'event',
      api_version: record.apiVersion,
      created: unixNow(now()),
      // A snapshot: later changes to the session must not rewrite an event already sent.
      data: { object: structuredClone(record.session) },
      livemode: false,
      pending_webhooks: options.webhookUrl === null ? 0 : 1,
      request: { id: request.id, idempotency_key: request.idempotencyKey },
      type,
    }
    const entry: EventRecord = { event, delivered: false, deliveries: [] }
    events.set(event.id, entry)
    return { id: event.id, first: send(entry) }
  }

  function send(entry: EventRecord): Promise<DeliveryResult> {
    const delivery = sender.deliver(entry.event, entry.deliveries)
    void delivery.done.then((result) => {
      if (result.delivered) {
        entry.delivered = true
        entry.event.pending_webhooks = 0
      }
    })
    return delivery.first
  }

  function expire(record: SessionRecord, request: RequestInfo): void {
    record.session.status = 'expired'
    record.session.url = null
    emit(record, 'checkout.session.expired', request)
  }

  /** Sessions past expires_at expire when next looked at, and on a periodic sweep. */
  function refresh(record: SessionRecord): SessionRecord {
    if (record.session.status === 'open' && now() >= record.session.expires_at * 1000) {
      expire(record, { id: null, idempotencyKey: null })
    }
    return record
  }

  function findSession(id: string): SessionRecord | null {
    const record = SESSION_ID.test(id) ? sessions.get(id) : undefined
    return record ? refresh(record) : null
  }

  function present(record: SessionRecord, expand: string[]): CheckoutSession {
    const session = structuredClone(record.session)
    if (expand.includes('payment_intent') && typeof session.payment_intent === 'string') {
      session.payment_intent = paymentIntents.get(session.payment_intent) ?? session.payment_intent
    }
    return session
  }

  function complete(record: SessionRecord, cardholder: string): { first: Promise<DeliveryResult> } {
    const session = record.session
    const created = unixNow(now())
    const intent: PaymentIntent = {
      id: newId('pi_test_'),
      object: 'payment_intent',
      amount: session.amount_total,
      amount_capturable: 0,
      amount_received: session.amount_total,
      capture_method: 'automatic',
      client_secret: '',
      confirmation_method: 'automatic',
      created,
      currency: session.currency,
      customer: null,
      description: null,
      last_payment_error: null,
      latest_charge: newId('ch_test_'),
      livemode: false,
      metadata: {},
      payment_method: newId('pm_test_'),
      payment_method_types: ['card'],
      receipt_email: session.customer_email,
      status: 'succeeded',
    }
    intent.client_secret = `${intent.id}_secret_${randomToken(25)}`
    paymentIntents.set(intent.id, intent)
    session.status = 'complete'
    session.payment_status = 'paid'
    session.payment_intent = intent.id
    session.url = null
    session.customer_details = {
      email: session.customer_email,
      name: cardholder,
      phone: null,
      address: null,
      tax_exempt: 'none',
      tax_ids: [],
    }
    return emit(record, 'checkout.session.completed', { id: null, idempotencyKey: null })
  }

  const sweep = setInterval(() => {
    for (const record of sessions.values()) refresh(record)
  }, 15_000)
  sweep.unref()

  const app = express()
  app.disable('x-powered-by')
  // The SDK sends `expand[0]=...` on GET requests; the default "simple" parser would not nest it.
  app.set('query parser', 'extended')

  // ---- test hooks -------------------------------------------------------------------------------
  app.get('/_fake/health', (_req, res) => {
    res.json({ ok: true, sessions: sessions.size, events: events.size })
  })

  app.get('/_fake/events', (_req, res) => {
    res.json({ events: summaries() })
  })

  app.post('/_fake/events/:id/resend', async (req, res) => {
    const entry = EVENT_ID.test(req.params.id) ? events.get(req.params.id) : undefined
    if (!entry) {
      res.status(404).json({ error: { type: 'invalid_request_error', code: 'resource_missing', message: `No such event: '${req.params.id}'` } })
      return
    }
    res.json(await send(entry))
  })

  // ---- the API the SDK talks to -----------------------------------------------------------------
  const api = express.Router()
  api.use(requireTestKey)
  api.use(express.urlencoded({ extended: true, limit: '1mb' }))
  api.use((req, res, next) => {
    res.set('Request-Id', newId('req_', 14))
    res.set('Stripe-Version', apiVersionOf(req))
    next()
  })
  api.use(idempotency(replies))

  api.post('/checkout/sessions', (req, res) => {
    const createdMs = now()
    const created = unixNow(createdMs)
    const input = parseCreateSession(req.body, created)
    const id = `cs_test_${randomToken(48)}`
    const base = publicBaseUrl ?? `${req.protocol}://${req.get('host') ?? '127.0.0.1'}`
    const session: CheckoutSession = {
      id,
      object: 'checkout.session',
      after_expiration: null,
      allow_promotion_codes: null,
      amount_subtotal: input.amountTotal,
      amount_total: input.amountTotal,
      billing_address_collection: null,
      cancel_url: input.cancelUrl,
      client_reference_id: input.clientReferenceId,
      created,
      currency: input.currency,
      customer: null,
      customer_creation: 'if_required',
      customer_details: null,
      customer_email: input.customerEmail,
      expires_at: input.expiresAt ?? created + DEFAULT_EXPIRY_S,
      invoice: null,
      livemode: false,
      locale: null,
      metadata: input.metadata,
      mode: 'payment',
      payment_intent: null,
      payment_method_types: ['card'],
      payment_status: 'unpaid',
      status: 'open',
      submit_type: null,
      subscription: null,
      success_url: input.successUrl,
      total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
      ui_mode: 'hosted',
      url: `${base}/pay/${id}`,
    }
    const record: SessionRecord = { session, lineItems: input.lineItems, apiVersion: apiVersionOf(req) }
    sessions.set(id, record)
    res.json(present(record, input.expand))
  })

  api.get('/checkout/sessions/:id', (req, res) => {
    const record = findSession(req.params.id)
    if (!record) throw StripeApiProblem.missing('checkout.session', req.params.id, 'session')
    res.json(present(record, parseExpand(req.query.expand)))
  })

  api.post('/checkout/sessions/:id/expire', (req, res) => {
    const record = findSession(req.params.id)
    if (!record) throw StripeApiProblem.missing('checkout.session', req.params.id, 'session')
    if (record.session.status !== 'open') {
      throw StripeApiProblem.invalid(
        `Only an open Checkout Session can be expired; this one is ${record.session.status}.`,
        { code: 'checkout_session_not_open' },
      )
    }
    expire(record, { id: res.get('Request-Id') ?? null, idempotencyKey: req.get('Idempotency-Key') ?? null })
    res.json(present(record, parseExpand(isRecord(req.body) ? req.body.expand : undefined)))
  })

  api.get('/payment_intents/:id', (req, res) => {
    const intent = PAYMENT_INTENT_ID.test(req.params.id) ? paymentIntents.get(req.params.id) : undefined
    if (!intent) throw StripeApiProblem.missing('payment_intent', req.params.id, 'intent')
    res.json(intent)
  })

  api.use((req) => {
    throw new StripeApiProblem(404, {
      error: {
        type: 'invalid_request_error',
        message: `Unrecognized request URL (${req.method}: ${req.originalUrl.split('?')[0]}). This fake serves only the Checkout Session subset a deposit needs.`,
      },
    })
  })

  api.use((error: unknown, _req: Request, res: Response, _next: NextFunction) => {
    if (error instanceof StripeApiProblem) {
      res.status(error.status).json(error.body)
      return
    }
    if (isRecord(error) && error.type === 'entity.parse.failed') {
      res.status(400).json({ error: { type: 'invalid_request_error', message: 'The request body could not be read.' } })
      return
    }
    console.error('[fake-payments] API request failed', error)
    res.status(500).json({ error: { type: 'api_error', message: 'The fake payment API failed to answer.' } })
  })

  app.use('/v1', api)

  // ---- hosted test checkout page ----------------------------------------------------------------
  const page = express.Router()
  page.use((_req, res, next) => {
    res.set('Content-Security-Policy', PAGE_CSP)
    res.set('X-Frame-Options', 'DENY')
    res.set('Referrer-Policy', 'no-referrer')
    res.set('Cache-Control', 'no-store')
    next()
  })

  function closedPage(res: Response, record: SessionRecord): boolean {
    const session = record.session
    if (session.status === 'expired') {
      res
        .status(410)
        .type('html')
        .send(
          renderNoticePage(
            'This checkout has expired',
            'The test payment session has expired and can no longer be paid. Start a new payment from the portal.',
            session.cancel_url ? { href: session.cancel_url, label: 'Return to the portal' } : undefined,
          ),
        )
      return true
    }
    if (session.status === 'complete') {
      res
        .status(409)
        .type('html')
        .send(
          renderNoticePage(
            'Already paid',
            'This test payment session has already been paid; it cannot be paid twice.',
            session.success_url ? { href: successUrl(session), label: 'Continue to the portal' } : undefined,
          ),
        )
      return true
    }
    return false
  }

  function checkoutPage(res: Response, record: SessionRecord, status: number, error?: string, values?: CheckoutFormValues): void {
    const session = record.session
    res
      .status(status)
      .type('html')
      .send(
        renderCheckoutPage({
          sessionId: session.id,
          lineItems: record.lineItems,
          currency: session.currency,
          amountTotal: session.amount_total,
          customerEmail: session.customer_email,
          cancelUrl: session.cancel_url,
          expiresAt: session.expires_at,
          error,
          values,
        }),
      )
  }

  function unknownSession(res: Response): void {
    res.status(404).type('html').send(renderNoticePage('No such checkout', 'This test payment link is not known to the fake payment service.'))
  }

  page.get('/:sessionId', (req, res) => {
    const record = findSession(req.params.sessionId)
    if (!record) return unknownSession(res)
    if (closedPage(res, record)) return
    checkoutPage(res, record, 200)
  })

  page.post('/:sessionId', express.urlencoded({ extended: false, limit: '16kb' }), async (req, res) => {
    const record = findSession(req.params.sessionId)
    if (!record) return unknownSession(res)
    if (closedPage(res, record)) return

    const form = isRecord(req.body) ? req.body : {}
    const values: CheckoutFormValues = {
      name: field(form, 'name').trim().slice(0, 200),
      cardNumber: field(form, 'card_number').slice(0, 40),
      expiry: field(form, 'expiry').slice(0, 10),
    }
    const problem = cardProblem(values, field(form, 'cvc'), new Date(now()))
    if (problem) {
      checkoutPage(res, record, problem.status, problem.message, values)
      return
    }
    // State changes before the first await, so a second submit of the same form finds it paid.
    const { first } = complete(record, values.name)
    await first
    const session = record.session
    if (session.success_url) {
      res.redirect(303, successUrl(session))
      return
    }
    res.type('html').send(renderNoticePage('Payment received (test)', 'The test payment succeeded. You can close this page.'))
  })

  page.use((error: unknown, _req: Request, res: Response, _next: NextFunction) => {
    console.error('[fake-payments] checkout page failed', error)
    res.status(500).type('html').send(renderNoticePage('Something went wrong', 'The fake payment page failed; see the fake\'s log.'))
  })

  app.use('/pay', page)

  app.use((_req, res) => {
    res.status(404).json({ error: { type: 'invalid_request_error', message: 'Not a route of the fake payment service.' } })
  })

  function summaries(): FakeEventSummary[] {
    return [...events.values()]
      .map((entry) => ({
        id: entry.event.id,
        type: entry.event.type,
        created: entry.event.created,
        sessionId: entry.event.data.object.id,
        delivered: entry.delivered,
        deliveries: [...entry.deliveries],
      }))
      .reverse()
  }

  return {
    app,
    async resend(eventId) {
      const entry = events.get(eventId)
      if (!entry) throw new Error(`fake payments: no event ${eventId}`)
      return send(entry)
    },
    events: summaries,
    setPublicBaseUrl(url) {
      publicBaseUrl = url.replace(/\/+$/, '')
    },
    dispose() {
      clearInterval(sweep)
      sender.dispose()
    },
  }
}

function successUrl(session: CheckoutSession): string {
  return (session.success_url ?? '').split('{CHECKOUT_SESSION_ID}').join(session.id)
}

function field(form: Record<string, unknown>, key: string): string {
  const value = form[key]
  return typeof value === 'string' ? value : ''
}

/** Checks the test card form; null means the payment goes through. */
export function cardProblem(values: CheckoutFormValues, cvc: string, today: Date): { status: number; code: string; message: string } | null {
  if (values.name === '') return { status: 400, code: 'name_missing', message: 'Enter the name on the card.' }
  const digits = values.cardNumber.replace(/[\s-]/g, '')
  const decline = CARD_DECLINES[digits]
  if (digits !== CARD_OK && !decline) return { status: 402, code: 'incorrect_number', message: 'Your card number is incorrect.' }
  const expiry = /^\s*([0-9]{1,2})\s*\/\s*([0-9]{2}|[0-9]{4})\s*$/.exec(values.expiry)
  const month = Number(expiry?.[1])
  const yearText = expiry?.[2] ?? ''
  const year = yearText.length === 2 ? 2000 + Number(yearText) : Number(yearText)
  const thisMonth = today.getUTCFullYear() * 12 + today.getUTCMonth()
  if (!expiry || month < 1 || month > 12 || year * 12 + (month - 1) < thisMonth) {
    return { status: 402, code: 'invalid_expiry_year', message: 'The expiry date is not valid or has passed.' }
  }
  if (!/^[0-9]{3,4}$/.test(cvc.trim())) return { status: 402, code: 'incorrect_cvc', message: "The card's security code is incorrect." }
  if (decline) return { status: 402, code: decline.code, message: decline.message }
  return null
}

function requireTestKey(req: Request, res: Response, next: NextFunction): void {
  const header = req.get('Authorization') ?? ''
  let key = ''
  const bearer = /^Bearer\s+(\S+)$/i.exec(header)
  const basic = /^Basic\s+(\S+)$/i.exec(header)
  if (bearer?.[1]) key = bearer[1]
  else if (basic?.[1]) key = Buffer.from(basic[1], 'base64').toString('utf8').split(':')[0] ?? ''
  if (key === '') {
    res.status(401).json({
      error: {
        type: 'invalid_request_error',
        message: 'No API key was sent. Send a test secret key (sk_test_...) as a Bearer token in the Authorization header.',
      },
    })
    return
  }
  if (!/^sk_test_[A-Za-z0-9_]+$/.test(key)) {
    res.status(401).json({
      error: {
        type: 'invalid_request_error',
        message: `Invalid API Key provided: ${mask(key)}. This fake accepts test secret keys (sk_test_...) only.`,
      },
    })
    return
  }
  res.locals.apiKey = key
  next()
}

function mask(key: string): string {
  return key.length <= 12 ? '*'.repeat(key.length) : `${key.slice(0, 8)}${'*'.repeat(key.length - 12)}${key.slice(-4)}`
}

function apiVersionOf(req: Request): string {
  const asked = req.get('Stripe-Version')
  return asked && /^[0-9]{4}-[0-9]{2}-[0-9]{2}(\.[a-z]+)?$/.test(asked) ? asked : Stripe.API_VERSION
}

/** Same key and same request replays the first answer; same key with another request is refused. */
function idempotency(replies: Map<string, StoredReply>) {
  return (req: Request, res: Response, next: NextFunction): void => {
    const key = req.get('Idempotency-Key')
    if (req.method !== 'POST' || key === undefined || key === '') {
      next()
      return
    }
    if (key.length > 255) {
      next(StripeApiProblem.invalid('Idempotency-Key is longer than 255 characters.', { param: 'Idempotency-Key' }))
      return
    }
    const scope = `${String(res.locals.apiKey)}\u0000${key}`
    const fingerprint = `${req.method} ${req.path}\u0000${stableStringify(req.body ?? {})}`
    const stored = replies.get(scope)
    if (stored) {
      if (stored.fingerprint !== fingerprint) {
        next(
          new StripeApiProblem(400, {
            error: {
              type: 'idempotency_error',
              message: `The idempotency key '${key}' was first used with other parameters or another endpoint; use a new key for a different request.`,
            },
          }),
        )
        return
      }
      res.set('Idempotency-Key', key)
      res.set('Idempotent-Replayed', 'true')
      res.status(stored.status).json(stored.body)
      return
    }
    const json = res.json.bind(res)
    // Only answers the handler produced are kept; a refused request can be retried with the same key.
    res.json = (body: unknown) => {
      if (res.statusCode < 400) {
        if (replies.size >= MAX_IDEMPOTENCY_KEYS) {
          const oldest = replies.keys().next()
          if (!oldest.done) replies.delete(oldest.value)
        }
        replies.set(scope, { fingerprint, status: res.statusCode, body })
      }
      res.set('Idempotency-Key', key)
      return json(body)
    }
    next()
  }
}

function stableStringify(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(stableStringify).join(',')}]`
  if (isRecord(value)) {
    return `{${Object.keys(value)
      .sort()
      .map((key) => `${JSON.stringify(key)}:${stableStringify(value[key])}`)
      .join(',')}}`
  }
  return JSON.stringify(value) ?? 'null'
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value)
}
