// The admin's mailbox (read from the local fake mail server) and outbox routes.
import { mkdtemp, rm } from 'node:fs/promises'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import path from 'node:path'
import nodemailer from 'nodemailer'
import request from 'supertest'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { MailOutbox } from '../../server/db/entities'
import { startFakeMail, type FakeMailHandle } from '../../server/fakes/mail/fake-mail'
import { enqueueMail } from '../../server/mail/outbox'
import { createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

const PDF = Buffer.from('%PDF-1.4\n% pretend quote SW-2031-00007A\n%%EOF\n')

let ctx: TestContext
let fake: FakeMailHandle
let mailDir: string
let admin: SignedInAgent
let buyer: SignedInAgent

async function closedPort(): Promise<number> {
  const server = createServer()
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve))
  const address = server.address()
  await new Promise<void>((resolve) => server.close(() => resolve()))
  if (address === null || typeof address === 'string') throw new Error('no port')
  return address.port
}

async function sendToFake(subject: string): Promise<void> {
  await nodemailer.createTransport({ host: '127.0.0.1', port: fake.smtpPort, secure: false }).sendMail({
    from: 'quotes@ashcombe.test',
    to: 'buyer@larkspur.test',
    subject,
    text: `Text of ${subject}`,
    html: `<p>HTML of ${subject}</p>`,
    attachments: [{ filename: 'SW-2031-00007A.pdf', contentType: 'application/pdf', content: PDF }],
  })
}

async function outboxRow(overrides: Partial<MailOutbox>): Promise<MailOutbox> {
  const stored = await ctx.dataSource.transaction((manager) =>
    enqueueMail(manager, { kind: 'quote-issued', reference: 'q-7', to: ['buyer@larkspur.test'], subject: 'Quote SW-2031-00007A', text: 'Attached.' }),
  )
  if (Object.keys(overrides).length > 0) await ctx.dataSource.getRepository(MailOutbox).update(stored.id, overrides)
  return ctx.dataSource.getRepository(MailOutbox).findOneByOrFail({ id: stored.id })
}

beforeAll(async () => {
  mailDir = await mkdtemp(path.join(tmpdir(), 'admin-mailbox-'))
  fake = await startFakeMail({ smtpPort: 0, httpPort: 0, dir: mailDir })
  ctx = await startTestApp({ MAILBOX_URL: `http://127.0.0.1:${fake.httpPort}` })
  admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin'))
  buyer = await signInAs(ctx, await createUser(ctx.dataSource, 'buyer'))
})

afterAll(async () => {
  await ctx.close()
  await fake.close()
  await rm(mailDir, { recursive: true, force: true })
})

beforeEach(async () => {
  await fetch(`http://127.0.0.1:${fake.httpPort}/messages`, { method: 'DELETE' })
  await ctx.dataSource.getRepository(MailOutbox).clear()
})

describe('GET /api/admin/mailbox', () => {
  it('refuses a buyer with 403 and an anonymous visitor with 401', async () => {
    const refused = await buyer.agent.get('/api/admin/mailbox')
    expect(refused.status).toBe(403)
    expect(refused.body.error.code).toBe('forbidden')
    const { agent } = await signInAs(ctx, await createUser(ctx.dataSource, 'sales'))
    expect((await agent.get('/api/admin/mailbox')).status).toBe(403)
    const anonymous = await request(ctx.handle.app).get('/api/admin/mailbox')
    expect(anonymous.status).toBe(401)
  })

  it('lists the captured messages, newest first, for an admin', async () => {
    await sendToFake('First quote')
    await sendToFake('Second quote')
    const res = await admin.agent.get('/api/admin/mailbox').expect(200)
    expect(res.body.messages.map((message: { subject: string }) => message.subject)).toEqual(['Second quote', 'First quote'])
    expect(res.body.messages[0]).toMatchObject({ from: { address: 'quotes@ashcombe.test' }, to: [{ address: 'buyer@larkspur.test' }], attachmentCount: 1 })
  })

  it('answers 503 with a clear code when the mail fake cannot be reached', async () => {
    const down = await startTestApp({ MAILBOX_URL: `http://127.0.0.1:${await closedPort()}` })
    try {
      const { agent } = await signInAs(down, await createUser(down.dataSource, 'admin'))
      const res = await agent.get('/api/admin/mailbox')
      expect(res.status).toBe(503)
      expect(res.body.error.code).toBe('mailbox_unavailable')
      expect(res.body.error.message).toMatch(/not answering/)
    } finally {
      await down.close()
    }
  })
})

