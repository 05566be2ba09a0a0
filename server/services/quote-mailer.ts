// The quote lifecycle's e-mails, written to the outbox in the lifecycle's own transaction.
import type { EntityManager } from 'typeorm'
import type { QuoteDocument } from '../../shared/contracts/quote.contract'
import { enqueueMail } from '../mail/outbox'
import { expiryReminderMail, quoteAcceptedMail, quoteIssuedMail } from '../mail/templates'
import { MailOutbox } from '../db/entities/mail-outbox.entity'
import type { QuoteMailer } from './quote.service'

function context(doc: QuoteDocument, quoteId: string, portalUrl: string, buyerEmail: string) {
  return {
    portalUrl,
    quoteId,
    quoteNumber: `${doc.number}${doc.revision}`,
    revision: doc.revision,
    customerName: doc.customer.name,
    buyer: { name: doc.customer.contactName || doc.customer.name, email: buyerEmail },
    salesEngineer: { name: doc.salesEngineer.name, email: doc.salesEngineer.email },
    currency: doc.currency,
    makerName: doc.maker.name,
  }
}

export function outboxQuoteMailer(portalUrl: string): QuoteMailer {
  return {
    async reminder(manager: EntityManager, { doc, to, daysLeft, quoteId }) {
      const reference = `${quoteId}:${doc.revision}`
      if (await manager.existsBy(MailOutbox, { kind: 'quote-expiry-reminder', reference })) return false
      for (const email of to) {
        const mail = expiryReminderMail({ ...context(doc, quoteId, portalUrl, email), validUntil: doc.validUntil, daysLeft, total: doc.priced.totals.total })
        await enqueueMail(manager, { ...mail, reference })
      }
      return true
    },
    async issued(manager: EntityManager, { doc, to, pdfPath, quoteId }) {
      for (const email of to) {
        await enqueueMail(
          manager,
          quoteIssuedMail({
            ...context(doc, quoteId, portalUrl, email),
            validUntil: doc.validUntil,
            total: doc.priced.totals.total,
            depositAmount: doc.priced.totals.depositAmount,
            depositBp: doc.terms.depositBp,
            incoterms: `${doc.terms.incoterm} ${doc.terms.incotermPlace}`,
            pdf: { path: pdfPath, filename: `${doc.number}${doc.revision}.pdf` },
          }),
        )
      }
    },
    async accepted(manager: EntityManager, { doc, to, acceptedByName, purchaseOrderRef, quoteId }) {
      const buyerEmail = to[0]
      if (!buyerEmail) return
      await enqueueMail(
        manager,
        quoteAcceptedMail({
          ...context(doc, quoteId, portalUrl, buyerEmail),
          acceptedByName,
          purchaseOrderRef,
          acceptedAt: new Date(),
          total: doc.priced.totals.total,
          depositAmount: doc.priced.totals.depositAmount,
        }),
      )
    },
  }
}
