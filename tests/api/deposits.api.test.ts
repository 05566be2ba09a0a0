// Deposits end to end: the app listens on a free port, the fake payment API (in-process, another free
// port) serves the hosted page and posts signed webhooks back to the app, exactly as in `npm start`.
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http'
import Stripe from 'stripe'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { AuditEntry, DepositPayment, MailOutbox, Organisation, PaymentEvent, QuoteRecordEntity, SalesOrder, User } from '../../server/db/entities'
import { startFakePayments, type FakePaymentsHandle } from '../../server/fakes/payments/fake-payments'
import { STRIPE_KEY, WEBHOOK_SECRET, createAcceptedQuote, depositsOf, postWebhook, quoteState, sessionEvent, type AcceptedQuote } from './payment-fixtures'
import { anonymousAgent, createOrganisation, createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

const PUBLIC_URL = 'http://127.0.0.1:5173'
const CARD_OK = '4242 4242 4242 4242'
const CARD_DECLINED = '4000 0000 0000 0002'

let ctx: TestContext
let fake: FakePaymentsHandle
let appServer: Server
let stripe: Stripe
let customer: Organisation
let buyer: User
let sales: User
/** While true the app's port answers 503 to webhook deliveries, as if the app were down. */
let refuseWebhooks = false

async function listen(handler: (req: IncomingMessage, res: ServerResponse) => void): Promise<{ server: Server; port: number }> {
  const server = createServer(handler)
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve))
  const address = server.address()
  if (address === null || typeof address === 'string') throw new Error('no TCP address')
  return { server, port: address.port }
}

beforeAll(async () => {
  // The fake needs the app's webhook URL and the app needs the fake's: open the app's port first.
  let app: ((req: IncomingMessage, res: ServerResponse) => void) | undefined
  const listening = await listen((req, res) => {
    if (app && !(refuseWebhooks && req.url?.startsWith('/api/payments/webhook'))) app(req, res)
    else res.writeHead(503).end()
  })
  appServer = listening.server
  fake = await startFakePayments({
    port: 0,
    webhookUrl: `http://127.0.0.1:${listening.port}/api/payments/webhook`,
    webhookSecret: WEBHOOK_SECRET,
    webhookRetry: { attempts: 2, baseDelayMs: 50, timeoutMs: 5000 },
  })
  ctx = await startTestApp({ STRIPE_API_URL: fake.url, STRIPE_SECRET_KEY: STRIPE_KEY, STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET, PUBLIC_URL })
  app = ctx.handle.app
  stripe = new Stripe(STRIPE_KEY, { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0, telemetry: false })
  customer = await createOrganisation(ctx.dataSource)
  buyer = await createUser(ctx.dataSource, 'buyer', customer)
  sales = await createUser(ctx.dataSource, 'sales')
})

afterAll(async () => {
  await fake?.close()
  await new Promise<void>((resolve) => {
    appServer?.close(() => resolve())
    appServer?.closeAllConnections()
  })
  await ctx?.close()
})

async function acceptedQuote(overrides: { total?: number; depositAmount?: number; currency?: string } = {}): Promise<AcceptedQuote> {
  return createAcceptedQuote(ctx.dataSource, { organisation: customer, buyer, sales, ...overrides })
}

function sessionIdOf(url: string): string {
  const id = new URL(url).pathname.split('/').pop()
  if (!id) throw new Error(`no session id in ${url}`)
  return id
}

/** Submits the hosted page's form the way a browser would. */
async function pay(url: string, card: string): Promise<Response> {
  return fetch(url, {
    method: 'POST',
    redirect: 'manual',
    body: new URLSearchParams({ name: 'Ines Marlow', card_number: card, expiry: '12/39', cvc: '123' }),
  })
}

async function startDeposit(agent: SignedInAgent, quoteId: string) {
  return agent.agent.post(`/api/v1/quotes/${quoteId}/deposit`).set('X-CSRF-Token', agent.csrf).send({})
}

