import { mkdtemp, readdir, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import path from 'node:path'
import nodemailer, { type Transporter } from 'nodemailer'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { startFakeMail, type FakeMailHandle } from './fake-mail'
import { safeFileName } from './mail-api'

let dir: string
let handle: FakeMailHandle | null = null

beforeEach(async () => {
  dir = await mkdtemp(path.join(tmpdir(), 'fake-mail-'))
})

afterEach(async () => {
  await handle?.close()
  handle = null
  await rm(dir, { recursive: true, force: true })
})

function transport(port: number): Transporter {
  return nodemailer.createTransport({ host: '127.0.0.1', port, secure: false, ignoreTLS: true })
}

async function getJson(port: number, route: string): Promise<{ status: number; body: unknown }> {
  const res = await fetch(`http://127.0.0.1:${port}${route}`)
  return { status: res.status, body: await res.json() }
}

interface ListedMessage {
  id: string
  subject: string | null
  from: { address: string } | null
  to: { address: string }[]
  attachmentCount: number
  envelope: { from: string | null; to: string[] }
}

function listed(body: unknown): ListedMessage[] {
  if (typeof body !== 'object' || body === null || !('messages' in body) || !Array.isArray(body.messages)) {
    throw new Error('not a message list')
  }
  return body.messages
}

const quotePdf = Buffer.from('%PDF-1.4\n% pretend quote Q-2031-0007A\n%%EOF\n')

describe('fake mail server', () => {
  it('captures a message with an attachment and shows it through the HTTP API', async () => {
    handle = await startFakeMail({ smtpPort: 0, httpPort: 0, dir })
    expect(handle.smtpPort).toBeGreaterThan(0)
    expect(handle.httpPort).toBeGreaterThan(0)

    await transport(handle.smtpPort).sendMail({
      from: '"Ashcombe sales" <sales@ashcombe.test>',
      to: 'buyer@larkspur.test',
      cc: 'purchasing@larkspur.test',
      subject: 'Quote Q-2031-0007A issued',
      text: 'Your quote is attached.',
      html: '<p>Your quote is <b>attached</b>.</p>',
      attachments: [{ filename: '../../etc/Q-2031-0007A.pdf', content: quotePdf, contentType: 'application/pdf' }],
    })

    const list = await getJson(handle.httpPort, '/messages')
    expect(list.status).toBe(200)
    const messages = listed(list.body)
    expect(messages).toHaveLength(1)
    const summary = messages[0]
    if (!summary) throw new Error('no message')
    expect(summary.subject).toBe('Quote Q-2031-0007A issued')
    expect(summary.from?.address).toBe('sales@ashcombe.test')
    expect(summary.to.map((to) => to.address)).toEqual(['buyer@larkspur.test'])
    expect(summary.envelope.to.sort()).toEqual(['buyer@larkspur.test', 'purchasing@larkspur.test'])
    expect(summary.attachmentCount).toBe(1)

    const detail = await getJson(handle.httpPort, `/messages/${summary.id}`)
    expect(detail.status).toBe(200)
    expect(detail.body).toMatchObject({
      text: expect.stringContaining('Your quote is attached.'),
      html: expect.stringContaining('<b>attached</b>'),
      attachments: [{ index: 0, filename: 'Q-2031-0007A.pdf', contentType: 'application/pdf', size: quotePdf.length }],
      headers: expect.arrayContaining([{ name: 'subject', value: 'Quote Q-2031-0007A issued' }]),
    })

    const file = await fetch(`http://127.0.0.1:${handle.httpPort}/messages/${summary.id}/attachments/0`)
    expect(file.status).toBe(200)
    expect(file.headers.get('content-type')).toBe('application/pdf')
    expect(file.headers.get('content-disposition')).toMatch(/^attachment; filename="?Q-2031-0007A\.pdf"?$/)
    expect(Buffer.from(await file.arrayBuffer()).equals(quotePdf)).toBe(true)

    const raw = await fetch(`http://127.0.0.1:${handle.httpPort}/messages/${summary.id}/raw`)
    expect(raw.status).toBe(200)
    expect(await raw.text()).toContain('Subject: Quote Q-2031-0007A issued')
  })

  it('lists messages newest first', async () => {
    handle = await startFakeMail({ smtpPort: 0, httpPort: 0, dir })
    const mailer = transport(handle.smtpPort)
    for (const subject of ['first', 'second', 'third']) {
      await mailer.sendMail({ from: 'a@ashcombe.test', to: 'b@larkspur.test', subject, text: subject })
    }
    const messages = listed((await getJson(handle.httpPort, '/messages')).body)
    expect(messages.map((message) => message.subject)).toEqual(['third', 'second', 'first'])
  })

  it('keeps old messages when restarted on the same ports and directory, and refuses mail while down', async () => {
    handle = await startFakeMail({ smtpPort: 0, httpPort: 0, dir })
    const { smtpPort, httpPort } = handle
    await transport(smtpPort).sendMail({ from: 'a@ashcombe.test', to: 'b@larkspur.test', subject: 'before restart', text: 'x' })
    await handle.close()
    handle = null

    await expect(
      transport(smtpPort).sendMail({ from: 'a@ashcombe.test', to: 'b@larkspur.test', subject: 'while down', text: 'x' }),
    ).rejects.toMatchObject({ code: 'ESOCKET' })

    handle = await startFakeMail({ smtpPort, httpPort, dir })
    expect(handle.smtpPort).toBe(smtpPort)
    await transport(smtpPort).sendMail({ from: 'a@ashcombe.test', to: 'b@larkspur.test', subject: 'after restart', text: 'y' })
    const messages = listed((await getJson(httpPort, '/messages')).body)
    expect(messages.map((message) => message.subject)).toEqual(['after restart', 'before restart'])
  })

  it('rejects ids that are not generated ids and answers 404 for unknown ones', async () => {
    handle = await startFakeMail({ smtpPort: 0, httpPort: 0, dir })
    expect((await getJson(handle.httpPort, '/messages/..%2F..%2Fetc%2Fpasswd')).status).toBe(400)
    expect((await getJson(handle.httpPort, '/messages/0000000000000-000000000000')).status).toBe(404)
    expect((await getJson(handle.httpPort, '/messages/0000000000000-000000000000/attachments/0')).status).toBe(404)
  })

  it('clears the mailbox with DELETE /messages', async () => {
    handle = await startFakeMail({ smtpPort: 0, httpPort: 0, dir })
    await transport(handle.smtpPort).sendMail({ from: 'a@ashcombe.test', to: 'b@larkspur.test', subject: 's', text: 't' })
    const res = await fetch(`http://127.0.0.1:${handle.httpPort}/messages`, { method: 'DELETE' })
    expect(await res.json()).toEqual({ removed: 1 })
    expect(listed((await getJson(handle.httpPort, '/messages')).body)).toEqual([])
    expect(await readdir(dir)).toEqual([])
  })

  it('accepts a client that logs in, as a real server set up with credentials would', async () => {
    handle = await startFakeMail({ smtpPort: 0, httpPort: 0, dir })
    const mailer = nodemailer.createTransport({
      host: '127.0.0.1',
      port: handle.smtpPort,
      ignoreTLS: true,
      auth: { user: 'mailer', pass: 'anything' },
    })
    await mailer.sendMail({ from: 'a@ashcombe.test', to: 'b@larkspur.test', subject: 'with auth', text: 't' })
    expect(listed((await getJson(handle.httpPort, '/messages')).body)).toHaveLength(1)
  })
})

describe('safeFileName', () => {
  it('keeps only the last path part and replaces control and reserved characters', () => {
    expect(safeFileName('..\\..\\boot.ini', 0)).toBe('boot.ini')
    expect(safeFileName('a\u0000b<c>.pdf', 0)).toBe('a_b_c_.pdf')
  })

  it('falls back to a numbered name when nothing usable is left', () => {
    expect(safeFileName(undefined, 2)).toBe('attachment-3.bin')
    expect(safeFileName('../..', 0)).toBe('attachment-1.bin')
  })
})
