// The admin's mailbox (messages captured by the local fake mail server) and the mail outbox.
import { pipeline } from 'node:stream/promises'
import type { DataSource } from 'typeorm'
import { z } from 'zod'
import { ApiRouter } from '../http/api-router'
import { parseOrThrow } from '../http/validate'
import type { MailboxClient } from '../mail/mailbox-client'
import { listOutbox, outboxListQuerySchema, retryOutbox } from '../mail/outbox-admin'

// Ids of the fake's messages (time-random) and of outbox rows (uuid); anything else cannot exist.
const messageParams = z.object({ id: z.string().regex(/^[0-9]{13}-[0-9a-f]{12}$/, { error: 'not a message id' }) })
const attachmentParams = messageParams.extend({ index: z.coerce.number().int().min(0).max(9999) })
const outboxParams = z.object({ id: z.uuid({ error: 'not an outbox id' }) })

export function adminMailboxRoutes(dataSource: DataSource, mailbox: MailboxClient): ApiRouter {
  const api = new ApiRouter('/admin')

  api.get('/mailbox', ['admin'], async (_req, res) => {
    res.json({ messages: await mailbox.list() })
  })

  api.delete('/mailbox', ['admin'], async (_req, res) => {
    res.json({ removed: await mailbox.clear() })
  })

  api.get('/mailbox/:id', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(messageParams, req.params, 'params')
    res.json(await mailbox.get(id))
  })

  api.get('/mailbox/:id/attachments/:index', ['admin'], async (req, res) => {
    const { id, index } = parseOrThrow(attachmentParams, req.params, 'params')
    const file = await mailbox.attachment(id, index)
    res.set('Content-Type', file.contentType)
    res.set('Content-Disposition', file.disposition)
    // A mailed HTML or SVG file must never run on the portal's origin.
    res.set('Content-Security-Policy', "sandbox; default-src 'none'")
    res.set('Cache-Control', 'no-store')
    if (file.size !== null) res.set('Content-Length', String(file.size))
    await pipeline(file.body, res)
  })

  api.get('/outbox', ['admin'], async (req, res) => {
    res.json(await listOutbox(dataSource, parseOrThrow(outboxListQuerySchema, req.query, 'query')))
  })

  api.post('/outbox/:id/retry', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(outboxParams, req.params, 'params')
    res.json(await retryOutbox(dataSource, id))
  })

  return api
}
