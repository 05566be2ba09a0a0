import { createServer, type Server } from 'node:http'
import express from 'express'
import Stripe from 'stripe'
import request from 'supertest'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { cardProblem, createFakePaymentsApp } from './payments-app'
import { startFakePayments, type FakePaymentsHandle } from './fake-payments'

const SECRET = 'whsec_spinwright_fake_test_secret'
const KEY = 'sk_test_spinwright_demo'

interface Receiver {
  url: string
  events: Stripe.Event[]
  /** Answers 503 to this many deliveries before accepting. */
  failNext: number
  refusedSignatures: number
  received: number
  waitFor(count: number): Promise<void>
  close(): Promise<void>
}

/** The app side of a webhook, verified exactly as the app must do it. */
async function startReceiver(): Promise<Receiver> {
  const verifier = new Stripe(KEY)
  const app = express()
  const receiver: Receiver = {
    url: '',
    events: [],
    failNext: 0,
    refusedSignatures: 0,
    received: 0,
    async waitFor(count) {
      const deadline = Date.now() + 5000
      while (receiver.events.length < count) {
        if (Date.now() > deadline) throw new Error(`only ${receiver.events.length} of ${count} webhooks arrived`)
        await new Promise((resolve) => setTimeout(resolve, 20))
      }
    },
    close: async () => undefined,
  }
  app.post('/webhook', express.raw({ type: 'application/json' }), (req, res) => {
    receiver.received += 1
    if (receiver.failNext > 0) {
      receiver.failNext -= 1
      res.status(503).end()
      return
    }
    try {
      const body: unknown = req.body
      if (!Buffer.isBuffer(body)) throw new Error('raw body expected')
      receiver.events.push(verifier.webhooks.constructEvent(body, req.get('stripe-signature') ?? '', SECRET))
      res.json({ received: true })
    } catch {
      receiver.refusedSignatures += 1
      res.status(400).end()
    }
  })
  const server: Server = createServer(app)
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve))
  const address = server.address()
  if (address === null || typeof address === 'string') throw new Error('no address')
  receiver.url = `http://127.0.0.1:${address.port}/webhook`
  receiver.close = () =>
    new Promise<void>((resolve) => {
      server.close(() => resolve())
      server.closeAllConnections()
    })
  return receiver
}

function sdk(port: number, key = KEY): Stripe {
  return new Stripe(key, { host: '127.0.0.1', port, protocol: 'http', maxNetworkRetries: 0, telemetry: false })
}

const depositParams: Stripe.Checkout.SessionCreateParams = {
  mode: 'payment',
  line_items: [
    {
      price_data: {
        currency: 'gbp',
        unit_amount: 123_456,
        product_data: { name: 'Deposit 30% on quote Q-2031-0007A', description: 'Larkspur Air Appliances, PSC blower lot 1' },
      },
      quantity: 1,
    },
  ],
  success_url: 'http://127.0.0.1:5173/quotes/q1/deposit/done?session={CHECKOUT_SESSION_ID}',
  cancel_url: 'http://127.0.0.1:5173/quotes/q1',
  client_reference_id: 'quote-q1-rev-A',
  customer_email: 'buyer@larkspur.test',
  metadata: { quoteId: 'q1', revision: 'A' },
}

async function until(check: () => boolean): Promise<void> {
  const deadline = Date.now() + 2000
  while (!check()) {
    if (Date.now() > deadline) throw new Error('condition not reached in time')
    await new Promise((resolve) => setTimeout(resolve, 10))
  }
}

async function pay(base: string, sessionId: string, card: string, extra: Record<string, string> = {}): Promise<Response> {
  return fetch(`${base}/pay/${sessionId}`, {
    method: 'POST',
    redirect: 'manual',
    body: new URLSearchParams({ name: 'Mira Holt', card_number: card, expiry: '12 / 39', cvc: '123', ...extra }),
  })
}

let receiver: Receiver
let fake: FakePaymentsHandle
let stripe: Stripe

beforeEach(async () => {
  receiver = await startReceiver()
  fake = await startFakePayments({
    port: 0,
    webhookUrl: receiver.url,
    webhookSecret: SECRET,
    webhookRetry: { attempts: 4, baseDelayMs: 20, maxDelayMs: 80 },
  })
  stripe = sdk(fake.port)
})

afterEach(async () => {
  await fake.close()
  await receiver.close()
})

