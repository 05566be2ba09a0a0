// Writing mail into the outbox. Callers pass the EntityManager of their own transaction, so the
// mail exists if and only if the business change it reports was committed.
import path from 'node:path'
import { z } from 'zod'
import type { EntityManager } from 'typeorm'
import { MailOutbox, type OutboxAttachment } from '../db/entities/mail-outbox.entity'

export type { OutboxAttachment }

/** A complete e-mail as the templates build it and enqueueMail stores it. */
export interface OutgoingMail {
  /** What it is about, shown in the admin's outbox ('quote-issued', 'deposit-received' ...). */
  kind: string
  /** The record it belongs to (a quote id ...), if any. */
  reference?: string | null
  to: string[]
  cc?: string[]
  subject: string
  text: string
  html?: string | null
  attachments?: OutboxAttachment[]
}

/** Inline content is for small things (a logo, a CSV); files such as PDFs go by path. */
export const MAX_INLINE_ATTACHMENT_BYTES = 256 * 1024

const address = z.email({ error: 'not an e-mail address' }).max(254)

const attachmentSchema = z
  .strictObject({
    filename: z.string().trim().min(1).max(150),
    contentType: z.string().regex(/^[a-z0-9][a-z0-9!#$&^_.+-]*\/[a-z0-9][a-z0-9!#$&^_.+-]*$/, { error: 'not a media type' }),
    path: z
      .string()
      .min(1)
      .max(500)
      .refine((value) => isInsideDataDir(value), { error: 'must be a relative path inside the data directory' })
      .optional(),
    contentBase64: z
      .base64()
      .refine((value) => Buffer.byteLength(value, 'base64') <= MAX_INLINE_ATTACHMENT_BYTES, {
        error: `inline content is limited to ${MAX_INLINE_ATTACHMENT_BYTES} bytes; store the file and give its path`,
      })
      .optional(),
  })
  .refine((value) => (value.path === undefined) !== (value.contentBase64 === undefined), {
    error: 'give either path or contentBase64',
  })

const outgoingMailSchema = z.strictObject({
  kind: z.string().regex(/^[a-z][a-z0-9-]{1,39}$/, { error: 'lower-case words joined by -' }),
  reference: z.string().min(1).max(64).nullable().optional(),
  to: z.array(address).min(1, { error: 'at least one recipient' }).max(50),
  cc: z.array(address).max(50).optional(),
  subject: z.string().trim().min(1).max(300),
  text: z.string().min(1),
  html: z.string().min(1).nullable().optional(),
  attachments: z.array(attachmentSchema).max(20).optional(),
})

export class InvalidMailError extends Error {}

/** A relative path that stays inside the data directory once resolved (no `..`, not absolute). */
export function isInsideDataDir(relative: string): boolean {
  if (path.isAbsolute(relative) || relative.includes('\0')) return false
  const normalised = path.posix.normalize(relative.replaceAll('\\', '/'))
  return normalised !== '.' && !normalised.startsWith('../') && normalised !== '..'
}

/**
 * Stores `mail` as a pending outbox row inside the caller's transaction; the worker sends it
 * after the commit. Throws InvalidMailError for a malformed message (a bug in the caller).
 */
export async function enqueueMail(manager: EntityManager, mail: OutgoingMail, now: Date = new Date()): Promise<MailOutbox> {
  const parsed = outgoingMailSchema.safeParse(mail)
  if (!parsed.success) throw new InvalidMailError(`cannot enqueue mail: ${z.prettifyError(parsed.error)}`)
  const valid = parsed.data
  const repository = manager.getRepository(MailOutbox)
  return repository.save(
    repository.create({
      kind: valid.kind,
      reference: valid.reference ?? null,
      to: dedupe(valid.to),
      cc: dedupe(valid.cc ?? []).filter((cc) => !valid.to.some((to) => to.toLowerCase() === cc.toLowerCase())),
      subject: valid.subject,
      text: valid.text,
      html: valid.html ?? null,
      attachments: valid.attachments ?? [],
      status: 'pending',
      attempts: 0,
      nextAttemptAt: now,
      claimedAt: null,
      lastError: null,
      messageId: null,
      sentAt: null,
    }),
  )
}

function dedupe(addresses: string[]): string[] {
  const seen = new Set<string>()
  return addresses.filter((item) => {
    const key = item.toLowerCase()
    if (seen.has(key)) return false
    seen.add(key)
    return true
  })
}
