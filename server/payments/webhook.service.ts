// Signed payment webhooks: verified with the SDK, each event handled once. The event id is stored in
// payment_event in the same transaction as its effect, so a duplicate or a replay changes nothing.
import type Stripe from 'stripe'
import type { DataSource, EntityManager } from 'typeorm'
import { AuditEntry, DepositPayment, Organisation, PaymentEvent, QuoteAcceptance, QuoteRecordEntity, QuoteRevisionRecord, SalesOrder, User } from '../db/entities'
import { AppError } from '../http/errors'
import { acceptedRevision } from './deposit.service'
import { enqueueDepositReceipt } from './deposit-mail'
import type { OrderService } from './order.service'

export interface PaymentWebhookDeps {
  dataSource: DataSource
  stripe: Stripe
  webhookSecret: string
  orders: OrderService
  /** Base address of the portal, for the links in the receipt. */
  portalUrl: string
  log: (error: unknown) => void
}

interface PaidFacts {
  quote: QuoteRecordEntity
  acceptance: QuoteAcceptance
  revision: QuoteRevisionRecord
  order: SalesOrder
  deposit: DepositPayment
  paidAt: Date
  paymentIntentId: string | null
}

export interface WebhookOutcome {
  duplicate: boolean
  /** What the event did, for the log and the tests. */
  effect: 'deposit-paid' | 'deposit-expired' | 'none'
}

/** Deadlocks and an order-number collision are retried with a fresh transaction. */
const MAX_ATTEMPTS = 4

class DuplicateEvent extends Error {}

export class PaymentWebhookService {
  constructor(private readonly deps: PaymentWebhookDeps) {}

  /** Checks the Stripe-Signature header against the raw body; anything wrong is a 400. */
  verify(rawBody: Buffer, signature: string | undefined): Stripe.Event {
    if (!signature) throw new AppError(400, 'signature_missing', 'The Stripe-Signature header is missing')
    try {
      return this.deps.stripe.webhooks.constructEvent(rawBody, signature, this.deps.webhookSecret)
    } catch {
      throw new AppError(400, 'signature_invalid', 'The webhook signature does not match this payload')
    }
  }

  async handle(event: Stripe.Event): Promise<WebhookOutcome> {
    try {
      return { duplicate: false, effect: await this.inTransaction((manager) => this.apply(manager, event)) }
    } catch (error) {
      if (error instanceof DuplicateEvent) return { duplicate: true, effect: 'none' }
      throw error
    }
  }

  /**
   * For a webhook that never arrived (the app was down through all the payment API's retries): reads
   * the session from the payment API itself, over our authenticated client, and applies it when
   * paid. Safe to call any number of times; a later delivery of the real event then changes nothing.
   */
  async reconcile(checkoutSessionId: string): Promise<WebhookOutcome['effect']> {
    const session = await this.deps.stripe.checkout.sessions.retrieve(checkoutSessionId)
    if (session.status !== 'complete' || session.payment_status !== 'paid') return 'none'
    return this.inTransaction((manager) => this.markPaid(manager, `reconcile:${checkoutSessionId}`, session))
  }

  private async inTransaction<T>(work: (manager: EntityManager) => Promise<T>): Promise<T> {
    for (let attempt = 1; ; attempt += 1) {
      try {
        return await this.deps.dataSource.transaction(work)
      } catch (error) {
        if (attempt >= MAX_ATTEMPTS || !isRetryable(error)) throw error
      }
    }
  }

  private async apply(manager: EntityManager, event: Stripe.Event): Promise<WebhookOutcome['effect']> {
    const events = manager.getRepository(PaymentEvent)
    // A replay usually comes after the first delivery committed: answer it without a failing insert.
    if (await events.existsBy({ eventId: event.id })) throw new DuplicateEvent()
    try {
      // Before the effect, so that a simultaneous second delivery waits on this key and then finds it.
      await events.insert({ eventId: event.id, type: event.type.slice(0, 80) })
    } catch (error) {
      if (driverCode(error) === 'ER_DUP_ENTRY') throw new DuplicateEvent()
      throw error
    }
    switch (event.type) {
      case 'checkout.session.completed':
      case 'checkout.session.async_payment_succeeded':
        // 'completed' with payment_status 'unpaid' is a delayed method still settling; it is only recorded.
        return event.data.object.payment_status === 'paid' ? this.markPaid(manager, event.id, event.data.object) : 'none'
      case 'checkout.session.expired':
        return this.markExpired(manager, event.data.object)
      default:
        return 'none'
    }
  }