describe('fake payment API through the Stripe SDK', () => {
  it('creates a Checkout Session with the real field names and reads it back', async () => {
    const session = await stripe.checkout.sessions.create(depositParams)
    expect(session).toMatchObject({
      object: 'checkout.session',
      status: 'open',
      payment_status: 'unpaid',
      mode: 'payment',
      amount_total: 123_456,
      currency: 'gbp',
      client_reference_id: 'quote-q1-rev-A',
      customer_email: 'buyer@larkspur.test',
      metadata: { quoteId: 'q1', revision: 'A' },
      payment_intent: null,
      success_url: depositParams.success_url,
      cancel_url: depositParams.cancel_url,
      livemode: false,
    })
    expect(session.id).toMatch(/^cs_test_/)
    expect(session.url).toBe(`${fake.url}/pay/${session.id}`)
    expect(session.expires_at - session.created).toBe(24 * 60 * 60)

    const again = await stripe.checkout.sessions.retrieve(session.id)
    expect(again).toEqual(session)
  })

  it('replays the same session for the same Idempotency-Key and body', async () => {
    const first = await stripe.checkout.sessions.create(depositParams, { idempotencyKey: 'deposit-q1-A' })
    const second = await stripe.checkout.sessions.create(depositParams, { idempotencyKey: 'deposit-q1-A' })
    const other = await stripe.checkout.sessions.create(depositParams, { idempotencyKey: 'deposit-q1-B' })
    expect(second.id).toBe(first.id)
    expect(other.id).not.toBe(first.id)
  })

  it('refuses the same Idempotency-Key with a different body as an idempotency error', async () => {
    await stripe.checkout.sessions.create(depositParams, { idempotencyKey: 'deposit-q2-A' })
    const changed = { ...depositParams, client_reference_id: 'quote-q2-rev-B' }
    await expect(stripe.checkout.sessions.create(changed, { idempotencyKey: 'deposit-q2-A' })).rejects.toBeInstanceOf(
      Stripe.errors.StripeIdempotencyError,
    )
  })

  it('answers 401 to a key that is not a test secret key', async () => {
    for (const key of ['sk_live_abcdefghijklmnop', 'pk_test_abcdefghijklmnop']) {
      const error: unknown = await sdk(fake.port, key)
        .checkout.sessions.create(depositParams)
        .catch((caught: unknown) => caught)
      expect(error).toBeInstanceOf(Stripe.errors.StripeAuthenticationError)
      expect(error).toMatchObject({ statusCode: 401, rawType: 'invalid_request_error' })
    }
  })

  it('names the missing parameter like the real API', async () => {
    const error: unknown = await stripe.checkout.sessions
      .create({ mode: 'payment', success_url: 'http://127.0.0.1/ok', line_items: [{ price_data: { currency: 'gbp', product_data: { name: 'x' } }, quantity: 1 }] })
      .catch((caught: unknown) => caught)
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(error).toMatchObject({ code: 'parameter_missing', param: 'line_items[0][price_data][unit_amount]' })
  })

  it('refuses parameters the fake does not know and URLs that are not http(s)', async () => {
    await expect(stripe.checkout.sessions.create({ ...depositParams, discounts: [{ coupon: 'X' }] })).rejects.toMatchObject({
      code: 'parameter_unknown',
      param: 'discounts',
    })
    await expect(stripe.checkout.sessions.create({ ...depositParams, cancel_url: 'javascript:alert(1)' })).rejects.toMatchObject({
      code: 'url_invalid',
      param: 'cancel_url',
    })
  })

  it('answers resource_missing for an unknown session', async () => {
    const error: unknown = await stripe.checkout.sessions.retrieve('cs_test_doesnotexist0000000000000').catch((caught: unknown) => caught)
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
    expect(error).toMatchObject({ statusCode: 404, code: 'resource_missing' })
  })
})

