// Deposits (paid through a hosted Checkout Session) and the sales orders a paid deposit creates.
// Money in integer minor units of the quote's currency.
import { z } from 'zod'
import type { QuoteState } from './quote.contract'

export const DEPOSIT_STATUSES = ['open', 'paid', 'expired'] as const
export type DepositStatus = (typeof DEPOSIT_STATUSES)[number]

/** Answer of POST /api/v1/quotes/:id/deposit: where to send the browser. */
export interface DepositStart {
  depositId: string
  /** The hosted checkout page. */
  url: string
  /** True when an attempt that was still open is handed out again instead of a new one. */
  reused: boolean
  amount: number
  currency: string
  expiresAt: string | null
}

export interface DepositAttempt {
  id: string
  status: DepositStatus
  revision: string
  amount: number
  currency: string
  createdAt: string
  paidAt: string | null
}

/** Answer of GET /api/v1/quotes/:id/deposit, polled by the page the buyer returns to. */
export interface DepositStatusView {
  quoteId: string
  quoteState: QuoteState
  /** True while the buyer may start (or resume) paying the deposit. */
  payable: boolean
  /** The latest attempt, if any. */
  deposit: DepositAttempt | null
  order: { id: string; number: string } | null
}

/** awaiting-confirmation: deposit paid, order record made; confirmed: sales confirmed it (quote 'ordered'). */
export type OrderStatus = 'awaiting-confirmation' | 'confirmed'

export interface OrderSummary {
  id: string
  number: string
  status: OrderStatus
  quoteId: string
  quoteNumber: string | null
  revision: string
  organisation: { id: string; name: string }
  purchaseOrderRef: string
  total: number
  depositPaid: number
  currency: string
  createdAt: string
  confirmedAt: string | null
}

export interface OrderRecord extends OrderSummary {
  quoteState: QuoteState
  acceptedByName: string | null
  salesEngineer: { id: string; name: string } | null
  /** What is left to invoice after the deposit. */
  balance: number
}

export const orderListQuerySchema = z.object({
  page: z.coerce.number().int().min(1, { error: 'page starts at 1' }).default(1),
  pageSize: z.coerce.number().int().min(1).max(100, { error: 'at most 100 rows a page' }).default(25),
  status: z.enum(['awaiting-confirmation', 'confirmed']).optional(),
})
export type OrderListQuery = z.infer<typeof orderListQuerySchema>
