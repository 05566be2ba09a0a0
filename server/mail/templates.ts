// The e-mails the portal sends about quotes, as plain text and simple HTML. Plain functions over
// plain data: the quote service gathers the figures, a template only words and formats them, and
// the result goes straight into enqueueMail.
import { formatBasisPoints, formatMoney, isCurrencyCode, parseIsoDate, type CurrencyCode } from '../../shared/pricing'
import type { Config } from '../config'
import type { OutboxAttachment, OutgoingMail } from './outbox'

export interface MailPerson {
  name: string
  email: string
}

/** What every quote mail needs to say which quote it is about and where to find it. */
export interface QuoteMailContext {
  /** Base address of the portal, e.g. https://portal.ashcombe.test (see portalUrlFrom). */
  portalUrl: string
  quoteId: string
  /** The revision's full number, e.g. SW-2031-00042B. */
  quoteNumber: string
  /** The revision letter, e.g. B. */
  revision: string
  customerName: string
  buyer: MailPerson
  salesEngineer: MailPerson
  /** ISO 4217 code of every amount in the mail (minor units). */
  currency: string
  /** Defaults to Ashcombe Motor Works. */
  makerName?: string
}

/** A stored quote PDF: path relative to the data directory (as quote_revision.pdfFile keeps it). */
export interface QuotePdf {
  path: string
  /** Defaults to `<quoteNumber>.pdf`. */
  filename?: string
}

export interface QuoteIssuedMailData extends QuoteMailContext {
  validUntil: string
  total: number
  depositAmount: number
  /** Deposit share in basis points (3000 = 30 %). */
  depositBp: number
  /** Incoterms 2020 rule and place, e.g. "FCA Ashcombe works". */
  incoterms: string
  /** The quote PDF, required: the buyer's purchasing department files it. */
  pdf: QuotePdf
}

export interface QuoteAcceptedMailData extends QuoteMailContext {
  acceptedByName: string
  purchaseOrderRef: string
  acceptedAt: Date | string
  total: number
  depositAmount: number
  pdf?: QuotePdf
}

export interface DepositReceivedMailData extends QuoteMailContext {
  amount: number
  paidAt: Date | string
  /** The payment's reference at the payment provider (PaymentIntent id), when known. */
  paymentReference?: string | null
  /** The order the deposit released, once it exists. */
  orderNumber: string | null
  /** The buyer's purchase order, when known. */
  purchaseOrderRef?: string | null
  /** Left to pay after the deposit, when known. */
  balance?: number | null
  pdf?: QuotePdf
}

export interface ExpiryReminderMailData extends QuoteMailContext {
  validUntil: string
  /** Whole days from today to validUntil (0: the last day). */
  daysLeft: number
  total: number
  pdf?: QuotePdf
}

const DEFAULT_MAKER = 'Ashcombe Motor Works'

/** The portal's base address: PUBLIC_URL when set, otherwise where the server listens. */
export function portalUrlFrom(config: Pick<Config, 'PUBLIC_URL' | 'HOST' | 'PORT'>): string {
  return (config.PUBLIC_URL ?? `http://${config.HOST}:${config.PORT}`).replace(/\/+$/, '')
}

/** Sent when a sales engineer issues a revision: to the buyer, copy to the sales engineer, PDF attached. */
export function quoteIssuedMail(data: QuoteIssuedMailData): OutgoingMail {
  const money = moneyFormatter(data.currency)
  const maker = data.makerName ?? DEFAULT_MAKER
  const link = quoteLink(data)
  const figures: Figure[] = [
    ['Quote', `${data.quoteNumber} (revision ${data.revision})`],
    ['Customer', data.customerName],
    ['Total', money(data.total)],
    ['Deposit to release the first lot', `${money(data.depositAmount)} (${formatBasisPoints(data.depositBp)})`],
    ['Delivery', data.incoterms],
    ['Valid until', formatDate(data.validUntil)],
  ]
  return render(data, {
    kind: 'quote-issued',
    to: [data.buyer.email],
    cc: [data.salesEngineer.email],
    subject: `Quote ${data.quoteNumber} from ${maker}`,
    greeting: data.buyer.name,
    paragraphs: [
      `${data.salesEngineer.name} has issued quote ${data.quoteNumber} for ${data.customerName}. The PDF is attached for your purchasing records.`,
      `You can read every line, its operating point at your duty and the terms in the portal, and accept the quote there with your purchase-order reference. Any change to the quote produces a new revision; this one stays as it is.`,
    ],
    figures,
    action: { label: 'Open the quote', url: link },
    closing: `Questions about this quote: ${data.salesEngineer.name}, ${data.salesEngineer.email}.`,
    attachments: [pdfAttachment(data, data.pdf)],
  })
}

