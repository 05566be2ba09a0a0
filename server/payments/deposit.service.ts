// The buyer's deposit on an accepted quote: a Checkout Session on the payment API and a
// deposit_payment row, written together so that a failure of either leaves nothing behind.
import { randomUUID } from 'node:crypto'
import type Stripe from 'stripe'
import type { DataSource, EntityManager } from 'typeorm'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import type { DepositAttempt, DepositStart, DepositStatusView } from '../../shared/contracts/payment.contract'
import { DepositPayment, QuoteAcceptance, QuoteRecordEntity, QuoteRevisionRecord, SalesOrder } from '../db/entities'
import { ConflictError, NotFoundError, ServiceUnavailableError } from '../http/errors'
import { isMissingResource, isPaymentApiDown, isPaymentApiMisconfigured } from './stripe-client'

export interface DepositServiceDeps {
  dataSource: DataSource
  stripe: Stripe
  /** Origin of the SPA the buyer comes back to (PUBLIC_URL, else http://HOST:PORT). */
  publicUrl: string
  log: (error: unknown) => void
  /** Applies a session the payment API reports paid (see PaymentWebhookService.reconcile). */
  reconcile?: (checkoutSessionId: string) => Promise<unknown>
}

const UNAVAILABLE_MESSAGE =
  'Card payments cannot be taken right now because our payment service is not answering. Nothing was charged; please try again in a few minutes.'

export class DepositService {
  private readonly publicUrl: string

  constructor(private readonly deps: DepositServiceDeps) {
    this.publicUrl = deps.publicUrl.replace(/\/+$/, '')
  }

  /**
   * Starts (or resumes) paying the deposit of an accepted quote and answers the hosted page's URL.
   *
   * Decision on an earlier attempt that is still open: it is handed out again (same session, same
   * URL) as long as it is for the accepted revision and amount. One quote then never has two payable
   * sessions, so a buyer with two tabs cannot pay twice. An open session for another revision or
   * amount is expired on the payment API first; a session the API reports expired (or no longer
   * knows) is marked expired here and a fresh one is made.
   *
   * The quote row stays locked (SELECT ... FOR UPDATE) while the payment API is called, which
   * serialises concurrent starts of one quote and keeps the webhook from interleaving.
   */
  async start(user: SessionUser, quoteId: string): Promise<DepositStart> {
    return this.deps.dataSource.transaction(async (manager) => {
      const quote = await manager.getRepository(QuoteRecordEntity).findOne({ where: { id: quoteId }, lock: { mode: 'pessimistic_write' } })
      if (!quote || !isBuyerOf(user, quote)) throw new NotFoundError('Quote')
      const deposits = manager.getRepository(DepositPayment)
      if (quote.state === 'deposit-paid' || quote.state === 'ordered' || (await deposits.exists({ where: { paidQuoteId: quote.id } }))) {
        throw new ConflictError('The deposit of this quote has already been paid.', 'deposit_already_paid')
      }
      if (quote.state !== 'accepted') {
        throw new ConflictError(`The quote is ${quote.state}; a deposit can be paid only after the quote has been accepted.`, 'quote_not_accepted')
      }
      const { acceptance, revision } = await acceptedRevision(manager, quote.id)

      const open = await deposits.find({ where: { quoteId: quote.id, status: 'open' }, order: { createdAt: 'DESC' } })
      for (const row of open) {
        const session = await this.retrieveOrNull(row.checkoutSessionId)
        if (session?.status === 'complete') {
          throw new ConflictError('Your deposit payment has been received and is being confirmed; refresh this page in a moment.', 'deposit_processing')
        }
        const usable = session?.status === 'open' && session.url !== null && row.revision === acceptance.revision && row.amount === revision.depositAmount
        if (usable && session.url) {
          return { depositId: row.id, url: session.url, reused: true, amount: row.amount, currency: row.currency, expiresAt: unixToIso(session.expires_at) }
        }
        if (session?.status === 'open') await this.call(() => this.deps.stripe.checkout.sessions.expire(row.checkoutSessionId, {}, { idempotencyKey: `spinwright-deposit-${row.id}-expire` }))
        row.status = 'expired'
        await deposits.save(row)
      }

      const depositId = randomUUID()
      const currency = quote.currency.toLowerCase()
      const returnTo = `${this.publicUrl}/quotes/${encodeURIComponent(quote.id)}`
      const quoteLabel = quote.number ?? revision.fullNumber
      const session = await this.call(() =>
        this.deps.stripe.checkout.sessions.create(
          {
            mode: 'payment',
            line_items: [
              {
                quantity: 1,
                price_data: {
                  currency,
                  unit_amount: revision.depositAmount,
                  product_data: {
                    name: `Deposit for quote ${quoteLabel} rev ${acceptance.revision}`,
                    description: `Purchase order ${acceptance.purchaseOrderRef}`,
                  },
                },
              },
            ],
            client_reference_id: quote.id,
            metadata: { quoteId: quote.id, revision: acceptance.revision, depositId },
            customer_email: user.email,
            success_url: `${returnTo}?deposit=return&session_id={CHECKOUT_SESSION_ID}`,
            cancel_url: `${returnTo}?deposit=cancelled`,
          },
          // Derived from the row about to be written: a retry of this very call cannot make a second session.
          { idempotencyKey: `spinwright-deposit-${depositId}` },
        ),
      )
      if (!session.url) throw new Error(`payment API returned Checkout Session ${session.id} without a url`)
      // Written after the session exists and before commit: if this insert or the commit fails, the
      // session is left unpaid at the payment API and expires there; no row points at nothing.
      await deposits.insert({
        id: depositId,
        quoteId: quote.id,
        revision: acceptance.revision,
        checkoutSessionId: session.id,
        amount: revision.depositAmount,
        currency: quote.currency,
        status: 'open',
        paymentIntentId: null,
        paidQuoteId: null,
        paidAt: null,
      })
      return { depositId, url: session.url, reused: false, amount: revision.depositAmount, currency: quote.currency, expiresAt: unixToIso(session.expires_at) }
    })
  }

