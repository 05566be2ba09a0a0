// The admin's mailbox (mail captured by the local fake SMTP server) and the mail outbox.
import type { Page } from '@shared/contracts/admin.contract'
import type { MailDetail, MailSummary, OutboxRow, OutboxStatus } from '@shared/contracts/mailbox.contract'
import { http } from './http'

export { OUTBOX_STATUSES } from '@shared/contracts/mailbox.contract'
export type { MailAddress, MailAttachmentInfo, MailDetail, MailSummary, OutboxRow, OutboxStatus } from '@shared/contracts/mailbox.contract'

export async function listMailbox(): Promise<MailSummary[]> {
  return (await http.get<{ messages: MailSummary[] }>('/admin/mailbox')).data.messages
}

export async function getMailboxMessage(id: string): Promise<MailDetail> {
  return (await http.get<MailDetail>(`/admin/mailbox/${encodeURIComponent(id)}`)).data
}

/** Same-origin link for a download (the session cookie goes with it). */
export function mailboxAttachmentUrl(id: string, index: number): string {
  return `/api/admin/mailbox/${encodeURIComponent(id)}/attachments/${index}`
}

export async function clearMailbox(): Promise<number> {
  return (await http.delete<{ removed: number }>('/admin/mailbox')).data.removed
}

export async function listOutbox(params: { page: number; pageSize: number; status?: OutboxStatus }): Promise<Page<OutboxRow>> {
  return (await http.get<Page<OutboxRow>>('/admin/outbox', { params })).data
}

export async function retryOutbox(id: string): Promise<OutboxRow> {
  return (await http.post<OutboxRow>(`/admin/outbox/${encodeURIComponent(id)}/retry`, {})).data
}