/** Sent when the buyer accepts online: to the sales engineer and the buyer. */
export function quoteAcceptedMail(data: QuoteAcceptedMailData): OutgoingMail {
  const money = moneyFormatter(data.currency)
  const figures: Figure[] = [
    ['Quote', `${data.quoteNumber} (revision ${data.revision})`],
    ['Customer', data.customerName],
    ['Accepted by', data.acceptedByName],
    ['Purchase order', data.purchaseOrderRef],
    ['Accepted on', formatInstant(data.acceptedAt)],
    ['Total', money(data.total)],
    ['Deposit due', money(data.depositAmount)],
  ]
  return render(data, {
    kind: 'quote-accepted',
    to: [data.salesEngineer.email, data.buyer.email],
    subject: `Quote ${data.quoteNumber} accepted by ${data.customerName}`,
    greeting: `${data.buyer.name} and ${data.salesEngineer.name}`,
    paragraphs: [
      `${data.acceptedByName} accepted quote ${data.quoteNumber} on behalf of ${data.customerName} under purchase order ${data.purchaseOrderRef}.`,
      data.depositAmount > 0
        ? `The next step is the deposit of ${money(data.depositAmount)}, which releases the first lot. It can be paid by card from the quote page in the portal.`
        : 'This quote asks for no deposit; the order follows from the acceptance.',
    ],
    figures,
    action: { label: data.depositAmount > 0 ? 'Pay the deposit' : 'Open the quote', url: quoteLink(data) },
    closing: 'Both of you receive this message so that the buyer and the sales engineer hold the same record.',
    attachments: data.pdf ? [pdfAttachment(data, data.pdf)] : [],
  })
}

/** The receipt for a paid deposit: to the buyer, copy to the sales engineer. */
export function depositReceivedMail(data: DepositReceivedMailData): OutgoingMail {
  const money = moneyFormatter(data.currency)
  const figures: Figure[] = [
    ['Amount received', money(data.amount)],
    ['Received on', formatInstant(data.paidAt)],
    ...optional('Payment reference', data.paymentReference),
    ['Quote', `${data.quoteNumber} (revision ${data.revision})`],
    ...optional('Purchase order', data.purchaseOrderRef),
    ...optional('Order', data.orderNumber),
    ...optional('Balance after the deposit', data.balance === null || data.balance === undefined ? null : money(data.balance)),
  ]
  return render(data, {
    kind: 'deposit-received',
    to: [data.buyer.email],
    cc: [data.salesEngineer.email],
    subject: `Deposit received for quote ${data.quoteNumber}`,
    greeting: data.buyer.name,
    paragraphs: [
      `Thank you: we have received the deposit of ${money(data.amount)} for quote ${data.quoteNumber}. Keep this message as your receipt.`,
      data.orderNumber
        ? `The first lot is released under order ${data.orderNumber}; ${data.salesEngineer.name} will confirm the delivery dates.`
        : `${data.salesEngineer.name} will confirm the order and its delivery dates.`,
    ],
    figures,
    action: { label: 'See the order', url: quoteLink(data) },
    closing: 'The card payment was handled by our payment provider; the portal never sees card numbers.',
    attachments: data.pdf ? [pdfAttachment(data, data.pdf)] : [],
  })
}

/** A reminder before an issued quote lapses: to the buyer, copy to the sales engineer. */
export function expiryReminderMail(data: ExpiryReminderMailData): OutgoingMail {
  const money = moneyFormatter(data.currency)
  const when = data.daysLeft <= 0 ? 'today' : data.daysLeft === 1 ? 'tomorrow' : `in ${data.daysLeft} days`
  const figures: Figure[] = [
    ['Quote', `${data.quoteNumber} (revision ${data.revision})`],
    ['Customer', data.customerName],
    ['Total', money(data.total)],
    ['Valid until', formatDate(data.validUntil)],
  ]
  return render(data, {
    kind: 'quote-expiry-reminder',
    to: [data.buyer.email],
    cc: [data.salesEngineer.email],
    subject: `Quote ${data.quoteNumber} expires ${when}`,
    greeting: data.buyer.name,
    paragraphs: [
      `Quote ${data.quoteNumber} for ${data.customerName} is valid until ${formatDate(data.validUntil)}, which is ${when}. Its prices and copper surcharge hold until the end of that day.`,
      `To keep them, accept the quote in the portal before then. After that date ${data.salesEngineer.name} can issue a new revision at the prices current at the time.`,
    ],
    figures,
    action: { label: 'Review the quote', url: quoteLink(data) },
    closing: `Questions: ${data.salesEngineer.name}, ${data.salesEngineer.email}.`,
    attachments: data.pdf ? [pdfAttachment(data, data.pdf)] : [],
  })
}

// ---------------------------------------------------------------------------------------------
// Layout shared by the templates

type Figure = readonly [label: string, value: string]

interface MailParts {
  kind: string
  to: string[]
  cc?: string[]
  subject: string
  greeting: string
  paragraphs: string[]
  figures: Figure[]
  action: { label: string; url: string }
  closing: string
  attachments: OutboxAttachment[]
}