  /** State of the latest deposit attempt, for the page the buyer returns to (and for sales). */
  async status(user: SessionUser, quoteId: string): Promise<DepositStatusView> {
    const manager = this.deps.dataSource.manager
    const quotes = manager.getRepository(QuoteRecordEntity)
    const deposits = manager.getRepository(DepositPayment)
    let quote = await quotes.findOne({ where: { id: quoteId } })
    if (!quote || !canSee(user, quote)) throw new NotFoundError('Quote')
    let latest = await deposits.findOne({ where: { quoteId }, order: { createdAt: 'DESC' } })
    if (latest?.status === 'open' && this.deps.reconcile) {
      // The return page polls this: if the webhook is late or was lost, ask the payment API directly.
      try {
        await this.deps.reconcile(latest.checkoutSessionId)
        quote = (await quotes.findOne({ where: { id: quoteId } })) ?? quote
        latest = await deposits.findOne({ where: { id: latest.id } })
      } catch (error) {
        // The answer from our own records is still right; only a bug is worth logging.
        if (!isPaymentApiDown(error) && !isMissingResource(error)) this.deps.log(error)
      }
    }
    const order = await manager.getRepository(SalesOrder).findOne({ where: { quoteId } })
    const paid = await deposits.exists({ where: { paidQuoteId: quoteId } })
    return {
      quoteId,
      quoteState: quote.state,
      payable: quote.state === 'accepted' && !paid,
      deposit: latest ? toAttempt(latest) : null,
      order: order ? { id: order.id, number: order.number } : null,
    }
  }

  private async retrieveOrNull(sessionId: string): Promise<Stripe.Checkout.Session | null> {
    try {
      return await this.deps.stripe.checkout.sessions.retrieve(sessionId)
    } catch (error) {
      if (isMissingResource(error)) return null
      throw this.translate(error)
    }
  }

  private async call<T>(request: () => Promise<T>): Promise<T> {
    try {
      return await request()
    } catch (error) {
      throw this.translate(error)
    }
  }

  private translate(error: unknown): unknown {
    if (isPaymentApiDown(error)) return new ServiceUnavailableError(UNAVAILABLE_MESSAGE, 'payment_unavailable')
    if (isPaymentApiMisconfigured(error)) {
      this.deps.log(error)
      return new ServiceUnavailableError(UNAVAILABLE_MESSAGE, 'payment_unavailable')
    }
    return error
  }
}

/** The acceptance of a quote and the revision it accepted (both must exist once a quote is 'accepted'). */
export async function acceptedRevision(manager: EntityManager, quoteId: string): Promise<{ acceptance: QuoteAcceptance; revision: QuoteRevisionRecord }> {
  const acceptance = await manager.getRepository(QuoteAcceptance).findOne({ where: { quoteId } })
  if (!acceptance) throw new ConflictError('The quote has no recorded acceptance; accept it before paying the deposit.', 'quote_not_accepted')
  const revision = await manager.getRepository(QuoteRevisionRecord).findOne({ where: { id: acceptance.revisionId } })
  if (!revision || revision.quoteId !== quoteId) throw new Error(`acceptance of quote ${quoteId} names revision ${acceptance.revisionId}, which is not one of its revisions`)
  return { acceptance, revision }
}

function isBuyerOf(user: SessionUser, quote: QuoteRecordEntity): boolean {
  return user.role === 'buyer' && user.organisation.id === quote.organisationId
}

function canSee(user: SessionUser, quote: QuoteRecordEntity): boolean {
  return user.role === 'admin' || user.role === 'sales' || isBuyerOf(user, quote)
}

function toAttempt(row: DepositPayment): DepositAttempt {
  return {
    id: row.id,
    status: row.status,
    revision: row.revision,
    amount: row.amount,
    currency: row.currency,
    createdAt: row.createdAt.toISOString(),
    paidAt: row.paidAt ? row.paidAt.toISOString() : null,
  }
}

function unixToIso(seconds: number | null | undefined): string | null {
  return typeof seconds === 'number' ? new Date(seconds * 1000).toISOString() : null
}
