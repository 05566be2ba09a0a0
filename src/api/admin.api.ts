// Administration endpoints: people, organisations, price lists, copper index, audit log, and the
// public invitation link. One function per endpoint, typed by shared/contracts/admin.contract.
import type {
  AdminOrganisationRow,
  AdminPriceListEntryRow,
  AdminPriceListRow,
  AdminUserRow,
  AuditFacets,
  AuditRow,
  CopperIndexBody,
  CopperIndexHistory,
  CopyPriceListBody,
  InvitationInfo,
  InviteUserBody,
  OrganisationBody,
  OrganisationUpdateBody,
  Page,
  PriceListEntryBody,
  PriceListEntryUpdated,
  PriceListHeaderBody,
  SalesEngineerOption,
  SetPasswordResult,
  UserStatus,
} from '@shared/contracts/admin.contract'
import type { Role } from '@shared/contracts/auth.contract'
import { minorUnitExponent, isCurrencyCode } from '@shared/pricing/money'
import { http, type RetriableConfig } from './http'

const id = encodeURIComponent

export interface PageParams {
  page?: number
  pageSize?: number
  search?: string
}

// ---- users

export async function listUsers(params: PageParams & { role?: Role; status?: UserStatus; organisationId?: string }): Promise<Page<AdminUserRow>> {
  return (await http.get<Page<AdminUserRow>>('/admin/users', { params })).data
}

export async function inviteUser(body: InviteUserBody): Promise<AdminUserRow> {
  return (await http.post<AdminUserRow>('/admin/users', body)).data
}

export async function resendInvitation(userId: string): Promise<AdminUserRow> {
  return (await http.post<AdminUserRow>(`/admin/users/${id(userId)}/invitation`, {})).data
}

export async function changeRole(userId: string, role: Role): Promise<AdminUserRow> {
  return (await http.put<AdminUserRow>(`/admin/users/${id(userId)}/role`, { role })).data
}

export async function setUserDisabled(userId: string, disabled: boolean): Promise<AdminUserRow> {
  return (await http.post<AdminUserRow>(`/admin/users/${id(userId)}/${disabled ? 'disable' : 'enable'}`, {})).data
}

export async function setDiscountLimit(userId: string, discountLimitBp: number): Promise<AdminUserRow> {
  return (await http.put<AdminUserRow>(`/admin/users/${id(userId)}/discount-limit`, { discountLimitBp })).data
}

// ---- organisations

export async function listOrganisations(params: PageParams & { kind?: 'maker' | 'customer' }): Promise<Page<AdminOrganisationRow>> {
  return (await http.get<Page<AdminOrganisationRow>>('/admin/organisations', { params })).data
}

export async function createOrganisation(body: OrganisationBody): Promise<AdminOrganisationRow> {
  return (await http.post<AdminOrganisationRow>('/admin/organisations', body)).data
}

export async function updateOrganisation(organisationId: string, body: OrganisationUpdateBody): Promise<AdminOrganisationRow> {
  return (await http.put<AdminOrganisationRow>(`/admin/organisations/${id(organisationId)}`, body)).data
}

export async function listSalesEngineers(): Promise<SalesEngineerOption[]> {
  return (await http.get<SalesEngineerOption[]>('/admin/sales-engineers')).data
}

// ---- price lists and copper index

export async function listPriceLists(params: PageParams = {}): Promise<Page<AdminPriceListRow>> {
  return (await http.get<Page<AdminPriceListRow>>('/admin/price-lists', { params })).data
}

export async function getPriceList(listId: string): Promise<AdminPriceListRow> {
  return (await http.get<AdminPriceListRow>(`/admin/price-lists/${id(listId)}`)).data
}

export async function updatePriceList(listId: string, body: PriceListHeaderBody): Promise<AdminPriceListRow> {
  return (await http.put<AdminPriceListRow>(`/admin/price-lists/${id(listId)}`, body)).data
}

