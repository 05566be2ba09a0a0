// The admin's mailbox (mail captured by the local fake SMTP server, server/fakes/mail/mail-api.ts,
// read through server/mail/mailbox-client.ts) and the mail outbox (server/mail/outbox-admin.ts):
// the wire types both sides share.

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
  /** The Date header as ISO 8601, or null when missing or unreadable. */
  date: string | null
  attachmentCount: number
}

export interface MailAttachmentInfo {
  index: number
  /** Already sanitised: no path parts, no control characters. */
  filename: string
  contentType: string
  size: number
  contentId: string | null
  disposition: string | null
}

export interface MailDetail extends MailSummary {
  messageId: string | null
  text: string | null
  /** The message's own HTML, unsanitised: render it only inside a sandboxed frame. */
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
