// Read-only JSON view of the fake's mailbox (plus clearing it), used by the admin's mailbox screen.
import express, { type NextFunction, type Request, type Response } from 'express'
import { simpleParser, type AddressObject, type ParsedMail } from 'mailparser'
import type { MailAddress, MailAttachmentInfo, MailDetail, MailSummary } from '../../../shared/contracts/mailbox.contract'
import { isMessageId, type MailStore, type StoredMessageMeta } from './mail-store'

export type { MailAddress, MailAttachmentInfo, MailDetail, MailSummary }

class HttpProblem extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
  ) {
    super(message)
  }
}

export function createMailApi(store: MailStore): express.Express {
  // Messages never change once stored, so a parsed summary can be kept for the life of the process.
  const summaries = new Map<string, MailSummary>()

  async function load(id: string): Promise<{ meta: StoredMessageMeta; raw: Buffer }> {
    if (!isMessageId(id)) throw new HttpProblem(400, 'invalid_id', 'That is not a message id.')
    const meta = await store.meta(id)
    const raw = meta ? await store.raw(id) : null
    if (!meta || !raw) throw new HttpProblem(404, 'not_found', 'No message with that id.')
    return { meta, raw }
  }

  async function summary(meta: StoredMessageMeta): Promise<MailSummary | null> {
    const cached = summaries.get(meta.id)
    if (cached) return cached
    const raw = await store.raw(meta.id)
    if (!raw) return null
    const made = summarise(meta, await parse(raw))
    summaries.set(meta.id, made)
    return made
  }

  const app = express()
  app.disable('x-powered-by')
  app.use((_req, res, next) => {
    res.set('X-Content-Type-Options', 'nosniff')
    res.set('Cache-Control', 'no-store')
    next()
  })

  app.get('/health', (_req, res) => {
    res.json({ ok: true })
  })

  app.get('/messages', async (_req, res) => {
    const metas = await store.list()
    const messages: MailSummary[] = []
    for (const meta of metas) {
      const made = await summary(meta)
      if (made) messages.push(made)
    }
    res.json({ messages })
  })

  app.delete('/messages', async (_req, res) => {
    const removed = await store.clear()
    summaries.clear()
    res.json({ removed })
  })

  app.get('/messages/:id', async (req, res) => {
    const { meta, raw } = await load(req.params.id)
    const mail = await parse(raw)
    const detail: MailDetail = {
      ...summarise(meta, mail),
      messageId: mail.messageId ?? null,
      text: mail.text ?? null,
      html: typeof mail.html === 'string' ? mail.html : null,
      headers: mail.headerLines.map((header) => ({ name: header.key, value: headerValue(header.line) })),
      attachments: mail.attachments.map((attachment, index) => ({
        index,
        filename: safeFileName(attachment.filename, index),
        contentType: safeContentType(attachment.contentType),
        size: attachment.size,
        contentId: attachment.contentId ?? null,
        disposition: attachment.contentDisposition || null,
      })),
    }
    res.json(detail)
  })

  app.delete('/messages/:id', async (req, res) => {
    const { meta } = await load(req.params.id)
    await store.remove(meta.id)
    summaries.delete(meta.id)
    res.status(204).end()
  })

  app.get('/messages/:id/raw', async (req, res) => {
    const { meta, raw } = await load(req.params.id)
    sendDownload(res, raw, 'message/rfc822', `${meta.id}.eml`)
  })

  app.get('/messages/:id/attachments/:index', async (req, res) => {
    const { raw } = await load(req.params.id)
    const index = /^(0|[1-9][0-9]{0,3})$/.test(req.params.index) ? Number(req.params.index) : -1
    const attachment = index >= 0 ? (await parse(raw)).attachments[index] : undefined
    if (!attachment) throw new HttpProblem(404, 'not_found', 'No attachment at that index.')
    sendDownload(res, attachment.content, safeContentType(attachment.contentType), safeFileName(attachment.filename, index))
  })

  app.use((_req, _res, next) => {
    next(new HttpProblem(404, 'not_found', 'No such route on the fake mailbox.'))
  })

  app.use((error: unknown, _req: Request, res: Response, _next: NextFunction) => {
    if (error instanceof HttpProblem) {
      res.status(error.status).json({ error: { code: error.code, message: error.message } })
      return
    }
    console.error('[fake-mail] request failed', error)
    res.status(500).json({ error: { code: 'internal', message: 'The fake mailbox failed to answer.' } })
  })

  return app
}

function sendDownload(res: Response, body: Buffer, contentType: string, filename: string): void {
  // Always a download, never rendered: a mailed HTML file must not run on this origin.
  res.attachment(filename)
  res.set('Content-Type', contentType)
  res.set('Content-Security-Policy', "sandbox; default-src 'none'")
  res.send(body)
}

async function parse(raw: Buffer): Promise<ParsedMail> {
  return simpleParser(raw, { skipImageLinks: true, skipTextToHtml: true })
}

function summarise(meta: StoredMessageMeta, mail: ParsedMail): MailSummary {
  return {
    id: meta.id,
    receivedAt: meta.receivedAt,
    size: meta.size,
    envelope: meta.envelope,
    subject: mail.subject ?? null,
    from: addresses(mail.from)[0] ?? null,
    to: addresses(mail.to),
    cc: addresses(mail.cc),
    date: mail.date && !Number.isNaN(mail.date.getTime()) ? mail.date.toISOString() : null,
    attachmentCount: mail.attachments.length,
  }
}

function addresses(field: AddressObject | AddressObject[] | undefined): MailAddress[] {
  const objects = field === undefined ? [] : Array.isArray(field) ? field : [field]
  const out: MailAddress[] = []
  const visit = (entries: AddressObject['value']): void => {
    for (const entry of entries) {
      if (entry.group) visit(entry.group)
      else if (entry.address) out.push({ name: entry.name, address: entry.address })
    }
  }
  for (const object of objects) visit(object.value)
  return out
}

/** mailparser keeps each header as its raw line: drop the name and unfold continuation lines. */
function headerValue(line: string): string {
  const colon = line.indexOf(':')
  return (colon >= 0 ? line.slice(colon + 1) : line).replace(/\r?\n[ \t]+/g, ' ').trim()
}

/** A file name safe for a Content-Disposition header and any disk: last path part, no control or reserved characters. */
export function safeFileName(original: string | undefined, index: number): string {
  const base = (original ?? '').split(/[\\/]/).pop() ?? ''
  const cleaned = base
    // eslint-disable-next-line no-control-regex
    .replace(/[\u0000-\u001f\u007f<>:"|?*]/g, '_')
    .replace(/^[.\s]+|[.\s]+$/g, '')
    .slice(0, 150)
  return cleaned === '' ? `attachment-${index + 1}.bin` : cleaned
}

function safeContentType(value: string): string {
  const type = value.split(';')[0]?.trim().toLowerCase() ?? ''
  return /^[a-z0-9][a-z0-9!#$&^_.+-]*\/[a-z0-9][a-z0-9!#$&^_.+-]*$/.test(type) ? type : 'application/octet-stream'
}