export async function listPriceListEntries(listId: string, params: PageParams): Promise<Page<AdminPriceListEntryRow>> {
  return (await http.get<Page<AdminPriceListEntryRow>>(`/admin/price-lists/${id(listId)}/entries`, { params })).data
}

export async function updatePriceListEntry(listId: string, entryId: string, body: PriceListEntryBody): Promise<PriceListEntryUpdated> {
  return (await http.put<PriceListEntryUpdated>(`/admin/price-lists/${id(listId)}/entries/${id(entryId)}`, body)).data
}

export async function copyPriceList(listId: string, body: CopyPriceListBody): Promise<AdminPriceListRow> {
  return (await http.post<AdminPriceListRow>(`/admin/price-lists/${id(listId)}/copy`, body)).data
}

export async function getCopperHistory(currency: string): Promise<CopperIndexHistory> {
  return (await http.get<CopperIndexHistory>('/admin/copper-index', { params: { currency } })).data
}

export async function addCopperValue(body: CopperIndexBody): Promise<CopperIndexHistory> {
  return (await http.post<CopperIndexHistory>('/admin/copper-index', body)).data
}

// ---- audit log

export interface AuditParams {
  page?: number
  pageSize?: number
  entity?: string
  entityId?: string
  action?: string
  actor?: string
  from?: string
  to?: string
}

export async function listAudit(params: AuditParams): Promise<Page<AuditRow>> {
  return (await http.get<Page<AuditRow>>('/admin/audit', { params })).data
}

export async function getAuditFacets(): Promise<AuditFacets> {
  return (await http.get<AuditFacets>('/admin/audit/facets')).data
}

// ---- invitation links (public)

// A dead link is the page's own message, not a reason to send anyone to sign-in.
const quiet: RetriableConfig = { quietUnauthorized: true }

export async function checkInvitation(token: string): Promise<InvitationInfo> {
  return (await http.get<InvitationInfo>(`/auth/invitations/${id(token)}`, quiet)).data
}

export async function acceptInvitation(token: string, password: string): Promise<SetPasswordResult> {
  return (await http.post<SetPasswordResult>(`/auth/invitations/${id(token)}`, { password }, quiet)).data
}

// ---- money in forms: integer minor units on the wire, decimal major units on screen

function exponentOf(currency: string): number {
  return isCurrencyCode(currency) ? minorUnitExponent(currency) : 2
}

/** 123450 USD -> "1234.50" (exact, no floats). */
export function minorToText(minor: number, currency: string): string {
  const exponent = exponentOf(currency)
  const digits = Math.abs(minor).toString().padStart(exponent + 1, '0')
  const sign = minor < 0 ? '-' : ''
  return exponent === 0 ? `${sign}${digits}` : `${sign}${digits.slice(0, -exponent)}.${digits.slice(-exponent)}`
}

/** "1234.5" USD -> 123450; null when the text is not an amount with at most the currency's decimals. */
export function textToMinor(text: string, currency: string): number | null {
  const exponent = exponentOf(currency)
  const match = /^\s*(\d{1,9})(?:[.,](\d*))?\s*$/.exec(text)
  if (!match) return null
  const fraction = match[2] ?? ''
  if (fraction.length > exponent) return null
  return Number(`${match[1]}${fraction.padEnd(exponent, '0')}`)
}

/** 1250 -> "12.5" (percent). */
export function bpToPercentText(bp: number): string {
  return String(bp / 100)
}

/** "12.5" -> 1250; null when not a percentage 0 ... 100 with at most two decimals. */
export function percentTextToBp(text: string): number | null {
  const match = /^\s*(\d{1,3})(?:[.,](\d{0,2}))?\s*$/.exec(text)
  if (!match) return null
  const bp = Number(match[1]) * 100 + Number((match[2] ?? '').padEnd(2, '0'))
  return bp <= 10_000 ? bp : null
}
