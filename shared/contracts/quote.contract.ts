// Quotes: a buyer's request, the sales engineer's draft, numbered immutable revisions, acceptance,
// the deposit and the order. Money in integer minor units of the quote's currency.
import { z } from 'zod'
import { INCOTERMS_2020 } from '../pricing/incoterms'
import type { PricedQuote } from '../pricing'

/**
 * Quote states (our names): requested (buyer asked, no draft yet), drafting (sales is working on
 * it), issued (a frozen revision is with the buyer), accepted (buyer accepted online), deposit-paid
 * (payment confirmed by the signed webhook; an order record exists), ordered (sales confirmed the
 * order), expired (validity passed before acceptance), withdrawn (sales or buyer withdrew it).
 */
export const QUOTE_STATES = ['requested', 'drafting', 'issued', 'accepted', 'deposit-paid', 'ordered', 'expired', 'withdrawn'] as const
export const quoteStateSchema = z.enum(QUOTE_STATES)
export type QuoteState = z.infer<typeof quoteStateSchema>

const isoDate = z.iso.date({ error: 'a date as YYYY-MM-DD' })

export const quoteRequestSchema = z.strictObject({
  studyId: z.uuid().optional(),
  partNumber: z.string().trim().min(3).max(40),
  tap: z.string().trim().min(1).max(20).optional(),
  quantityPerYear: z.number().int().min(1, { error: 'at least 1 per year' }).max(10_000_000),
  lotSize: z.number().int().min(1, { error: 'at least 1 per lot' }).max(10_000_000),
  targetDate: isoDate.optional(),
  note: z.string().trim().max(2000).default(''),
})
export type QuoteRequest = z.infer<typeof quoteRequestSchema>

export const optionSelectionSchema = z.strictObject({
  code: z.string().trim().min(1).max(40),
  lengthMm: z.number().int().min(1).max(5000).optional(),
})

export const draftLineSchema = z.strictObject({
  partNumber: z.string().trim().min(3).max(40),
  tap: z.string().trim().min(1).max(20).optional(),
  quantity: z.number().int().min(1, { error: 'quantity must be at least 1' }).max(10_000_000),
  options: z.array(optionSelectionSchema).max(10).default([]),
  /** Sales engineer's extra discount, basis points (100 = 1 %). */
  extraDiscountBp: z.number().int().min(0).max(10_000).default(0),
  /** Study the line's operating point comes from (the buyer's duty); defaults to the quote's. */
  studyId: z.uuid().optional(),
})

/** The terms a new draft starts with, whether a buyer's request or a sales engineer's own quote. */
export const DEFAULT_DRAFT_TERMS = {
  incoterm: 'FCA',
  incotermPlace: 'Ashcombe works, Dunmore OH',
  validityDays: 30,
  paymentTerms: 'Deposit with order, balance 30 days net from shipment',
  depositBp: 3000,
} as const

export const quoteDraftSchema = z.strictObject({
  lines: z.array(draftLineSchema).min(1, { error: 'a quote needs at least one line' }).max(50),
  nre: z
    .array(z.strictObject({ description: z.string().trim().min(1).max(200), amount: z.number().int().min(0).max(100_000_000_00) }))
    .max(10)
    .default([]),
  incoterm: z.enum(INCOTERMS_2020, { error: 'choose an Incoterms 2020 rule' }),
  incotermPlace: z.string().trim().min(2, { error: 'name the place for the Incoterms rule' }).max(120),
  validityDays: z.number().int().min(1).max(365).default(DEFAULT_DRAFT_TERMS.validityDays),
  paymentTerms: z.string().trim().min(2).max(200).default(DEFAULT_DRAFT_TERMS.paymentTerms),
  depositBp: z.number().int().min(0).max(10_000).default(DEFAULT_DRAFT_TERMS.depositBp),
  notes: z.string().trim().max(4000).default(''),
})
export type QuoteDraft = z.infer<typeof quoteDraftSchema>

