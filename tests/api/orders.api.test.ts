// Orders: made by the signed webhook of a paid deposit (sent here with supertest and a header made
// by the SDK's generateTestHeaderString), seen by sales and by the buyer's own organisation only.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { AuditEntry, Organisation, SalesOrder, User } from '../../server/db/entities'
import { STRIPE_KEY, WEBHOOK_SECRET, createAcceptedQuote, insertOpenDeposit, postWebhook, quoteState, sessionEvent } from './payment-fixtures'
import { createOrganisation, createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
let customer: Organisation
let otherCustomer: Organisation
let buyer: User
let otherBuyer: User
let sales: User

beforeAll(async () => {
  // No payment API is needed: nothing here starts a Checkout Session.
  ctx = await startTestApp({ STRIPE_SECRET_KEY: STRIPE_KEY, STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET, STRIPE_API_URL: 'http://127.0.0.1:9' })
  customer = await createOrganisation(ctx.dataSource)
  otherCustomer = await createOrganisation(ctx.dataSource)
  buyer = await createUser(ctx.dataSource, 'buyer', customer)
  otherBuyer = await createUser(ctx.dataSource, 'buyer', otherCustomer)
  sales = await createUser(ctx.dataSource, 'sales')
})

afterAll(async () => {
  await ctx?.close()
})

/** An accepted quote of `organisation` whose deposit the webhook has just marked paid. */
async function paidOrder(organisation: Organisation, orderBuyer: User, amounts = { total: 800_000, depositAmount: 240_000 }): Promise<SalesOrder> {
  const accepted = await createAcceptedQuote(ctx.dataSource, { organisation, buyer: orderBuyer, sales, ...amounts })
  const deposit = await insertOpenDeposit(ctx.dataSource, accepted)
  const response = await postWebhook(ctx, sessionEvent(deposit))
  if (response.status !== 200) throw new Error(`webhook answered ${response.status} ${JSON.stringify(response.body)}`)
  return ctx.dataSource.getRepository(SalesOrder).findOneByOrFail({ quoteId: accepted.quote.id })
}

async function confirm(agent: SignedInAgent, orderId: string) {
  return agent.agent.post(`/api/v1/orders/${orderId}/confirm`).set('X-CSRF-Token', agent.csrf).send({})
}

describe('GET /api/v1/orders', () => {
  it('lists every organisation’s orders for sales, newest first', async () => {
    const mine = await paidOrder(customer, buyer)
    const theirs = await paidOrder(otherCustomer, otherBuyer)
    const agent = await signInAs(ctx, sales)

    const response = await agent.agent.get('/api/v1/orders').query({ pageSize: 100 }).expect(200)

    const ids = response.body.items.map((item: { id: string }) => item.id)
    expect(ids).toEqual(expect.arrayContaining([mine.id, theirs.id]))
    expect(ids.indexOf(theirs.id)).toBeLessThan(ids.indexOf(mine.id))
    const row = response.body.items.find((item: { id: string }) => item.id === mine.id)
    expect(row).toMatchObject({
      number: mine.number,
      status: 'awaiting-confirmation',
      organisation: { id: customer.id, name: customer.name },
      total: 800_000,
      depositPaid: 240_000,
      currency: 'USD',
      confirmedAt: null,
    })
  })

  it('lists only the buyer’s own organisation’s orders for a buyer', async () => {
    const mine = await paidOrder(customer, buyer)
    const theirs = await paidOrder(otherCustomer, otherBuyer)
    const agent = await signInAs(ctx, buyer)

    const response = await agent.agent.get('/api/v1/orders').query({ pageSize: 100 }).expect(200)

    const ids = response.body.items.map((item: { id: string }) => item.id)
    expect(ids).toContain(mine.id)
    expect(ids).not.toContain(theirs.id)
    expect(response.body.items.every((item: { organisation: { id: string } }) => item.organisation.id === customer.id)).toBe(true)
    expect(response.body.total).toBe(await ctx.dataSource.getRepository(SalesOrder).countBy({ organisationId: customer.id }))
  })

  it('filters by status and refuses a page size over 100', async () => {
    const agent = await signInAs(ctx, sales)
    const confirmedOnly = await agent.agent.get('/api/v1/orders').query({ status: 'confirmed' }).expect(200)
    expect(confirmedOnly.body.items.every((item: { status: string }) => item.status === 'confirmed')).toBe(true)
    const tooMany = await agent.agent.get('/api/v1/orders').query({ pageSize: 101 })
    expect(tooMany.status).toBe(400)
    expect(tooMany.body.error.fields).toHaveProperty('query.pageSize')
  })
})

describe('GET /api/v1/orders/:id', () => {
  it('shows the order to its buyer and to sales with the balance left after the deposit', async () => {
    const order = await paidOrder(customer, buyer, { total: 1_000_000, depositAmount: 250_000 })

    for (const user of [buyer, sales]) {
      const agent = await signInAs(ctx, user)
      const response = await agent.agent.get(`/api/v1/orders/${order.id}`).expect(200)
      expect(response.body).toMatchObject({ id: order.id, number: order.number, quoteState: 'deposit-paid', balance: 750_000, acceptedByName: 'Ines Marlow', salesEngineer: { id: sales.id } })
    }
  })

  it('answers 404 to a buyer of another organisation', async () => {
    const order = await paidOrder(customer, buyer)
    const agent = await signInAs(ctx, otherBuyer)

    const response = await agent.agent.get(`/api/v1/orders/${order.id}`)

    expect(response.status).toBe(404)
    expect(response.body.error.code).toBe('not_found')
  })
})

describe('POST /api/v1/orders/:id/confirm', () => {
  it('lets sales confirm: the quote becomes ordered, confirmedAt is set and audited; a second confirm is 409', async () => {
    const order = await paidOrder(customer, buyer)
    const before = await quoteState(ctx.dataSource, order.quoteId)
    const agent = await signInAs(ctx, sales)

    const response = await confirm(agent, order.id)

    expect(response.status).toBe(200)
    expect(response.body).toMatchObject({ id: order.id, status: 'confirmed', quoteState: 'ordered' })
    expect(response.body.confirmedAt).toEqual(expect.any(String))
    expect(await quoteState(ctx.dataSource, order.quoteId)).toEqual({ state: 'ordered', version: before.version + 1 })
    const stored = await ctx.dataSource.getRepository(SalesOrder).findOneByOrFail({ id: order.id })
    expect(stored.confirmedAt).toBeInstanceOf(Date)
    expect(await ctx.dataSource.getRepository(AuditEntry).findOneBy({ entity: 'sales_order', entityId: order.id, action: 'order.confirmed' })).toMatchObject({ actorId: sales.id })

    const again = await confirm(agent, order.id)
    expect(again.status).toBe(409)
    expect(again.body.error.code).toBe('order_already_confirmed')
  })

  it('answers 403 to a buyer, even of the order’s own organisation, and changes nothing', async () => {
    const order = await paidOrder(customer, buyer)
    const agent = await signInAs(ctx, buyer)

    const response = await confirm(agent, order.id)

    expect(response.status).toBe(403)
    expect(await quoteState(ctx.dataSource, order.quoteId)).toMatchObject({ state: 'deposit-paid' })
    expect((await ctx.dataSource.getRepository(SalesOrder).findOneByOrFail({ id: order.id })).confirmedAt).toBeNull()
  })

  it('answers 404 for an order that does not exist', async () => {
    const agent = await signInAs(ctx, sales)
    expect((await confirm(agent, '00000000-0000-4000-8000-000000000000')).status).toBe(404)
  })
})

describe('order numbers', () => {
  it('stay unique and consecutive when several deposits are paid at the same moment', async () => {
    const quotes = await Promise.all(Array.from({ length: 6 }, () => createAcceptedQuote(ctx.dataSource, { organisation: customer, buyer, sales })))
    const deposits = await Promise.all(quotes.map((accepted) => insertOpenDeposit(ctx.dataSource, accepted)))

    const answers = await Promise.all(deposits.map((deposit) => postWebhook(ctx, sessionEvent(deposit))))

    expect(answers.map((answer) => answer.status)).toEqual(deposits.map(() => 200))
    const orders = await ctx.dataSource.getRepository(SalesOrder).find({ order: { number: 'ASC' } })
    const numbers = orders.map((order) => order.number)
    expect(new Set(numbers).size).toBe(numbers.length)
    expect(numbers.every((number) => /^SO-\d{4}-\d{5}$/.test(number))).toBe(true)
    const sequence = numbers.map((number) => Number(number.slice(-5)))
    expect(sequence).toEqual(sequence.map((_, index) => (sequence[0] ?? 0) + index))
    for (const accepted of quotes) expect(await quoteState(ctx.dataSource, accepted.quote.id)).toMatchObject({ state: 'deposit-paid' })
  })
})
