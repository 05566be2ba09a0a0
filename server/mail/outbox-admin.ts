// What the admin sees of the outbox and the one thing they may do to it: send a row again.
import { z } from 'zod'
import type { DataSource } from 'typeorm'
import { pageQuerySchema, type Page } from '../../shared/contracts/admin.contract'
import { OUTBOX_STATUSES, type OutboxRow } from '../../shared/contracts/mailbox.contract'
import { MailOutbox } from '../db/entities/mail-outbox.entity'
import { ConflictError, NotFoundError } from '../http/errors'

export const outboxListQuerySchema = pageQuerySchema.omit({ search: true }).extend({
  status: z.enum(OUTBOX_STATUSES).optional(),
})
export type OutboxListQuery = z.infer<typeof outboxListQuerySchema>


export async function listOutbox(dataSource: DataSource, query: OutboxListQuery): Promise<Page<OutboxRow>> {
  const [rows, total] = await dataSource.getRepository(MailOutbox).findAndCount({
    where: query.status ? { status: query.status } : {},
    order: { createdAt: 'DESC', id: 'ASC' },
    skip: (query.page - 1) * query.pageSize,
    take: query.pageSize,
  })
  return { items: rows.map(toOutboxRow), total, page: query.page, pageSize: query.pageSize }
}

/**
 * Puts a failed (or still waiting) row back in the queue, due now, with a fresh count of
 * attempts; the last error stays visible until the next attempt replaces it.
 */
export async function retryOutbox(dataSource: DataSource, id: string, now: Date = new Date()): Promise<OutboxRow> {
  if (!z.uuid().safeParse(id).success) throw new NotFoundError('Outbox message')
  return dataSource.transaction(async (manager) => {
    const repository = manager.getRepository(MailOutbox)
    const row = await repository.findOne({ where: { id }, lock: { mode: 'pessimistic_write' } })
    if (!row) throw new NotFoundError('Outbox message')
    if (row.status === 'sending') throw new ConflictError('This message is being sent right now', 'outbox_sending')
    if (row.status === 'sent') throw new ConflictError('This message has already been sent', 'outbox_sent')
    await repository.update(id, { status: 'pending', attempts: 0, nextAttemptAt: now, claimedAt: null })
    return toOutboxRow(await repository.findOneByOrFail({ id }))
  })
}

function toOutboxRow(row: MailOutbox): OutboxRow {
  return {
    id: row.id,
    kind: row.kind,
    reference: row.reference,
    to: row.to,
    cc: row.cc,
    subject: row.subject,
    status: row.status,
    attempts: row.attempts,
    nextAttemptAt: row.nextAttemptAt.toISOString(),
    lastError: row.lastError,
    attachmentCount: row.attachments.length,
    createdAt: row.createdAt.toISOString(),
    sentAt: row.sentAt ? row.sentAt.toISOString() : null,
  }
}
