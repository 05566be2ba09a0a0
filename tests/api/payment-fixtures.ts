// Data builders for the deposit and order API tests: an accepted quote written straight through the
// repositories (the quote service is not needed), and signed webhook deliveries.
import { randomInt, randomUUID } from 'node:crypto'
import Stripe from 'stripe'
import request from 'supertest'
import type { DataSource } from 'typeorm'
import { DepositPayment, Organisation, QuoteAcceptance, QuoteRecordEntity, User } from '../../server/db/entities'
import type { TestContext } from './support'

export const WEBHOOK_SECRET = 'whsec_spinwright_payment_tests'
export const STRIPE_KEY = 'sk_test_spinwright_payment_tests'

export interface AcceptedQuote {
  quote: QuoteRecordEntity
  revisionId: string
  total: number
  depositAmount: number
}

export interface AcceptedQuoteOptions {
  organisation: Organisation
  buyer: User
  sales: User
  total?: number
  depositAmount?: number
  currency?: string
  purchaseOrderRef?: string
}

/** A quote in state 'accepted' with one issued revision A and its acceptance. */
export async function createAcceptedQuote(dataSource: DataSource, options: AcceptedQuoteOptions): Promise<AcceptedQuote> {
  const total = options.total ?? 1_234_500
  const depositAmount = options.depositAmount ?? 370_350
  const number = `SW-2026-${String(randomInt(0, 1_000_000)).padStart(6, '0')}`
  const quotes = dataSource.getRepository(QuoteRecordEntity)
  const quote = await quotes.save(
    quotes.create({
      number,
      state: 'accepted',
      organisationId: options.organisation.id,
      requestedById: options.buyer.id,
      salesEngineerId: options.sales.id,
      studyId: null,
      currency: options.currency ?? 'USD',
      request: null,
      draft: null,
      currentRevision: 'A',
      validUntil: '2099-12-31',
      withdrawnReason: null,
    }),
  )
  // The frozen document does not matter to payments; an empty object keeps the fixture small.
  const revisionId = randomUUID()
  await dataSource.query(
    'INSERT INTO quote_revision (id, quoteId, letter, fullNumber, issuedById, validUntil, total, depositAmount, document) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)',
    [revisionId, quote.id, 'A', `${number}A`, options.sales.id, '2099-12-31', total, depositAmount, '{}'],
  )
  await dataSource.getRepository(QuoteAcceptance).insert({
    quoteId: quote.id,
    revisionId,
    revision: 'A',
    acceptedById: options.buyer.id,
    acceptedByName: 'Ines Marlow',
    purchaseOrderRef: options.purchaseOrderRef ?? `PO-${randomInt(10_000, 99_999)}`,
  })
  return { quote, revisionId, total, depositAmount }
}

export async function quoteState(dataSource: DataSource, quoteId: string): Promise<{ state: string; version: number }> {
  const quote = await dataSource.getRepository(QuoteRecordEntity).findOneByOrFail({ id: quoteId })
  return { state: quote.state, version: quote.version }
}

export async function depositsOf(dataSource: DataSource, quoteId: string): Promise<DepositPayment[]> {
  return dataSource.getRepository(DepositPayment).find({ where: { quoteId }, order: { createdAt: 'ASC' } })
}

/** An open deposit row as if a Checkout Session had been made for it (for webhook-only tests). */
export async function insertOpenDeposit(dataSource: DataSource, accepted: AcceptedQuote): Promise<DepositPayment> {
  const repository = dataSource.getRepository(DepositPayment)
  return repository.save(
    repository.create({
      quoteId: accepted.quote.id,
      revision: 'A',
      checkoutSessionId: `cs_test_${randomUUID().replaceAll('-', '')}`,
      amount: accepted.depositAmount,
      currency: accepted.quote.currency,
      status: 'open',
      paymentIntentId: null,
      paidQuoteId: null,
      paidAt: null,
    }),
  )
}

export interface SessionEventOptions {
  type?: 'checkout.session.completed' | 'checkout.session.expired'
  eventId?: string
  paymentStatus?: 'paid' | 'unpaid'
}

/** The JSON body of a checkout.session.* event about `deposit`, shaped as the payment API sends it. */
export function sessionEvent(deposit: DepositPayment, options: SessionEventOptions = {}): string {
  const type = options.type ?? 'checkout.session.completed'
  const completed = type === 'checkout.session.completed'
  return JSON.stringify({
    id: options.eventId ?? `evt_test_${randomUUID().replaceAll('-', '')}`,
    object: 'event',
    api_version: Stripe.API_VERSION,
    created: Math.floor(Date.now() / 1000),
    livemode: false,
    pending_webhooks: 1,
    request: { id: null, idempotency_key: null },
    type,
    data: {
      object: {
        id: deposit.checkoutSessionId,
        object: 'checkout.session',
        mode: 'payment',
        amount_total: deposit.amount,
        currency: deposit.currency.toLowerCase(),
        client_reference_id: deposit.quoteId,
        metadata: { quoteId: deposit.quoteId, revision: deposit.revision, depositId: deposit.id },
        customer_email: null,
        customer_details: null,
        payment_intent: completed ? `pi_test_${randomUUID().replaceAll('-', '').slice(0, 24)}` : null,
        payment_status: completed ? (options.paymentStatus ?? 'paid') : 'unpaid',
        status: completed ? 'complete' : 'expired',
        url: null,
      },
    },
  })
}

const signer = new Stripe(STRIPE_KEY)

/** POSTs `payload` to the webhook route, signed with `secret` (the app's own unless told otherwise). */
export function postWebhook(ctx: TestContext, payload: string, secret = WEBHOOK_SECRET) {
  const header = signer.webhooks.generateTestHeaderString({ payload, secret })
  return request(ctx.handle.app).post('/api/payments/webhook').set('Content-Type', 'application/json').set('Stripe-Signature', header).send(payload)
}