describe('hosted test checkout page', () => {
  it('shows a self-contained TEST page with the amount and the description', async () => {
    const session = await stripe.checkout.sessions.create(depositParams)
    const res = await fetch(session.url ?? '')
    const html = await res.text()
    expect(res.status).toBe(200)
    expect(res.headers.get('content-security-policy')).toContain("default-src 'none'")
    expect(html).toMatch(/<title>TEST payment £1,234\.56/)
    expect(html).toContain('Deposit 30% on quote Q-2031-0007A')
    for (const field of ['name="card_number"', 'name="expiry"', 'name="cvc"', 'name="name"']) expect(html).toContain(field)
    expect(html).toContain(`href="${depositParams.cancel_url}"`)
    // Nothing may load from elsewhere: no scripts, stylesheets, images or fonts by URL.
    expect(html).not.toMatch(/<script|<link|<img|@import|url\(/i)
  })

  it('pays with 4242, signs the webhook so constructEvent verifies it, and returns to success_url', async () => {
    const session = await stripe.checkout.sessions.create(depositParams)
    const res = await pay(fake.url, session.id, '4242 4242 4242 4242')
    expect(res.status).toBe(303)
    expect(res.headers.get('location')).toBe(`http://127.0.0.1:5173/quotes/q1/deposit/done?session=${session.id}`)

    await receiver.waitFor(1)
    const event = receiver.events[0]
    expect(event?.type).toBe('checkout.session.completed')
    expect(event).toMatchObject({ object: 'event', livemode: false, api_version: Stripe.API_VERSION })
    expect(event?.id).toMatch(/^evt_/)
    expect(event?.data.object).toMatchObject({ id: session.id, status: 'complete', payment_status: 'paid', client_reference_id: 'quote-q1-rev-A' })

    const paid = await stripe.checkout.sessions.retrieve(session.id, { expand: ['payment_intent'] })
    expect(paid).toMatchObject({ status: 'complete', payment_status: 'paid', url: null })
    const intent = paid.payment_intent
    if (intent === null || typeof intent === 'string') throw new Error('payment_intent was not expanded')
    expect(intent.id).toMatch(/^pi_test_/)
    expect(await stripe.paymentIntents.retrieve(intent.id)).toMatchObject({ status: 'succeeded', amount_received: 123_456, currency: 'gbp' })
  })

  it('refuses to take a second payment for a paid session', async () => {
    const session = await stripe.checkout.sessions.create(depositParams)
    expect((await pay(fake.url, session.id, '4242424242424242')).status).toBe(303)
    expect((await pay(fake.url, session.id, '4242424242424242')).status).toBe(409)
    await receiver.waitFor(1)
    expect(receiver.events).toHaveLength(1)
  })

  it('replays a delivered webhook with the same event id on resend', async () => {
    const session = await stripe.checkout.sessions.create(depositParams)
    await pay(fake.url, session.id, '4242424242424242')
    await receiver.waitFor(1)
    const eventId = receiver.events[0]?.id ?? ''
    expect(await fake.resend(eventId)).toMatchObject({ delivered: true, status: 200 })
    const viaHook = await fetch(`${fake.url}/_fake/events/${eventId}/resend`, { method: 'POST' })
    expect(await viaHook.json()).toMatchObject({ delivered: true })
    await receiver.waitFor(3)
    expect(receiver.events.map((event) => event.id)).toEqual([eventId, eventId, eventId])
  })

  it.each([
    ['4000 0000 0000 0002', 'Your card was declined.'],
    ['4000 0000 0000 9995', 'insufficient funds'],
    ['4111 1111 1111 1111', 'Your card number is incorrect.'],
  ])('declines %s, shows why and leaves the session open', async (card, message) => {
    const session = await stripe.checkout.sessions.create(depositParams)
    const res = await pay(fake.url, session.id, card)
    expect(res.status).toBe(402)
    const html = await res.text()
    expect(html).toContain(message)
    expect(html).toContain('name="card_number"')
    expect(await stripe.checkout.sessions.retrieve(session.id)).toMatchObject({ status: 'open', payment_status: 'unpaid', payment_intent: null })
    expect(receiver.received).toBe(0)
  })

  it('expires a session on request, sends checkout.session.expired and refuses payment afterwards', async () => {
    const session = await stripe.checkout.sessions.create(depositParams)
    const expired = await stripe.checkout.sessions.expire(session.id)
    expect(expired).toMatchObject({ id: session.id, status: 'expired', payment_status: 'unpaid', url: null })
    await receiver.waitFor(1)
    expect(receiver.events[0]).toMatchObject({ type: 'checkout.session.expired', data: { object: { id: session.id, status: 'expired' } } })

    expect((await fetch(`${fake.url}/pay/${session.id}`)).status).toBe(410)
    expect((await pay(fake.url, session.id, '4242424242424242')).status).toBe(410)
    expect(await stripe.checkout.sessions.retrieve(session.id)).toMatchObject({ status: 'expired', payment_status: 'unpaid' })
    await expect(stripe.checkout.sessions.expire(session.id)).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError)
  })
})

