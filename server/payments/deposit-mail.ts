// The single place where a paid deposit asks for its receipt e-mail, inside the webhook's transaction.
import type { EntityManager } from 'typeorm'

export interface DepositReceipt {
  quoteId: string
  quoteNumber: string
  revision: string
  orderNumber: string
  /** Minor units of `currency`. */
  amount: number
  currency: string
  paidAt: Date
  purchaseOrderRef: string
  /** The buyer who accepted (and the e-mail given on the checkout page, when different). */
  to: string[]
  /** The quote's sales engineer. */
  cc: string[]
}

/**
 * TODO(mail outbox): enqueue the deposit receipt here once server/mail is on main, e.g.
 *   await enqueueMail(manager, templates.depositReceived(receipt))
 * Until then this records nothing; the webhook already calls it at the right point of its
 * transaction, so wiring the outbox is a change to this function only.
 */
export async function enqueueDepositReceipt(manager: EntityManager, receipt: DepositReceipt): Promise<void> {
  void manager
  void receipt
}
