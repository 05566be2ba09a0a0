import type { Page } from '@shared/contracts/admin.contract'
import type { OrderRecord, OrderStatus, OrderSummary } from '@shared/contracts/payment.contract'
import { http } from './http'

/** Sales and admin get every order; a buyer those of their organisation. */
export async function listOrders(params: { page?: number; pageSize?: number; status?: OrderStatus } = {}): Promise<Page<OrderSummary>> {
  return (await http.get<Page<OrderSummary>>('/v1/orders', { params })).data
}

export async function getOrder(id: string): Promise<OrderRecord> {
  return (await http.get<OrderRecord>(`/v1/orders/${encodeURIComponent(id)}`)).data
}

/** Sales confirms a deposit-paid order (the quote becomes 'ordered'); 409 when already confirmed. */
export async function confirmOrder(id: string): Promise<OrderRecord> {
  return (await http.post<OrderRecord>(`/v1/orders/${encodeURIComponent(id)}/confirm`, {})).data
}
