// The mail outbox against a real MariaDB and the local fake SMTP server on free ports.
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { MailOutbox } from '../../server/db/entities'
import { startFakeMail, type FakeMailHandle } from '../../server/fakes/mail/fake-mail'
import type { MailDetail, MailSummary } from '../../server/fakes/mail/mail-api'
import { enqueueMail, InvalidMailError, type OutgoingMail } from '../../server/mail/outbox'
import { OutboxWorker, type OutboxWorkerSettings } from '../../server/mail/outbox-worker'
import { createMailTransport } from '../../server/mail/transport'
import { startTestApp, type TestContext } from './support'

const FROM = 'Spinwright test <quotes@ashcombe.test>'
const PDF = Buffer.from('%PDF-1.4\n% pretend quote SW-2031-00042A\n%%EOF\n')

let ctx: TestContext
let dataDir: string
let mailDir: string
let fake: FakeMailHandle | null = null
let ports: { smtp: number; http: number }
let clock: Date

function advance(ms: number): void {
  clock = new Date(clock.getTime() + ms)
}

function worker(settings: Partial<OutboxWorkerSettings> = {}): OutboxWorker {
  const transport = createMailTransport({ SMTP_HOST: '127.0.0.1', SMTP_PORT: ports.smtp, SMTP_SECURE: false, SMTP_USER: undefined, SMTP_PASSWORD: undefined })
  return new OutboxWorker(ctx.dataSource, transport, {
    from: FROM,
    dataDir,
    now: () => clock,
    random: () => 0,
    log: () => undefined,
    ...settings,
  })
}

function quoteMail(subject = 'Quote SW-2031-00042A from Ashcombe Motor Works'): OutgoingMail {
  return {
    kind: 'quote-issued',
    reference: 'quote-42',
    to: ['buyer@larkspur.test'],
    cc: ['sales@ashcombe.test'],
    subject,
    text: 'Your quote is attached.',
    html: '<p>Your quote is attached.</p>',
    attachments: [{ filename: 'SW-2031-00042A.pdf', contentType: 'application/pdf', path: 'quotes/SW-2031-00042A.pdf' }],
  }
}

async function enqueue(mail: OutgoingMail): Promise<MailOutbox> {
  return ctx.dataSource.transaction((manager) => enqueueMail(manager, mail, clock))
}

async function row(id: string): Promise<MailOutbox> {
  return ctx.dataSource.getRepository(MailOutbox).findOneByOrFail({ id })
}

async function mailbox(): Promise<MailSummary[]> {
  const res = await fetch(`http://127.0.0.1:${ports.http}/messages`)
  const body: { messages: MailSummary[] } = await res.json()
  return body.messages
}

beforeAll(async () => {
  ctx = await startTestApp()
  dataDir = await mkdtemp(path.join(tmpdir(), 'outbox-data-'))
  mailDir = await mkdtemp(path.join(tmpdir(), 'outbox-mail-'))
  await mkdir(path.join(dataDir, 'quotes'))
  await writeFile(path.join(dataDir, 'quotes', 'SW-2031-00042A.pdf'), PDF)
  fake = await startFakeMail({ smtpPort: 0, httpPort: 0, dir: mailDir })
  ports = { smtp: fake.smtpPort, http: fake.httpPort }
})

afterAll(async () => {
  await fake?.close()
  await ctx.close()
  await rm(dataDir, { recursive: true, force: true })
  await rm(mailDir, { recursive: true, force: true })
})

beforeEach(async () => {
  clock = new Date()
  // A test that stopped the fake server leaves it stopped; start it again on the same ports.
  fake ??= await startFakeMail({ smtpPort: ports.smtp, httpPort: ports.http, dir: mailDir })
  await ctx.dataSource.getRepository(MailOutbox).clear()
  await fetch(`http://127.0.0.1:${ports.http}/messages`, { method: 'DELETE' })
})

describe('enqueueMail', () => {
  it('stores a pending row when the caller commits, and none when the caller rolls back', async () => {
    const stored = await enqueue(quoteMail())
    expect(await row(stored.id)).toMatchObject({ status: 'pending', attempts: 0, kind: 'quote-issued', reference: 'quote-42', to: ['buyer@larkspur.test'] })

    await expect(
      ctx.dataSource.transaction(async (manager) => {
        await enqueueMail(manager, quoteMail('rolled back'))
        throw new Error('the business change failed')
      }),
    ).rejects.toThrow('the business change failed')
    expect(await ctx.dataSource.getRepository(MailOutbox).countBy({ subject: 'rolled back' })).toBe(0)
  })

  it('refuses a message without recipients or with an attachment path outside the data directory', async () => {
    await expect(enqueue({ ...quoteMail(), to: [] })).rejects.toBeInstanceOf(InvalidMailError)
    await expect(enqueue({ ...quoteMail(), attachments: [{ filename: 'x', contentType: 'text/plain', path: '../../etc/passwd' }] })).rejects.toBeInstanceOf(InvalidMailError)
    expect(await ctx.dataSource.getRepository(MailOutbox).count()).toBe(0)
  })
})