describe('webhook delivery', () => {
  it('retries with backoff while the endpoint fails, then delivers', async () => {
    receiver.failNext = 2
    const session = await stripe.checkout.sessions.create(depositParams)
    expect((await pay(fake.url, session.id, '4242424242424242')).status).toBe(303)
    await receiver.waitFor(1)
    expect(receiver.received).toBe(3)
    // The fake records the attempt once it has read the answer, just after the receiver saw it.
    await until(() => fake.fake.events()[0]?.delivered === true)
    const [summary] = fake.fake.events()
    expect(summary?.deliveries.map((attempt) => attempt.status)).toEqual([503, 503, 200])
  })

  it('gives up after the configured number of attempts when the endpoint stays down', async () => {
    receiver.failNext = 100
    const session = await stripe.checkout.sessions.create(depositParams)
    await pay(fake.url, session.id, '4242424242424242')
    await new Promise((resolve) => setTimeout(resolve, 600))
    expect(receiver.received).toBe(4)
    expect(fake.fake.events()[0]).toMatchObject({ delivered: false })
  })

  it('signs with the configured secret only: another secret does not verify', async () => {
    const other = await startFakePayments({ port: 0, webhookUrl: receiver.url, webhookSecret: 'whsec_someone_else', webhookRetry: { attempts: 1 } })
    try {
      const session = await sdk(other.port).checkout.sessions.create(depositParams)
      await pay(other.url, session.id, '4242424242424242')
      expect(receiver.refusedSignatures).toBe(1)
      expect(receiver.events).toHaveLength(0)
    } finally {
      await other.close()
    }
  })
})

describe('createFakePaymentsApp in process', () => {
  let clock = Date.now()
  const inProcess = createFakePaymentsApp({ webhookUrl: null, webhookSecret: SECRET, now: () => clock })
  afterEach(() => inProcess.dispose())

  it('expires a session once its expires_at has passed', async () => {
    const created = await request(inProcess.app)
      .post('/v1/checkout/sessions')
      .set('Authorization', `Bearer ${KEY}`)
      .type('form')
      .send('mode=payment&line_items[0][price_data][currency]=eur&line_items[0][price_data][unit_amount]=5000')
      .send('line_items[0][price_data][product_data][name]=Deposit&line_items[0][quantity]=2&success_url=http://127.0.0.1/ok')
    expect(created.status).toBe(200)
    expect(created.body).toMatchObject({ amount_total: 10_000, currency: 'eur', status: 'open' })
    const id: unknown = created.body.id
    if (typeof id !== 'string') throw new Error('no id')

    clock += 24 * 60 * 60 * 1000 + 1000
    const read = await request(inProcess.app).get(`/v1/checkout/sessions/${id}`).set('Authorization', `Bearer ${KEY}`)
    expect(read.body).toMatchObject({ status: 'expired', url: null })
    expect(inProcess.events()).toMatchObject([{ type: 'checkout.session.expired', sessionId: id, delivered: false }])
    const page = await request(inProcess.app).get(`/pay/${id}`)
    expect(page.status).toBe(410)
  })

  it('answers 401 in the error shape of the real API without a key', async () => {
    const res = await request(inProcess.app).get('/v1/checkout/sessions/cs_test_x')
    expect(res.status).toBe(401)
    expect(res.body).toMatchObject({ error: { type: 'invalid_request_error', message: expect.any(String) } })
  })
})

describe('cardProblem', () => {
  const today = new Date(Date.UTC(2031, 5, 15))
  const ok = { name: 'Mira Holt', cardNumber: '4242 4242 4242 4242', expiry: '06/31' }

  it('accepts the success card with an expiry in the current month', () => {
    expect(cardProblem(ok, '123', today)).toBeNull()
  })

  it('refuses a past expiry, a bad CVC and a missing name', () => {
    expect(cardProblem({ ...ok, expiry: '05/31' }, '123', today)?.code).toBe('invalid_expiry_year')
    expect(cardProblem({ ...ok, expiry: '13/35' }, '123', today)?.code).toBe('invalid_expiry_year')
    expect(cardProblem(ok, '12', today)?.code).toBe('incorrect_cvc')
    expect(cardProblem({ ...ok, name: '' }, '123', today)?.code).toBe('name_missing')
  })
})
