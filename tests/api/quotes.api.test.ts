import { randomUUID } from 'node:crypto'
import { existsSync, readdirSync } from 'node:fs'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MailOutbox } from '../../server/db/entities/mail-outbox.entity'
import { QuoteRecordEntity, QuoteRevisionRecord, User } from '../../server/db/entities'
import { renderQuotePdf } from '../../server/documents/quote-pdf'
import { CatalogueService } from '../../server/services/catalogue.service'
import { QuoteService } from '../../server/services/quote.service'
import { toSessionUser } from '../../server/services/user.service'
import { blowerStudy, insertVariants } from './catalogue-fixtures'
import { assignAccount, priceListFor } from './quote-fixtures'
import { createOrganisation, createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
const prefix = `QT${randomUUID().slice(0, 6).toUpperCase()}`
let buyer: SignedInAgent
let outsider: SignedInAgent
let sales: SignedInAgent
let studyId: string

beforeAll(async () => {
  ctx = await startTestApp({ DATA_DIR: path.resolve(`.data/test-quotes-${process.pid}`) })
  await insertVariants(ctx.dataSource, prefix, [{ partNumber: 'PSC', type: 'psc', volts: 230, hz: 50 }, { partNumber: 'PSC2', type: 'psc', volts: 230, hz: 50 }])
  const list = await priceListFor(ctx.dataSource, prefix)
  const org = await createOrganisation(ctx.dataSource, 'customer', 'oem')
  const salesUser = await createUser(ctx.dataSource, 'sales')
  await assignAccount(ctx.dataSource, org.id, list.id, salesUser)
  buyer = await signInAs(ctx, await createUser(ctx.dataSource, 'buyer', org))
  outsider = await signInAs(ctx, await createUser(ctx.dataSource, 'buyer'))
  sales = await signInAs(ctx, salesUser)
  const study = await buyer.agent.post('/api/v1/studies').set('X-CSRF-Token', buyer.csrf).send({ input: blowerStudy({ name: 'Quote study' }) })
  studyId = study.body.id
})
afterAll(async () => {
  await ctx.close()
})

async function requestQuote(quantityPerYear = 2400): Promise<string> {
  const response = await buyer.agent
    .post('/api/v1/quotes/requests')
    .set('X-CSRF-Token', buyer.csrf)
    .send({ studyId, partNumber: `${prefix}-PSC`, tap: 'high', quantityPerYear, lotSize: 600, note: 'First lot in March' })
  expect(response.status).toBe(201)
  return response.body.id
}

async function current(id: string, as: SignedInAgent = sales) {
  return (await as.agent.get(`/api/v1/quotes/${id}`)).body
}

describe('quote requests and drafts', () => {
  it('a buyer request lands with the account’s sales engineer, priced on the server', async () => {
    const id = await requestQuote()
    const quote = await current(id)
    expect(quote.state).toBe('requested')
    expect(quote.salesEngineer.id).toBe(sales.user.id)
    // 2 400 a year takes the 2 000 break (2 200 c), less the 8 % OEM tier discount (176 c);
    // copper 0.3 kg x (1 000 - 900) c/kg = 30 c; unit net 2 054 c; x 2 400 = 4 929 600 c.
    const line = quote.draftPricing.lines[0]
    expect(line.breakUnitPrice).toBe(2200)
    expect(line.discountPerUnit).toBe(176)
    expect(line.copperPerUnit).toBe(30)
    expect(line.unitNetPrice).toBe(2054)
    expect(quote.draftPricing.totals.subtotal).toBe(4_929_600)
    expect(quote.draftPricing.totals.depositAmount).toBe(1_478_880)
    // The buyer sees neither the draft nor its prices.
    const asBuyer = await current(id, buyer)
    expect(asBuyer.draft).toBeNull()
    expect(asBuyer.draftPricing).toBeNull()
  })

  it('ignores any price a client sends: the body has no place for one', async () => {
    const id = await requestQuote()
    const quote = await current(id)
    const draft = { ...quote.draft, lines: [{ ...quote.draft.lines[0], unitPrice: 1 }] }
    const response = await sales.agent.put(`/api/v1/quotes/${id}/draft`).set('X-CSRF-Token', sales.csrf).send({ draft, version: quote.version })
    expect(response.status).toBe(400)
    expect(Object.keys(response.body.error.fields)).toContain('draft.lines.0')
  })

  it('refuses an extra discount above the sales engineer’s limit, naming the line', async () => {
    const id = await requestQuote()
    const quote = await current(id)
    const draft = { ...quote.draft, lines: [{ ...quote.draft.lines[0], extraDiscountBp: 1500 }] }
    const response = await sales.agent.put(`/api/v1/quotes/${id}/draft`).set('X-CSRF-Token', sales.csrf).send({ draft, version: quote.version })
    expect(response.status).toBe(400)
    expect(response.body.error.fields).toHaveProperty('draft.lines.0.extraDiscountBp')
  })

  it('answers a stale edit with 409 and keeps the newer draft', async () => {
    const id = await requestQuote()
    const quote = await current(id)
    const first = { ...quote.draft, lines: [{ ...quote.draft.lines[0], quantity: 3000 }] }
    const second = { ...quote.draft, lines: [{ ...quote.draft.lines[0], quantity: 9000 }] }
    expect((await sales.agent.put(`/api/v1/quotes/${id}/draft`).set('X-CSRF-Token', sales.csrf).send({ draft: first, version: quote.version })).status).toBe(200)
    const stale = await sales.agent.put(`/api/v1/quotes/${id}/draft`).set('X-CSRF-Token', sales.csrf).send({ draft: second, version: quote.version })
    expect(stale.status).toBe(409)
    expect(stale.body.error.code).toBe('stale_version')
    const stored = await ctx.dataSource.getRepository(QuoteRecordEntity).findOneByOrFail({ id })
    expect(stored.draft?.lines[0]?.quantity).toBe(3000)
  })

  it('keeps other organisations out (404) and buyers away from sales actions (403)', async () => {
    const id = await requestQuote()
    expect((await outsider.agent.get(`/api/v1/quotes/${id}`)).status).toBe(404)
    // Sales engineers list their own accounts' quotes; another engineer's list leaves this one out.
    expect((await sales.agent.get('/api/v1/quotes?pageSize=100')).body.items.map((item: { id: string }) => item.id)).toContain(id)
    const otherSales = await signInAs(ctx, await createUser(ctx.dataSource, 'sales'))
    expect((await otherSales.agent.get('/api/v1/quotes?pageSize=100')).body.items.map((item: { id: string }) => item.id)).not.toContain(id)
    const list = await outsider.agent.get('/api/v1/quotes')
    expect(list.body.items.map((item: { id: string }) => item.id)).not.toContain(id)
    const quote = await current(id)
    expect((await buyer.agent.post(`/api/v1/quotes/${id}/issue`).set('X-CSRF-Token', buyer.csrf).send({ version: quote.version })).status).toBe(403)
    expect((await buyer.agent.put(`/api/v1/quotes/${id}/draft`).set('X-CSRF-Token', buyer.csrf).send({ draft: quote.draft, version: quote.version })).status).toBe(403)
  })
})

describe('issuing, revisions and acceptance', () => {
  it('issues numbered revisions that never change, with PDF, mail and the operating point', async () => {
    const id = await requestQuote()
    let quote = await current(id)
    const issued = await sales.agent.post(`/api/v1/quotes/${id}/issue`).set('X-CSRF-Token', sales.csrf).send({ version: quote.version })
    expect(issued.status).toBe(200)
    expect(issued.body.state).toBe('issued')
    expect(issued.body.number).toMatch(/^SW-\d{4}-\d{5}$/)
    expect(issued.body.current.letter).toBe('A')
    const point = issued.body.current.lines[0].dutyPoint
    expect(point.nominal.rpm).toBeGreaterThan(1000)
    expect(point.nominal.flowM3s).toBeGreaterThan(0)
    expect(point.motorCurve.length).toBeGreaterThan(10)
    const revisionA = await ctx.dataSource.getRepository(QuoteRevisionRecord).findOneByOrFail({ quoteId: id, letter: 'A' })
    expect(revisionA.pdfFile).toBeTruthy()
    expect(existsSync(path.join(ctx.config.DATA_DIR, revisionA.pdfFile ?? ''))).toBe(true)
    const mail = await ctx.dataSource.getRepository(MailOutbox).findBy({ reference: id })
    expect(mail.map((item) => item.kind)).toContain('quote-issued')
    expect(JSON.stringify(mail[0]?.attachments)).toContain(revisionA.pdfFile)

    // A change after issue makes revision B; A stays exactly as it was.
    quote = await current(id)
    const draft = { ...quote.draft, lines: [{ ...quote.draft.lines[0], quantity: 12_000 }] }
    await sales.agent.put(`/api/v1/quotes/${id}/draft`).set('X-CSRF-Token', sales.csrf).send({ draft, version: quote.version }).expect(200)
    quote = await current(id)
    const second = await sales.agent.post(`/api/v1/quotes/${id}/issue`).set('X-CSRF-Token', sales.csrf).send({ version: quote.version })
    expect(second.body.current.letter).toBe('B')
    expect(second.body.number).toBe(issued.body.number)
    expect(second.body.revisions.map((revision: { letter: string }) => revision.letter)).toEqual(['A', 'B'])
    const revisionAAgain = await ctx.dataSource.getRepository(QuoteRevisionRecord).findOneByOrFail({ quoteId: id, letter: 'A' })
    expect(revisionAAgain.document).toEqual(revisionA.document)
    expect(revisionAAgain.total).toBe(revisionA.total)
    expect(second.body.current.priced.totals.total).not.toBe(revisionA.total)

    // The buyer must accept the current revision; A is superseded.
    const old = await buyer.agent.post(`/api/v1/quotes/${id}/accept`).set('X-CSRF-Token', buyer.csrf).send({ acceptedByName: 'Priya C', purchaseOrderRef: 'PO-1', revision: 'A' })
    expect(old.status).toBe(409)
    expect(old.body.error.code).toBe('revision_superseded')
    const accepted = await buyer.agent.post(`/api/v1/quotes/${id}/accept`).set('X-CSRF-Token', buyer.csrf).send({ acceptedByName: 'Priya C', purchaseOrderRef: 'PO-1', revision: 'B' })
    expect(accepted.status).toBe(200)
    expect(accepted.body.state).toBe('accepted')
    expect(accepted.body.acceptance).toMatchObject({ purchaseOrderRef: 'PO-1', revision: 'B' })
    const again = await buyer.agent.post(`/api/v1/quotes/${id}/accept`).set('X-CSRF-Token', buyer.csrf).send({ acceptedByName: 'Priya C', purchaseOrderRef: 'PO-1', revision: 'B' })
    expect(again.status).toBe(409)

    // The buyer and the sales engineer download the PDF; another organisation cannot.
    const pdf = await buyer.agent.get(`/api/v1/quotes/${id}/revisions/B/pdf`).buffer(true)
    expect(pdf.status).toBe(200)
    expect(pdf.headers['content-type']).toBe('application/pdf')
    expect(pdf.body.subarray(0, 4).toString()).toBe('%PDF')
    expect((await outsider.agent.get(`/api/v1/quotes/${id}/revisions/B/pdf`)).status).toBe(404)
  })

  it('gives unique numbers to quotes issued at the same time', async () => {
    const ids = await Promise.all(Array.from({ length: 8 }, () => requestQuote(800)))
    const versions = await Promise.all(ids.map(async (id) => (await current(id)).version))
    const results = await Promise.all(ids.map((id, index) => sales.agent.post(`/api/v1/quotes/${id}/issue`).set('X-CSRF-Token', sales.csrf).send({ version: versions[index] })))
    expect(results.map((result) => result.status)).toEqual(ids.map(() => 200))
    const numbers = results.map((result) => result.body.number)
    expect(new Set(numbers).size).toBe(ids.length)
  })

  it('lets an issued quote expire after its validity; it cannot be accepted then', async () => {
    const id = await requestQuote()
    const quote = await current(id)
    const issued = await sales.agent.post(`/api/v1/quotes/${id}/issue`).set('X-CSRF-Token', sales.csrf).send({ version: quote.version })
    const validUntil: string = issued.body.current.validUntil
    const later = await startTestApp({ DATA_DIR: ctx.config.DATA_DIR })
    try {
      const dayAfter = new Date(`${validUntil}T00:00:00Z`)
      dayAfter.setUTCDate(dayAfter.getUTCDate() + 1)
      const expired = await later.handle.services.quotes.expireDueOn(dayAfter.toISOString().slice(0, 10))
      expect(expired).toBeGreaterThanOrEqual(1)
    } finally {
      await later.close()
    }
    expect((await current(id)).state).toBe('expired')
    const accept = await buyer.agent.post(`/api/v1/quotes/${id}/accept`).set('X-CSRF-Token', buyer.csrf).send({ acceptedByName: 'Priya C', purchaseOrderRef: 'PO-2', revision: 'A' })
    expect(accept.status).toBe(409)
  })

  it('reminds the buyers once before an issued quote expires', async () => {
    const id = await requestQuote()
    const quote = await current(id)
    const issued = await sales.agent.post(`/api/v1/quotes/${id}/issue`).set('X-CSRF-Token', sales.csrf).send({ version: quote.version })
    const validUntil: string = issued.body.current.validUntil
    const twoDaysBefore = new Date(`${validUntil}T00:00:00Z`)
    twoDaysBefore.setUTCDate(twoDaysBefore.getUTCDate() - 2)
    const today = twoDaysBefore.toISOString().slice(0, 10)
    const service = ctx.handle.services.quotes
    expect(await service.sendExpiryReminders(5, today)).toBeGreaterThanOrEqual(1)
    const reminders = await ctx.dataSource.getRepository(MailOutbox).findBy({ kind: 'quote-expiry-reminder', reference: `${id}:A` })
    expect(reminders.length).toBeGreaterThanOrEqual(1)
    expect(reminders[0]?.subject).toMatch(/expire|valid/i)
    await service.sendExpiryReminders(5, today)
    expect(await ctx.dataSource.getRepository(MailOutbox).countBy({ kind: 'quote-expiry-reminder', reference: `${id}:A` })).toBe(reminders.length)
  })

  it('answers 400 naming the fields when the quote cannot be priced (quantity below MOQ)', async () => {
    const id = await requestQuote()
    const quote = await current(id)
    const draft = { ...quote.draft, lines: [{ ...quote.draft.lines[0], quantity: 10 }] }
    await sales.agent.put(`/api/v1/quotes/${id}/draft`).set('X-CSRF-Token', sales.csrf).send({ draft, version: quote.version }).expect(200)
    const fresh = await current(id)
    expect(fresh.draftErrors.map((error: { field: string }) => error.field)).toContain('draft.lines.0.quantity')
    const issue = await sales.agent.post(`/api/v1/quotes/${id}/issue`).set('X-CSRF-Token', sales.csrf).send({ version: fresh.version })
    expect(issue.status).toBe(400)
    expect(issue.body.error.fields).toHaveProperty('draft.lines.0.quantity')
  })
})

describe('an issue that fails part-way', () => {
  it('writes no revision and leaves no PDF behind when the transaction fails after the PDF is written', async () => {
    const id = await requestQuote()
    const quote = await current(id)
    const dataDir = path.resolve(ctx.config.DATA_DIR)
    const quotesDir = path.join(dataDir, 'quotes')
    const filesBefore = existsSync(quotesDir) ? readdirSync(quotesDir).sort() : []
    // The same service as the app's, whose outbox write fails: the last step of the transaction.
    const failing = new QuoteService({
      dataSource: ctx.dataSource,
      catalogue: new CatalogueService(ctx.dataSource),
      dataDir,
      publicUrl: 'http://127.0.0.1',
      renderPdf: renderQuotePdf,
      mailer: {
        issued: async () => {
          throw new Error('outbox write failed')
        },
        accepted: async () => undefined,
      },
    })
    const issuer = toSessionUser(await ctx.dataSource.getRepository(User).findOneOrFail({ where: { id: sales.user.id }, relations: { organisation: true } }))
    await expect(failing.issue(issuer, id, quote.version)).rejects.toThrow('outbox write failed')
    const filesAfter = existsSync(quotesDir) ? readdirSync(quotesDir).sort() : []
    expect(filesAfter).toEqual(filesBefore)
    expect(await ctx.dataSource.getRepository(QuoteRevisionRecord).countBy({ quoteId: id })).toBe(0)
    const stored = await current(id)
    expect(stored.state).not.toBe('issued')
    expect(stored.version).toBe(quote.version)
  })
})
