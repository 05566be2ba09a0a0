// Reads the local fake mail server's mailbox over its HTTP API (MAILBOX_URL) for the admin screen.
// The fake answers only on loopback and has no authentication; the app's admin role guards it.
import { Readable } from 'node:stream'
import { z } from 'zod'
import type { MailDetail, MailSummary } from '../../shared/contracts/mailbox.contract'
import { NotFoundError, ServiceUnavailableError } from '../http/errors'

export type { MailDetail, MailSummary }

export interface MailboxAttachment {
  body: Readable
  contentType: string
  /** Already an `attachment; filename=...` value made by the fake from a sanitised name. */
  disposition: string
  size: number | null
}

export class MailboxUnavailableError extends ServiceUnavailableError {
  constructor(baseUrl: string) {
    super(`The mailbox of the local mail server at ${baseUrl} is not answering; is the fake mail server running (npm start starts it)?`, 'mailbox_unavailable')
  }
}

// The fake's answers, checked on the way in: the app never passes on a shape it did not expect.
const address = z.object({ name: z.string(), address: z.string() })
const summarySchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  size: z.number(),
  envelope: z.object({ from: z.string().nullable(), to: z.array(z.string()) }),
  subject: z.string().nullable(),
  from: address.nullable(),
  to: z.array(address),
  cc: z.array(address),
  date: z.string().nullable(),
  attachmentCount: z.number(),
}) satisfies z.ZodType<MailSummary>
const detailSchema = summarySchema.extend({
  messageId: z.string().nullable(),
  text: z.string().nullable(),
  html: z.string().nullable(),
  headers: z.array(z.object({ name: z.string(), value: z.string() })),
  attachments: z.array(
    z.object({ index: z.number(), filename: z.string(), contentType: z.string(), size: z.number(), contentId: z.string().nullable(), disposition: z.string().nullable() }),
  ),
}) satisfies z.ZodType<MailDetail>
const listSchema = z.object({ messages: z.array(summarySchema) })
const clearedSchema = z.object({ removed: z.number() })

export class MailboxClient {
  private readonly baseUrl: string

  constructor(
    baseUrl: string,
    private readonly timeoutMs = 5_000,
  ) {
    this.baseUrl = baseUrl.replace(/\/+$/, '')
  }

  async list(): Promise<MailSummary[]> {
    return (await this.json('/messages', listSchema)).messages
  }

  async get(id: string): Promise<MailDetail> {
    return this.json(`/messages/${encodeURIComponent(id)}`, detailSchema)
  }

  async attachment(id: string, index: number): Promise<MailboxAttachment> {
    const response = await this.request(`/messages/${encodeURIComponent(id)}/attachments/${index}`)
    if (!response.body) throw new MailboxUnavailableError(this.baseUrl)
    const length = Number(response.headers.get('content-length'))
    const disposition = response.headers.get('content-disposition') ?? ''
    return {
      body: Readable.from(chunksOf(response.body)),
      contentType: response.headers.get('content-type') ?? 'application/octet-stream',
      disposition: disposition.startsWith('attachment') ? disposition : `attachment; filename="attachment-${index + 1}.bin"`,
      size: Number.isFinite(length) && length >= 0 ? length : null,
    }
  }

  /** Empties the mailbox; answers how many messages were removed. */
  async clear(): Promise<number> {
    return (await this.json('/messages', clearedSchema, 'DELETE')).removed
  }

  private async json<S extends z.ZodType>(route: string, schema: S, method: 'GET' | 'DELETE' = 'GET'): Promise<z.infer<S>> {
    const response = await this.request(route, method)
    const parsed = schema.safeParse(await response.json().catch(() => undefined))
    if (!parsed.success) throw new MailboxUnavailableError(this.baseUrl)
    return parsed.data
  }

  private async request(route: string, method: 'GET' | 'DELETE' = 'GET'): Promise<Response> {
    let response: Response
    try {
      response = await fetch(`${this.baseUrl}${route}`, { method, signal: AbortSignal.timeout(this.timeoutMs) })
    } catch {
      throw new MailboxUnavailableError(this.baseUrl)
    }
    if (response.ok) return response
    await response.body?.cancel()
    // The fake answers 400 for a malformed id and 404 for an unknown one: both mean "no such message".
    if (response.status === 400 || response.status === 404) throw new NotFoundError('Message')
    throw new MailboxUnavailableError(this.baseUrl)
  }
}

/** A web stream as an async iterable (Readable.fromWeb's typing differs between the DOM and Node libs). */
async function* chunksOf(stream: ReadableStream<Uint8Array>): AsyncGenerator<Uint8Array> {
  const reader = stream.getReader()
  let finished = false
  try {
    for (;;) {
      const { done, value } = await reader.read()
      if (done) {
        finished = true
        return
      }
      yield value
    }
  } finally {
    // The download was abandoned half-way: stop reading from the fake too.
    if (!finished) await reader.cancel().catch(() => undefined)
  }
}
