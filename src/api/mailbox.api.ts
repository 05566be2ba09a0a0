// The admin's mailbox (mail captured by the local fake SMTP server) and the mail outbox.
// Wire types mirror server/mail/mailbox-client.ts and server/mail/outbox-admin.ts.
import type { Page } from '@shared/contracts/admin.contract'
import { http } from './http'

export interface MailAddress {
  name: string
  address: string
}

export interface MailSummary {
  id: string
  receivedAt: string
  size: number
  envelope: { from: string | null; to: string[] }
  subject: string | null
  from: MailAddress | null
  to: MailAddress[]
  cc: MailAddress[]
  date: string | null
  attachmentCount: number
}

export interface MailAttachmentInfo {
  index: number
  filename: string
  contentType: string
  size: number
  contentId: string | null
  disposition: string | null
}

export interface MailDetail extends MailSummary {
  messageId: string | null
  text: string | null
  /** The message's own HTML: show it only inside a sandboxed frame. */
  html: string | null
  headers: { name: string; value: string }[]
  attachments: MailAttachmentInfo[]
}

export const OUTBOX_STATUSES = ['pending', 'sending', 'sent', 'failed'] as const
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number]

export interface OutboxRow {
  id: string
  kind: string
  reference: string | null
  to: string[]
  cc: string[]
  subject: string
  status: OutboxStatus
  attempts: number
  nextAttemptAt: string
  lastError: string | null
  attachmentCount: number
  createdAt: string
  sentAt: string | null
}

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
