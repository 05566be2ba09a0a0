// The deposit receipt: built from the mail templates and put in the outbox inside the webhook's
// transaction, so the receipt exists if and only if the payment was recorded.
import type { EntityManager } from 'typeorm'
import { depositReceivedMail, enqueueMail, InvalidMailError, type MailPerson, type OutgoingMail } from '../mail'
import { isInsideDataDir } from '../mail/outbox'

export interface DepositReceipt {
  portalUrl: string
  quoteId: string
  /** The revision's full number. */
  quoteNumber: string
  revision: string
  customerName: string
  buyer: MailPerson
  salesEngineer: MailPerson
  orderNumber: string
  /** Minor units of `currency`. */
  amount: number
  balance: number
  currency: string
  paidAt: Date
  paymentReference: string | null
  purchaseOrderRef: string
  /** The revision's stored PDF (relative to the data directory), if any. */
  pdfFile: string | null
}

/**
 * Enqueues the receipt. A message the templates cannot build (an unknown currency, a malformed
 * address) is logged and skipped: a receipt must never stop a received payment from being recorded.
 * A database failure, on the other hand, rolls the whole webhook back as it should.
 */
export async function enqueueDepositReceipt(manager: EntityManager, receipt: DepositReceipt, log: (error: unknown) => void): Promise<void> {
  let mail: OutgoingMail
  try {
    mail = depositReceivedMail({
      portalUrl: receipt.portalUrl,
      quoteId: receipt.quoteId,
      quoteNumber: receipt.quoteNumber,
      revision: receipt.revision,
      customerName: receipt.customerName,
      buyer: receipt.buyer,
      salesEngineer: receipt.salesEngineer,
      currency: receipt.currency,
      amount: receipt.amount,
      paidAt: receipt.paidAt,
      paymentReference: receipt.paymentReference,
      orderNumber: receipt.orderNumber,
      purchaseOrderRef: receipt.purchaseOrderRef,
      balance: receipt.balance,
      pdf: receipt.pdfFile && isInsideDataDir(receipt.pdfFile) ? { path: receipt.pdfFile } : undefined,
    })
  } catch (error) {
    log(error)
    return
  }
  try {
    await enqueueMail(manager, { ...mail, reference: mail.reference ?? receipt.quoteId })
  } catch (error) {
    if (!(error instanceof InvalidMailError)) throw error
    log(error)
  }
}