describe('OutboxWorker', () => {
  it('sends a due row to the SMTP server with its PDF and marks it sent', async () => {
    const stored = await enqueue(quoteMail())
    const result = await worker().runOnce()
    expect(result).toMatchObject({ claimed: 1, sent: 1, retrying: 0, failed: 0 })

    const after = await row(stored.id)
    expect(after).toMatchObject({ status: 'sent', attempts: 1, lastError: null, claimedAt: null })
    expect(after.sentAt).toBeInstanceOf(Date)
    expect(after.messageId).toBe(`<${stored.id}@outbox.spinwright>`)

    const [message] = await mailbox()
    expect(message).toMatchObject({ subject: 'Quote SW-2031-00042A from Ashcombe Motor Works', attachmentCount: 1, from: { address: 'quotes@ashcombe.test' } })
    expect(message?.envelope.to.sort()).toEqual(['buyer@larkspur.test', 'sales@ashcombe.test'])
    const file = await fetch(`http://127.0.0.1:${ports.http}/messages/${message?.id}/attachments/0`)
    expect(Buffer.from(await file.arrayBuffer()).equals(PDF)).toBe(true)
  })

  it('keeps the row pending with a later attempt while the SMTP server is down, and sends it once the server is back', async () => {
    const stored = await enqueue(quoteMail())
    await fake?.close()
    fake = null

    const first = await worker().runOnce()
    expect(first).toMatchObject({ claimed: 1, sent: 0, retrying: 1 })
    const waiting = await row(stored.id)
    expect(waiting.status).toBe('pending')
    expect(waiting.attempts).toBe(1)
    expect(waiting.lastError).toMatch(/ECONNREFUSED|ESOCKET|ECONNECTION/)
    // random() = 0 gives the full first delay of 5 s.
    expect(waiting.nextAttemptAt.getTime()).toBe(clock.getTime() + 5_000)

    // Not due yet: a round one second later leaves it alone.
    advance(1_000)
    expect(await worker().runOnce()).toMatchObject({ claimed: 0 })

    fake = await startFakeMail({ smtpPort: ports.smtp, httpPort: ports.http, dir: mailDir })
    advance(4_000)
    expect(await worker().runOnce()).toMatchObject({ claimed: 1, sent: 1 })
    expect(await row(stored.id)).toMatchObject({ status: 'sent', attempts: 2, lastError: null })

    const messages = await mailbox()
    expect(messages).toHaveLength(1)
    expect(messages[0]?.attachmentCount).toBe(1)
    const detail: MailDetail = await (await fetch(`http://127.0.0.1:${ports.http}/messages/${messages[0]?.id}`)).json()
    expect(detail.attachments).toMatchObject([{ filename: 'SW-2031-00042A.pdf', contentType: 'application/pdf', size: PDF.length }])
  })

  it('doubles the wait after each failure and gives up as failed after maxAttempts', async () => {
    const stored = await enqueue(quoteMail())
    await fake?.close()
    fake = null
    const outbox = worker({ maxAttempts: 3 })

    const delays: number[] = []
    for (let attempt = 1; attempt <= 3; attempt += 1) {
      const result = await outbox.runOnce()
      expect(result.claimed).toBe(1)
      const after = await row(stored.id)
      expect(after.attempts).toBe(attempt)
      if (attempt < 3) {
        expect(after.status).toBe('pending')
        delays.push(after.nextAttemptAt.getTime() - clock.getTime())
        clock = after.nextAttemptAt
      } else {
        expect(result.failed).toBe(1)
        expect(after.status).toBe('failed')
      }
    }
    expect(delays).toEqual([5_000, 10_000])
    advance(24 * 60 * 60_000)
    expect(await outbox.runOnce()).toMatchObject({ claimed: 0 })
  })

  it('never sends a row twice when two workers run at the same time', async () => {
    const ids: string[] = []
    for (let i = 1; i <= 20; i += 1) ids.push((await enqueue({ ...quoteMail(`Concurrent ${String(i).padStart(2, '0')}`), attachments: [] })).id)
    const workers = [worker({ batchSize: 3 }), worker({ batchSize: 3 })]

    const drain = async (outbox: OutboxWorker): Promise<number> => {
      let sent = 0
      for (;;) {
        const result = await outbox.runOnce()
        sent += result.sent
        if (result.claimed === 0) return sent
      }
    }
    const counts = await Promise.all(workers.map(drain))

    expect(counts.reduce((sum, count) => sum + count, 0)).toBe(20)
    const subjects = (await mailbox()).map((message) => message.subject).sort()
    expect(subjects).toEqual(Array.from({ length: 20 }, (_, i) => `Concurrent ${String(i + 1).padStart(2, '0')}`))
    const rows = await ctx.dataSource.getRepository(MailOutbox).find()
    expect(rows.every((outboxRow) => outboxRow.status === 'sent' && outboxRow.attempts === 1)).toBe(true)
  })

  it('hands a row stuck in sending back after the timeout and sends it', async () => {
    const stored = await enqueue(quoteMail())
    // As a process that crashed after claiming would leave it.
    await ctx.dataSource.getRepository(MailOutbox).update(stored.id, { status: 'sending', attempts: 1, claimedAt: clock })

    advance(60_000)
    expect(await worker({ sendingTimeoutMs: 5 * 60_000 }).runOnce()).toMatchObject({ recovered: 0, claimed: 0 })
    advance(5 * 60_000)
    expect(await worker({ sendingTimeoutMs: 5 * 60_000 }).runOnce()).toMatchObject({ recovered: 1, claimed: 1, sent: 1 })
    expect(await row(stored.id)).toMatchObject({ status: 'sent', attempts: 2 })
  })

  it('sends on its own once started, and stop() waits for the batch in flight', async () => {
    clock = new Date(Date.now() + 1_000)
    const stored = await enqueue({ ...quoteMail(), attachments: [{ filename: 'note.txt', contentType: 'text/plain', contentBase64: Buffer.from('hello').toString('base64') }] })
    const outbox = worker({ pollMs: 50 })
    outbox.start()
    const deadline = Date.now() + 10_000
    while ((await row(stored.id)).status !== 'sent' && Date.now() < deadline) await new Promise((resolve) => setTimeout(resolve, 50))
    await outbox.stop()
    expect((await row(stored.id)).status).toBe('sent')
    expect((await mailbox())[0]?.attachmentCount).toBe(1)
  })
})