export const quoteDraftUpdateSchema = z.strictObject({ draft: quoteDraftSchema, version: z.number().int().min(1) })

export const acceptanceSchema = z.strictObject({
  acceptedByName: z.string().trim().min(2, { error: 'the name of the person accepting' }).max(120),
  purchaseOrderRef: z.string().trim().min(1, { error: 'your purchase-order reference' }).max(60),
  revision: z.string().regex(/^[A-Z]{1,2}$/, { error: 'the revision letter you accept' }),
})
export type Acceptance = z.infer<typeof acceptanceSchema>

export const withdrawSchema = z.strictObject({ reason: z.string().trim().min(2).max(500), version: z.number().int().min(1) })

/** The operating point of a line at the buyer's duty, frozen into the revision. */
export interface LineDutyPoint {
  studyName: string
  supply: { volts: number; hz: number }
  duty: { flowM3s: number; staticPa: number }
  nominal: { rpm: number; flowM3s: number; staticPa: number; inputW: number | null; currentA: number | null; efficiency: number | null; status: string }
  lowLine: { volts: number; rpm: number; flowM3s: number; staticPa: number; inputW: number | null; currentA: number | null; status: string }
  meetsDuty: boolean
  /** Shaft torque against speed at nominal and low line, and the load torque, for the small chart. */
  motorCurve: { rpm: number; torqueNm: number }[]
  motorLowLineCurve: { rpm: number; torqueNm: number }[]
  loadCurve: { rpm: number; torqueNm: number }[]
}

export interface RevisionLine {
  partNumber: string
  name: string
  tap: string | null
  quantity: number
  moq: number
  leadTimeDays: number
  breaks: { minQuantity: number; unitPrice: number }[]
  options: { code: string; label: string; perUnit: number }[]
  dutyPoint: LineDutyPoint | null
}

/** Everything a revision froze at issue; the PDF is drawn from this alone. */
export interface QuoteDocument {
  number: string
  revision: string
  issuedOn: string
  validUntil: string
  currency: string
  maker: { name: string; address: string[]; email: string }
  customer: { name: string; tier: string; contactName: string; contactEmail: string }
  salesEngineer: { name: string; email: string }
  lines: RevisionLine[]
  priced: PricedQuote
  terms: { incoterm: string; incotermPlace: string; paymentTerms: string; depositBp: number; notes: string }
  copperIndex: { valuePerKg: number; baseValuePerKg: number; stampedOn: string }
}

export interface QuoteRevisionSummary {
  letter: string
  number: string
  issuedAt: string
  validUntil: string
  total: number
  depositAmount: number
}

export interface QuoteRecord {
  id: string
  number: string | null
  state: QuoteState
  version: number
  currency: string
  organisation: { id: string; name: string; tier: string | null }
  requestedBy: { id: string; name: string; email: string } | null
  salesEngineer: { id: string; name: string } | null
  request: QuoteRequest | null
  draft: QuoteDraft | null
  /** Prices of the current draft as the server computes them (staff only). */
  draftPricing: PricedQuote | null
  draftErrors: { field: string; message: string }[]
  revisions: QuoteRevisionSummary[]
  current: (QuoteDocument & { letter: string }) | null
  acceptance: { acceptedByName: string; purchaseOrderRef: string; acceptedAt: string; revision: string } | null
  deposit: { status: 'open' | 'paid' | 'expired'; amount: number; paidAt: string | null } | null
  order: { number: string; createdAt: string; confirmedAt: string | null } | null
  createdAt: string
  updatedAt: string
}

export interface QuoteSummary {
  id: string
  number: string | null
  revision: string | null
  state: QuoteState
  organisationName: string
  title: string
  total: number | null
  currency: string
  validUntil: string | null
  updatedAt: string
}

export const quoteListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  state: z.preprocess((value) => (typeof value === 'string' ? value.split(',').filter(Boolean) : value), z.array(quoteStateSchema)).optional(),
})