  private async markPaid(manager: EntityManager, eventId: string, session: Stripe.Checkout.Session): Promise<WebhookOutcome['effect']> {
    const deposits = manager.getRepository(DepositPayment)
    const known = await deposits.findOne({ where: { checkoutSessionId: session.id } })
    const quoteId = known?.quoteId ?? session.metadata?.quoteId ?? session.client_reference_id
    if (!quoteId) {
      this.deps.log(new Error(`payment webhook ${eventId}: paid Checkout Session ${session.id} names no quote; recorded and ignored`))
      return 'none'
    }
    // Lock order shared with deposit starts and order confirmation: the quote row first.
    const quote = await manager.getRepository(QuoteRecordEntity).findOne({ where: { id: quoteId }, lock: { mode: 'pessimistic_write' } })
    if (!quote) {
      this.deps.log(new Error(`payment webhook ${eventId}: paid Checkout Session ${session.id} names unknown quote ${quoteId}; recorded and ignored`))
      return 'none'
    }
    const paidAt = new Date()
    const paymentIntentId = typeof session.payment_intent === 'string' ? session.payment_intent : (session.payment_intent?.id ?? null)
    let deposit = await deposits.findOne({ where: { checkoutSessionId: session.id }, lock: { mode: 'pessimistic_write' } })
    if (deposit?.status === 'paid') return 'none'
    if (!deposit) {
      // The session was made but our row was not committed (the start failed after the API call);
      // the money is real, so the row is made from the session itself.
      deposit = deposits.create({
        quoteId: quote.id,
        revision: session.metadata?.revision ?? quote.currentRevision ?? '?',
        checkoutSessionId: session.id,
        amount: session.amount_total ?? 0,
        currency: (session.currency ?? quote.currency).toUpperCase(),
        status: 'open',
        paymentIntentId: null,
        paidQuoteId: null,
        paidAt: null,
      })
    }
    const alreadyPaid = await deposits.findOne({ where: { paidQuoteId: quote.id } })
    deposit.status = 'paid'
    deposit.paidAt = paidAt
    deposit.paymentIntentId = paymentIntentId
    const audit = manager.getRepository(AuditEntry)
    const detail = { eventId, checkoutSessionId: session.id, paymentIntentId, amount: deposit.amount, currency: deposit.currency, revision: deposit.revision }

    if (alreadyPaid || quote.state !== 'accepted') {
      // Money arrived for a quote that is not waiting for it (paid already, or withdrawn or expired
      // meanwhile). It is recorded for sales to refund; the quote and any order stay as they are.
      await deposits.save(deposit)
      await audit.save(audit.create({ actorId: null, actorEmail: null, entity: 'quote', entityId: quote.id, action: 'deposit.paid-needs-refund', detail: { ...detail, quoteState: quote.state, otherPaidDepositId: alreadyPaid?.id ?? null } }))
      this.deps.log(new Error(`payment webhook ${eventId}: deposit paid on quote ${quote.id} in state ${quote.state}${alreadyPaid ? ' that was already paid' : ''}; needs a refund`))
      return 'none'
    }

    deposit.paidQuoteId = quote.id
    await deposits.save(deposit)
    const { acceptance, revision } = await acceptedRevision(manager, quote.id)
    quote.state = 'deposit-paid'
    await manager.getRepository(QuoteRecordEntity).save(quote)
    const order = await this.deps.orders.createForPaidDeposit(manager, {
      quote,
      revision: acceptance.revision,
      total: revision.total,
      depositPaid: deposit.amount,
      purchaseOrderRef: acceptance.purchaseOrderRef,
      at: paidAt,
    })
    await audit.save(audit.create({ actorId: null, actorEmail: null, entity: 'quote', entityId: quote.id, action: 'deposit.paid', detail: { ...detail, orderId: order.id, orderNumber: order.number } }))

    await this.sendReceipt(manager, { quote, acceptance, revision, order, deposit, paidAt, paymentIntentId })
    return 'deposit-paid'
  }

  private async sendReceipt(manager: EntityManager, paid: PaidFacts): Promise<void> {
    const users = manager.getRepository(User)
    const buyer = await users.findOne({ where: { id: paid.acceptance.acceptedById } })
    // The engineer on the quote, else the one who issued the accepted revision.
    const salesEngineer = await users.findOne({ where: { id: paid.quote.salesEngineerId ?? paid.revision.issuedById } })
    const organisation = await manager.getRepository(Organisation).findOne({ where: { id: paid.quote.organisationId } })
    if (!buyer || !salesEngineer || !organisation) {
      this.deps.log(new Error(`deposit receipt for quote ${paid.quote.id} not sent: its buyer, sales engineer or organisation is missing`))
      return
    }
    await enqueueDepositReceipt(
      manager,
      {
        portalUrl: this.deps.portalUrl,
        quoteId: paid.quote.id,
        quoteNumber: paid.revision.fullNumber,
        revision: paid.acceptance.revision,
        customerName: organisation.name,
        buyer: { name: buyer.name, email: buyer.email },
        salesEngineer: { name: salesEngineer.name, email: salesEngineer.email },
        orderNumber: paid.order.number,
        amount: paid.deposit.amount,
        balance: paid.order.total - paid.deposit.amount,
        currency: paid.deposit.currency,
        paidAt: paid.paidAt,
        paymentReference: paid.paymentIntentId,
        purchaseOrderRef: paid.acceptance.purchaseOrderRef,
        pdfFile: paid.revision.pdfFile,
      },
      this.deps.log,
    )
  }

  private async markExpired(manager: EntityManager, session: Stripe.Checkout.Session): Promise<WebhookOutcome['effect']> {
    const deposits = manager.getRepository(DepositPayment)
    const known = await deposits.findOne({ where: { checkoutSessionId: session.id } })
    if (!known || known.status !== 'open') return 'none'
    await manager.getRepository(QuoteRecordEntity).findOne({ where: { id: known.quoteId }, lock: { mode: 'pessimistic_write' } })
    const deposit = await deposits.findOne({ where: { id: known.id }, lock: { mode: 'pessimistic_write' } })
    if (!deposit || deposit.status !== 'open') return 'none'
    // The quote stays 'accepted': the buyer can start a new attempt.
    deposit.status = 'expired'
    await deposits.save(deposit)
    return 'deposit-expired'
  }
}

function driverCode(error: unknown): string | undefined {
  for (let current: unknown = error, depth = 0; current && typeof current === 'object' && depth < 3; depth += 1) {
    if ('code' in current && typeof current.code === 'string') return current.code
    current = 'driverError' in current ? current.driverError : undefined
  }
  return undefined
}

function isRetryable(error: unknown): boolean {
  const code = driverCode(error)
  return code === 'ER_LOCK_DEADLOCK' || code === 'ER_LOCK_WAIT_TIMEOUT' || (code === 'ER_DUP_ENTRY' && /sales_order|IDX_51ab5c9d08c7e89ffb38e00ee4/.test(String(error)))
}
