import type { DepositStart, DepositStatusView } from '@shared/contracts/payment.contract'
import { http } from './http'

/**
 * Starts (or resumes) paying the deposit of an accepted quote; send the browser to `url`.
 * Fails with 409 `deposit_already_paid`, `quote_not_accepted` or `deposit_processing`, and with
 * 503 `payment_unavailable` when the payment service is down (its message is meant for the buyer).
 */
export async function startDeposit(quoteId: string): Promise<DepositStart> {
  return (await http.post<DepositStart>(`/v1/quotes/${encodeURIComponent(quoteId)}/deposit`, {})).data
}

/** The latest deposit attempt of a quote, for the page the buyer returns to (poll until it is paid). */
export async function getDepositStatus(quoteId: string): Promise<DepositStatusView> {
  return (await http.get<DepositStatusView>(`/v1/quotes/${encodeURIComponent(quoteId)}/deposit`)).data
}