describe('GET /api/admin/mailbox/:id and its attachments', () => {
  it('shows headers, text and HTML, and downloads the attachment with its name', async () => {
    await sendToFake('Quote with PDF')
    const [summary] = (await admin.agent.get('/api/admin/mailbox').expect(200)).body.messages
    const detail = await admin.agent.get(`/api/admin/mailbox/${summary.id}`).expect(200)
    expect(detail.body).toMatchObject({
      subject: 'Quote with PDF',
      text: expect.stringContaining('Text of Quote with PDF'),
      html: expect.stringContaining('<p>HTML of Quote with PDF</p>'),
      attachments: [{ index: 0, filename: 'SW-2031-00007A.pdf', contentType: 'application/pdf', size: PDF.length }],
    })
    expect(detail.body.headers).toEqual(expect.arrayContaining([{ name: 'subject', value: 'Quote with PDF' }]))

    const file = await admin.agent
      .get(`/api/admin/mailbox/${summary.id}/attachments/0`)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = []
        res.on('data', (chunk: Buffer) => chunks.push(chunk))
        res.on('end', () => done(null, Buffer.concat(chunks)))
      })
      .expect(200)
    expect(file.headers['content-type']).toBe('application/pdf')
    expect(file.headers['content-disposition']).toMatch(/^attachment; filename="?SW-2031-00007A\.pdf"?$/)
    expect(file.headers['content-security-policy']).toContain('sandbox')
    expect(Buffer.isBuffer(file.body) && file.body.equals(PDF)).toBe(true)
  })

  it('answers 404 for an unknown message or attachment and 400 for a malformed id', async () => {
    await sendToFake('Only one')
    const [summary] = (await admin.agent.get('/api/admin/mailbox').expect(200)).body.messages
    expect((await admin.agent.get('/api/admin/mailbox/0000000000000-000000000000')).status).toBe(404)
    expect((await admin.agent.get(`/api/admin/mailbox/${summary.id}/attachments/5`)).status).toBe(404)
    const bad = await admin.agent.get('/api/admin/mailbox/..%2Fetc')
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields).toHaveProperty('params.id')
    expect((await buyer.agent.get(`/api/admin/mailbox/${summary.id}/attachments/0`)).status).toBe(403)
  })
})

describe('DELETE /api/admin/mailbox', () => {
  it('empties the mailbox for an admin and refuses a buyer', async () => {
    await sendToFake('To be cleared')
    expect((await buyer.agent.delete('/api/admin/mailbox').set('X-CSRF-Token', buyer.csrf)).status).toBe(403)
    const res = await admin.agent.delete('/api/admin/mailbox').set('X-CSRF-Token', admin.csrf).expect(200)
    expect(res.body).toEqual({ removed: 1 })
    expect((await admin.agent.get('/api/admin/mailbox').expect(200)).body.messages).toEqual([])
  })
})

describe('GET /api/admin/outbox', () => {
  it('pages the outbox newest first with status, attempts and the last error, filtered by status', async () => {
    const failed = await outboxRow({ status: 'failed', attempts: 8, lastError: 'ECONNREFUSED: connect ECONNREFUSED 127.0.0.1:2525' })
    await outboxRow({ status: 'sent', attempts: 1, sentAt: new Date() })
    await outboxRow({})

    const all = await admin.agent.get('/api/admin/outbox').query({ pageSize: 2 }).expect(200)
    expect(all.body).toMatchObject({ total: 3, page: 1, pageSize: 2 })
    expect(all.body.items).toHaveLength(2)

    const onlyFailed = await admin.agent.get('/api/admin/outbox').query({ status: 'failed' }).expect(200)
    expect(onlyFailed.body.items).toEqual([
      expect.objectContaining({ id: failed.id, status: 'failed', attempts: 8, lastError: expect.stringContaining('ECONNREFUSED'), kind: 'quote-issued', reference: 'q-7', to: ['buyer@larkspur.test'] }),
    ])
    expect((await admin.agent.get('/api/admin/outbox').query({ status: 'lost' })).status).toBe(400)
    expect((await buyer.agent.get('/api/admin/outbox')).status).toBe(403)
  })
})

describe('POST /api/admin/outbox/:id/retry', () => {
  it('puts a failed row back in the queue, due now with fresh attempts', async () => {
    const failed = await outboxRow({ status: 'failed', attempts: 8, lastError: 'gave up', nextAttemptAt: new Date(Date.now() - 3_600_000) })
    const before = Date.now()
    const res = await admin.agent.post(`/api/admin/outbox/${failed.id}/retry`).set('X-CSRF-Token', admin.csrf).expect(200)
    expect(res.body).toMatchObject({ id: failed.id, status: 'pending', attempts: 0, lastError: 'gave up' })
    const stored = await ctx.dataSource.getRepository(MailOutbox).findOneByOrFail({ id: failed.id })
    expect(stored.status).toBe('pending')
    expect(stored.nextAttemptAt.getTime()).toBeGreaterThanOrEqual(before - 1_000)
  })

  it('refuses a sent row with 409, an unknown row with 404, and a buyer with 403', async () => {
    const sent = await outboxRow({ status: 'sent', attempts: 1, sentAt: new Date() })
    const conflict = await admin.agent.post(`/api/admin/outbox/${sent.id}/retry`).set('X-CSRF-Token', admin.csrf)
    expect(conflict.status).toBe(409)
    expect(conflict.body.error.code).toBe('outbox_sent')
    expect((await admin.agent.post('/api/admin/outbox/00000000-0000-4000-8000-000000000000/retry').set('X-CSRF-Token', admin.csrf)).status).toBe(404)
    expect((await buyer.agent.post(`/api/admin/outbox/${sent.id}/retry`).set('X-CSRF-Token', buyer.csrf)).status).toBe(403)
    expect((await ctx.dataSource.getRepository(MailOutbox).findOneByOrFail({ id: sent.id })).status).toBe('sent')
  })
})
