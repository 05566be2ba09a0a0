// Quote routes of the API, one function each. Prices are never sent: the server computes them.
import type { Page } from '@shared/contracts/admin.contract'
import type { Acceptance, QuoteDraft, QuoteRecord, QuoteRequest, QuoteState, QuoteSummary } from '@shared/contracts/quote.contract'
import { http } from './http'

/** A customer account a sales engineer can quote to (GET /api/v1/accounts). */
export interface CustomerAccount {
  id: string
  name: string
  tier: string | null
  currency: string
}

const quotePath = (id: string) => `/v1/quotes/${encodeURIComponent(id)}`

export async function listQuotes(params: { page?: number; pageSize?: number; states?: QuoteState[] } = {}): Promise<Page<QuoteSummary>> {
  const query: Record<string, string | number> = {}
  if (params.page) query.page = params.page
  if (params.pageSize) query.pageSize = params.pageSize
  if (params.states && params.states.length > 0) query.state = params.states.join(',')
  return (await http.get<Page<QuoteSummary>>('/v1/quotes', { params: query })).data
}

/** A buyer asks for a quote, usually on a candidate of one of their duty studies. */
export async function requestQuote(request: QuoteRequest): Promise<QuoteRecord> {
  return (await http.post<QuoteRecord>('/v1/quotes/requests', request)).data
}

/** A sales engineer starts a quote for a customer without a request. */
export async function createQuote(organisationId: string, draft: QuoteDraft): Promise<QuoteRecord> {
  return (await http.post<QuoteRecord>('/v1/quotes', { organisationId, draft })).data
}

export async function getQuote(id: string): Promise<QuoteRecord> {
  return (await http.get<QuoteRecord>(quotePath(id))).data
}

/** Saves the draft; `version` is the one loaded (a stale one answers 409 stale_version). */
export async function saveDraft(id: string, draft: QuoteDraft, version: number): Promise<QuoteRecord> {
  return (await http.put<QuoteRecord>(`${quotePath(id)}/draft`, { draft, version })).data
}

/** Freezes the draft into the next revision, renders its PDF and mails it to the buyers. */
export async function issueQuote(id: string, version: number): Promise<QuoteRecord> {
  return (await http.post<QuoteRecord>(`${quotePath(id)}/issue`, { version })).data
}

/** The buyer accepts the revision they read (409 revision_superseded when a newer one exists). */
export async function acceptQuote(id: string, acceptance: Acceptance): Promise<QuoteRecord> {
  return (await http.post<QuoteRecord>(`${quotePath(id)}/accept`, acceptance)).data
}

export async function withdrawQuote(id: string, reason: string, version: number): Promise<QuoteRecord> {
  return (await http.post<QuoteRecord>(`${quotePath(id)}/withdraw`, { reason, version })).data
}

/** Address of a revision's PDF, for a download link (the session cookie goes along). */
export function revisionPdfUrl(id: string, letter: string): string {
  return `/api${quotePath(id)}/revisions/${encodeURIComponent(letter)}/pdf`
}

export async function listAccounts(): Promise<CustomerAccount[]> {
  return (await http.get<CustomerAccount[]>('/v1/accounts')).data
}