// Deep teal and copper, the portal's own colours.
const TEAL = '#0f5c5a'
const COPPER = '#b5653a'

function render(context: QuoteMailContext, parts: MailParts): OutgoingMail {
  const maker = context.makerName ?? DEFAULT_MAKER
  const width = Math.max(...parts.figures.map(([label]) => label.length))
  const text = [
    `Hello ${parts.greeting},`,
    '',
    ...parts.paragraphs.flatMap((paragraph) => [paragraph, '']),
    ...parts.figures.map(([label, value]) => `  ${`${label}:`.padEnd(width + 2)}${value}`),
    '',
    `${parts.action.label}: ${parts.action.url}`,
    '',
    parts.closing,
    '',
    '-- ',
    `Spinwright, the quoting portal of ${maker}`,
    'This message was sent automatically; replies reach the sales team.',
    '',
  ].join('\n')

  const rows = parts.figures
    .map(
      ([label, value]) =>
        `<tr><td style="padding:4px 16px 4px 0;color:#555">${escapeHtml(label)}</td><td style="padding:4px 0;font-weight:600">${escapeHtml(value)}</td></tr>`,
    )
    .join('')
  const html = [
    '<!doctype html>',
    `<html lang="en"><head><meta charset="utf-8"><title>${escapeHtml(parts.subject)}</title></head>`,
    '<body style="margin:0;padding:0;background:#f4f6f6;font-family:Roboto,Arial,sans-serif;color:#1d2525">',
    '<div style="max-width:600px;margin:0 auto;padding:24px">',
    `<div style="border-top:4px solid ${TEAL};background:#ffffff;padding:24px">`,
    `<p style="margin:0 0 16px;font-size:13px;letter-spacing:0.04em;color:${TEAL};font-weight:700">SPINWRIGHT &middot; ${escapeHtml(maker.toUpperCase())}</p>`,
    `<p>Hello ${escapeHtml(parts.greeting)},</p>`,
    ...parts.paragraphs.map((paragraph) => `<p style="line-height:1.5">${escapeHtml(paragraph)}</p>`),
    `<table role="presentation" style="border-collapse:collapse;margin:16px 0;font-size:14px">${rows}</table>`,
    `<p style="margin:24px 0"><a href="${escapeHtml(parts.action.url)}" style="background:${TEAL};color:#ffffff;padding:10px 18px;text-decoration:none;border-radius:4px">${escapeHtml(parts.action.label)}</a></p>`,
    `<p style="font-size:13px;color:#555">Or copy this address: ${escapeHtml(parts.action.url)}</p>`,
    `<p style="line-height:1.5">${escapeHtml(parts.closing)}</p>`,
    '</div>',
    `<p style="font-size:12px;color:#6b7575;border-top:1px solid ${COPPER};padding-top:8px">Spinwright, the quoting portal of ${escapeHtml(maker)}. This message was sent automatically; replies reach the sales team.</p>`,
    '</div></body></html>',
  ].join('\n')

  return {
    kind: parts.kind,
    reference: context.quoteId,
    to: parts.to,
    cc: parts.cc ?? [],
    subject: parts.subject,
    text,
    html,
    attachments: parts.attachments,
  }
}

function optional(label: string, value: string | null | undefined): Figure[] {
  return value ? [[label, value]] : []
}

function quoteLink(context: QuoteMailContext): string {
  return `${context.portalUrl.replace(/\/+$/, '')}/quotes/${encodeURIComponent(context.quoteId)}`
}

function pdfAttachment(context: QuoteMailContext, pdf: QuotePdf): OutboxAttachment {
  return { filename: pdf.filename ?? `${context.quoteNumber}.pdf`, contentType: 'application/pdf', path: pdf.path }
}

function moneyFormatter(currency: string): (minor: number) => string {
  if (!isCurrencyCode(currency)) throw new RangeError(`unknown currency ${currency}`)
  const code: CurrencyCode = currency
  return (minor) => formatMoney(minor, code)
}

const DATE_FORMAT = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' })
const INSTANT_FORMAT = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric',
  month: 'long',
  year: 'numeric',
  hour: '2-digit',
  minute: '2-digit',
  hourCycle: 'h23',
  timeZone: 'UTC',
})

/** 2031-03-12 -> "12 March 2031" (calendar dates carry no time zone). */
export function formatDate(isoDate: string): string {
  const day = parseIsoDate(isoDate)
  if (day === null) throw new RangeError(`not an ISO calendar date: ${isoDate}`)
  return DATE_FORMAT.format(new Date(day * 86_400_000))
}

/** An instant in UTC, e.g. "12 March 2031 at 14:05 UTC". */
export function formatInstant(value: Date | string): string {
  const date = typeof value === 'string' ? new Date(value) : value
  if (Number.isNaN(date.getTime())) throw new RangeError(`not a date: ${String(value)}`)
  return `${INSTANT_FORMAT.format(date)} UTC`
}

export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (ch) => `&#${ch.charCodeAt(0)};`)
}