async function until<T>(read: () => Promise<T>, done: (value: T) => boolean, what: string): Promise<T> {
  const deadline = Date.now() + 5000
  for (;;) {
    const value = await read()
    if (done(value)) return value
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`)
    await new Promise((resolve) => setTimeout(resolve, 25))
  }
}

describe('POST /api/v1/quotes/:id/deposit', () => {
  it('creates a Checkout Session for the accepted revision and an open deposit row, and answers its URL', async () => {
    const accepted = await acceptedQuote({ total: 2_500_000, depositAmount: 750_000, currency: 'EUR' })
    const agent = await signInAs(ctx, buyer)

    const response = await startDeposit(agent, accepted.quote.id)

    expect(response.status).toBe(201)
    expect(response.body).toMatchObject({ reused: false, amount: 750_000, currency: 'EUR' })
    expect(response.body.url).toMatch(new RegExp(`^${fake.url}/pay/cs_test_`))
    const [row] = await depositsOf(ctx.dataSource, accepted.quote.id)
    expect(row).toMatchObject({ id: response.body.depositId, status: 'open', amount: 750_000, currency: 'EUR', revision: 'A', paidQuoteId: null })
    const session = await stripe.checkout.sessions.retrieve(sessionIdOf(response.body.url))
    expect(row?.checkoutSessionId).toBe(session.id)
    expect(session).toMatchObject({
      mode: 'payment',
      amount_total: 750_000,
      currency: 'eur',
      client_reference_id: accepted.quote.id,
      customer_email: buyer.email,
      metadata: { quoteId: accepted.quote.id, revision: 'A', depositId: response.body.depositId },
      success_url: `${PUBLIC_URL}/quotes/${accepted.quote.id}?deposit=return&session_id={CHECKOUT_SESSION_ID}`,
      cancel_url: `${PUBLIC_URL}/quotes/${accepted.quote.id}?deposit=cancelled`,
    })
    const page = await (await fetch(response.body.url)).text()
    expect(page).toContain(`Deposit for quote ${accepted.quote.number} rev A`)
    expect(await quoteState(ctx.dataSource, accepted.quote.id)).toMatchObject({ state: 'accepted' })
  })

  it('pays through the hosted page: the webhook marks the deposit paid, moves the quote to deposit-paid and makes the order', async () => {
    const accepted = await acceptedQuote({ total: 1_000_000, depositAmount: 300_000 })
    const before = await quoteState(ctx.dataSource, accepted.quote.id)
    const agent = await signInAs(ctx, buyer)
    const started = await startDeposit(agent, accepted.quote.id)
    expect(started.status).toBe(201)

    const paid = await pay(started.body.url, CARD_OK)

    expect(paid.status).toBe(303)
    const sessionId = sessionIdOf(started.body.url)
    expect(paid.headers.get('location')).toBe(`${PUBLIC_URL}/quotes/${accepted.quote.id}?deposit=return&session_id=${sessionId}`)
    // The fake delivers the webhook before it redirects, and the app answers after its commit.
    const [deposit] = await depositsOf(ctx.dataSource, accepted.quote.id)
    expect(deposit).toMatchObject({ status: 'paid', paidQuoteId: accepted.quote.id })
    expect(deposit?.paidAt).toBeInstanceOf(Date)
    expect(deposit?.paymentIntentId).toMatch(/^pi_test_/)
    const after = await quoteState(ctx.dataSource, accepted.quote.id)
    expect(after.state).toBe('deposit-paid')
    expect(after.version).toBe(before.version + 1)
    const order = await ctx.dataSource.getRepository(SalesOrder).findOneByOrFail({ quoteId: accepted.quote.id })
    expect(order).toMatchObject({ revision: 'A', total: 1_000_000, depositPaid: 300_000, currency: 'USD', organisationId: customer.id, confirmedAt: null })
    expect(order.number).toMatch(/^SO-\d{4}-\d{5}$/)
    const audit = await ctx.dataSource.getRepository(AuditEntry).findOneByOrFail({ entity: 'quote', entityId: accepted.quote.id, action: 'deposit.paid' })
    expect(audit.detail).toMatchObject({ orderNumber: order.number, amount: 300_000, checkoutSessionId: sessionId })
    const completed = fake.fake.events().find((event) => event.sessionId === sessionId && event.type === 'checkout.session.completed')
    expect(completed).toBeDefined()
    expect(await ctx.dataSource.getRepository(PaymentEvent).existsBy({ eventId: completed?.id ?? '' })).toBe(true)

    const [receipt, ...more] = await ctx.dataSource.getRepository(MailOutbox).findBy({ kind: 'deposit-received', reference: accepted.quote.id })
    expect(more).toHaveLength(0)
    expect(receipt).toMatchObject({ status: 'pending', to: [buyer.email], cc: [sales.email] })
    expect(receipt?.text).toContain(order.number)
    expect(receipt?.text).toContain(deposit?.paymentIntentId ?? 'no payment intent')

    const status = await agent.agent.get(`/api/v1/quotes/${accepted.quote.id}/deposit`).expect(200)
    expect(status.body).toMatchObject({ quoteState: 'deposit-paid', payable: false, deposit: { status: 'paid', amount: 300_000 }, order: { id: order.id, number: order.number } })
  })

  it('replaying the paid event through the fake changes nothing and is answered 200', async () => {
    const accepted = await acceptedQuote()
    const agent = await signInAs(ctx, buyer)
    const started = await startDeposit(agent, accepted.quote.id)
    await pay(started.body.url, CARD_OK)
    const sessionId = sessionIdOf(started.body.url)
    const event = fake.fake.events().find((entry) => entry.sessionId === sessionId && entry.type === 'checkout.session.completed')
    if (!event) throw new Error('no completed event recorded by the fake')
    const snapshot = async () => ({
      quote: await quoteState(ctx.dataSource, accepted.quote.id),
      deposits: (await depositsOf(ctx.dataSource, accepted.quote.id)).map((row) => ({ ...row })),
      orders: await ctx.dataSource.getRepository(SalesOrder).findBy({ quoteId: accepted.quote.id }),
      audits: await ctx.dataSource.getRepository(AuditEntry).countBy({ entityId: accepted.quote.id }),
      mails: await ctx.dataSource.getRepository(MailOutbox).countBy({ reference: accepted.quote.id }),
    })
    const before = await snapshot()

    const resent = await fetch(`${fake.url}/_fake/events/${event.id}/resend`, { method: 'POST' })

    expect(resent.status).toBe(200)
    expect(await resent.json()).toMatchObject({ eventId: event.id, delivered: true, status: 200 })
    expect(await snapshot()).toEqual(before)
    expect(before.orders).toHaveLength(1)
    expect(before.mails).toBe(1)
  })

  it('a declined card leaves the quote accepted and payable; the next attempt reuses the open session and can pay', async () => {
    const accepted = await acceptedQuote()
    const agent = await signInAs(ctx, buyer)
    const started = await startDeposit(agent, accepted.quote.id)

    const declined = await pay(started.body.url, CARD_DECLINED)

    expect(declined.status).toBe(402)
    expect(await declined.text()).toContain('Your card was declined.')
    expect(await quoteState(ctx.dataSource, accepted.quote.id)).toMatchObject({ state: 'accepted' })
    const [deposit] = await depositsOf(ctx.dataSource, accepted.quote.id)
    expect(deposit).toMatchObject({ status: 'open', paidQuoteId: null })
    const status = await agent.agent.get(`/api/v1/quotes/${accepted.quote.id}/deposit`).expect(200)
    expect(status.body).toMatchObject({ quoteState: 'accepted', payable: true, deposit: { status: 'open' }, order: null })

    const again = await startDeposit(agent, accepted.quote.id)
    expect(again.status).toBe(200)
    expect(again.body).toMatchObject({ reused: true, url: started.body.url, depositId: started.body.depositId })
    expect(await depositsOf(ctx.dataSource, accepted.quote.id)).toHaveLength(1)

    expect((await pay(again.body.url, CARD_OK)).status).toBe(303)
    expect(await quoteState(ctx.dataSource, accepted.quote.id)).toMatchObject({ state: 'deposit-paid' })
  })

  it('an expired session marks its deposit expired, keeps the quote accepted, and a new attempt makes a new session', async () => {
    const accepted = await acceptedQuote()
    const agent = await signInAs(ctx, buyer)
    const started = await startDeposit(agent, accepted.quote.id)

    await stripe.checkout.sessions.expire(sessionIdOf(started.body.url))

    const [expired] = await until(() => depositsOf(ctx.dataSource, accepted.quote.id), (rows) => rows[0]?.status === 'expired', 'the expired webhook')
    expect(expired?.paidQuoteId).toBeNull()
    expect(await quoteState(ctx.dataSource, accepted.quote.id)).toMatchObject({ state: 'accepted' })
    const next = await startDeposit(agent, accepted.quote.id)
    expect(next.status).toBe(201)
    expect(next.body.url).not.toBe(started.body.url)
    expect((await depositsOf(ctx.dataSource, accepted.quote.id)).map((row) => row.status)).toEqual(['expired', 'open'])
  })

  it('when every webhook delivery failed, polling the status asks the payment API and applies the payment once', async () => {
    const accepted = await acceptedQuote({ total: 900_000, depositAmount: 270_000 })
    const agent = await signInAs(ctx, buyer)
    const started = await startDeposit(agent, accepted.quote.id)
    const sessionId = sessionIdOf(started.body.url)
    refuseWebhooks = true
    try {
      expect((await pay(started.body.url, CARD_OK)).status).toBe(303)
      const lost = await until(
        async () => fake.fake.events().find((event) => event.sessionId === sessionId && event.type === 'checkout.session.completed'),
        (event) => event !== undefined && event.deliveries.length >= 2,
        'the fake to give up delivering',
      )
      expect(lost?.delivered).toBe(false)
      expect(await depositsOf(ctx.dataSource, accepted.quote.id)).toMatchObject([{ status: 'open' }])
      // A new start while the session is paid but unconfirmed is refused, not a second session.
      const early = await startDeposit(agent, accepted.quote.id)
      expect(early.status).toBe(409)
      expect(early.body.error.code).toBe('deposit_processing')

      const status = await agent.agent.get(`/api/v1/quotes/${accepted.quote.id}/deposit`).expect(200)

      expect(status.body).toMatchObject({ quoteState: 'deposit-paid', payable: false, deposit: { status: 'paid' }, order: { number: expect.stringMatching(/^SO-/) } })
      refuseWebhooks = false
      const resent = await fake.resend(lost?.id ?? '')
      expect(resent).toMatchObject({ delivered: true, status: 200 })
      expect(await ctx.dataSource.getRepository(SalesOrder).countBy({ quoteId: accepted.quote.id })).toBe(1)
      expect(await ctx.dataSource.getRepository(AuditEntry).countBy({ entityId: accepted.quote.id, action: 'deposit.paid' })).toBe(1)
    } finally {
      refuseWebhooks = false
    }
  })

  it('refuses a second deposit once the first is paid (409 deposit_already_paid) and writes nothing', async () => {
    const accepted = await acceptedQuote()
    const agent = await signInAs(ctx, buyer)
    const started = await startDeposit(agent, accepted.quote.id)
    await pay(started.body.url, CARD_OK)
    const sessionsBefore = fake.fake.events().length

    const second = await startDeposit(agent, accepted.quote.id)

    expect(second.status).toBe(409)
    expect(second.body.error.code).toBe('deposit_already_paid')
    expect(await depositsOf(ctx.dataSource, accepted.quote.id)).toHaveLength(1)
    expect(fake.fake.events().length).toBe(sessionsBefore)
  })

  it('refuses a quote that is not accepted yet (409 quote_not_accepted)', async () => {
    const accepted = await acceptedQuote()
    await ctx.dataSource.getRepository(QuoteRecordEntity).update({ id: accepted.quote.id }, { state: 'issued' })
    const agent = await signInAs(ctx, buyer)

    const response = await startDeposit(agent, accepted.quote.id)

    expect(response.status).toBe(409)
    expect(response.body.error.code).toBe('quote_not_accepted')
    expect(await depositsOf(ctx.dataSource, accepted.quote.id)).toHaveLength(0)
  })

  it("answers 404 to a buyer of another organisation, for starting and for reading the deposit", async () => {
    const accepted = await acceptedQuote()
    const stranger = await createUser(ctx.dataSource, 'buyer', await createOrganisation(ctx.dataSource))
    const agent = await signInAs(ctx, stranger)

    const started = await startDeposit(agent, accepted.quote.id)
    const read = await agent.agent.get(`/api/v1/quotes/${accepted.quote.id}/deposit`)

    expect(started.status).toBe(404)
    expect(read.status).toBe(404)
    expect(await depositsOf(ctx.dataSource, accepted.quote.id)).toHaveLength(0)
  })

  it('answers 403 to sales and admin, who cannot pay a deposit, but lets sales read its status', async () => {
    const accepted = await acceptedQuote()
    const salesAgent = await signInAs(ctx, sales)
    const adminAgent = await signInAs(ctx, await createUser(ctx.dataSource, 'admin'))

    expect((await startDeposit(salesAgent, accepted.quote.id)).status).toBe(403)
    expect((await startDeposit(adminAgent, accepted.quote.id)).status).toBe(403)
    const status = await salesAgent.agent.get(`/api/v1/quotes/${accepted.quote.id}/deposit`).expect(200)
    expect(status.body).toMatchObject({ quoteState: 'accepted', payable: true, deposit: null })
    expect(await depositsOf(ctx.dataSource, accepted.quote.id)).toHaveLength(0)
  })

  it('answers 401 without a session and writes nothing', async () => {
    const accepted = await acceptedQuote()
    const anonymous = await anonymousAgent(ctx)

    const response = await anonymous.agent.post(`/api/v1/quotes/${accepted.quote.id}/deposit`).set('X-CSRF-Token', anonymous.csrf).send({})

    expect(response.status).toBe(401)
    expect(await depositsOf(ctx.dataSource, accepted.quote.id)).toHaveLength(0)
  })
})

describe('POST /api/v1/quotes/:id/deposit with the payment API down', () => {
  it('answers 503 payment_unavailable with a message for the buyer and leaves no deposit row', async () => {
    const gone = await startFakePayments({ port: 0, webhookUrl: null, webhookSecret: WEBHOOK_SECRET })
    await gone.close()
    const down = await startTestApp({ STRIPE_API_URL: gone.url, STRIPE_SECRET_KEY: STRIPE_KEY, STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET, PUBLIC_URL })
    try {
      const accepted = await createAcceptedQuote(down.dataSource, { organisation: customer, buyer, sales })
      const agent = await signInAs(down, buyer)

      const response = await startDeposit(agent, accepted.quote.id)

      expect(response.status).toBe(503)
      expect(response.body.error.code).toBe('payment_unavailable')
      expect(response.body.error.message).toMatch(/Nothing was charged/)
      expect(await depositsOf(down.dataSource, accepted.quote.id)).toHaveLength(0)
      expect(await quoteState(down.dataSource, accepted.quote.id)).toMatchObject({ state: 'accepted' })
    } finally {
      await down.close()
    }
  })
})

describe('POST /api/payments/webhook', () => {
  async function openDeposit(): Promise<{ accepted: AcceptedQuote; deposit: DepositPayment }> {
    const accepted = await acceptedQuote()
    const agent = await signInAs(ctx, buyer)
    const started = await startDeposit(agent, accepted.quote.id)
    expect(started.status).toBe(201)
    const [deposit] = await depositsOf(ctx.dataSource, accepted.quote.id)
    if (!deposit) throw new Error('no deposit row')
    return { accepted, deposit }
  }

  async function unchanged(accepted: AcceptedQuote, eventId: string): Promise<void> {
    expect(await quoteState(ctx.dataSource, accepted.quote.id)).toMatchObject({ state: 'accepted', version: accepted.quote.version })
    expect(await depositsOf(ctx.dataSource, accepted.quote.id)).toMatchObject([{ status: 'open', paidQuoteId: null, paidAt: null }])
    expect(await ctx.dataSource.getRepository(SalesOrder).existsBy({ quoteId: accepted.quote.id })).toBe(false)
    expect(await ctx.dataSource.getRepository(PaymentEvent).existsBy({ eventId })).toBe(false)
  }

  it('refuses a payload signed with another secret (400) and changes nothing', async () => {
    const { accepted, deposit } = await openDeposit()
    const eventId = `evt_test_bad_${deposit.id.slice(0, 8)}`

    const response = await postWebhook(ctx, sessionEvent(deposit, { eventId }), 'whsec_someone_else')

    expect(response.status).toBe(400)
    expect(response.body.error.code).toBe('signature_invalid')
    await unchanged(accepted, eventId)
  })

  it('refuses a missing signature and a body changed after signing (400) and changes nothing', async () => {
    const { accepted, deposit } = await openDeposit()
    const eventId = `evt_test_tamper_${deposit.id.slice(0, 8)}`
    const payload = sessionEvent(deposit, { eventId })
    const header = new Stripe(STRIPE_KEY).webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET })

    const missing = await request(ctx.handle.app).post('/api/payments/webhook').set('Content-Type', 'application/json').send(payload)
    const tampered = await request(ctx.handle.app)
      .post('/api/payments/webhook')
      .set('Content-Type', 'application/json')
      .set('Stripe-Signature', header)
      .send(payload.replace(`"amount_total":${deposit.amount}`, '"amount_total":1'))

    expect(missing.status).toBe(400)
    expect(missing.body.error.code).toBe('signature_missing')
    expect(tampered.status).toBe(400)
    expect(tampered.body.error.code).toBe('signature_invalid')
    await unchanged(accepted, eventId)
  })

  it('handles two simultaneous deliveries of one event once: one order, one event row', async () => {
    const { accepted, deposit } = await openDeposit()
    const payload = sessionEvent(deposit)

    const answers = await Promise.all([postWebhook(ctx, payload), postWebhook(ctx, payload), postWebhook(ctx, payload)])

    expect(answers.map((answer) => answer.status)).toEqual([200, 200, 200])
    expect(answers.filter((answer) => answer.body.duplicate === false)).toHaveLength(1)
    expect(await ctx.dataSource.getRepository(SalesOrder).countBy({ quoteId: accepted.quote.id })).toBe(1)
    expect(await quoteState(ctx.dataSource, accepted.quote.id)).toMatchObject({ state: 'deposit-paid', version: accepted.quote.version + 1 })
  })

  it('records a completed but unpaid session without marking anything paid', async () => {
    const { accepted, deposit } = await openDeposit()
    const payload = sessionEvent(deposit, { paymentStatus: 'unpaid' })

    const response = await postWebhook(ctx, payload)

    expect(response.status).toBe(200)
    expect(await quoteState(ctx.dataSource, accepted.quote.id)).toMatchObject({ state: 'accepted' })
    expect(await depositsOf(ctx.dataSource, accepted.quote.id)).toMatchObject([{ status: 'open' }])
  })

  it('accepts an event it has no use for with 200 and records its id', async () => {
    const eventId = `evt_test_unrelated_${Date.now()}`
    const payload = JSON.stringify({ id: eventId, object: 'event', type: 'payment_intent.created', data: { object: { id: 'pi_test_x', object: 'payment_intent' } } })

    const response = await postWebhook(ctx, payload)

    expect(response.status).toBe(200)
    expect(await ctx.dataSource.getRepository(PaymentEvent).existsBy({ eventId })).toBe(true)
  })
})
