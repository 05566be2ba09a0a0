// Many sales engineers issuing at once: every quote gets its own number, none is lost.
import { randomUUID } from 'node:crypto'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { QuoteService } from '../../server/services/quote.service'
import { QuoteRevisionRecord } from '../../server/db/entities'
import { toSessionUser } from '../../server/services/user.service'
import { User } from '../../server/db/entities'
import { insertVariants } from './catalogue-fixtures'
import { assignAccount, priceListFor } from './quote-fixtures'
import { createOrganisation, createUser, startTestApp, type TestContext } from './support'

let ctx: TestContext
const prefix = `CC${randomUUID().slice(0, 6).toUpperCase()}`

beforeAll(async () => {
  ctx = await startTestApp({ DATA_DIR: path.resolve(`.data/test-concurrency-${process.pid}`) })
  await insertVariants(ctx.dataSource, prefix, [{ partNumber: 'PSC', type: 'psc', volts: 230, hz: 50 }])
})
afterAll(async () => {
  await ctx.close()
})

async function sessionUser(id: string) {
  return toSessionUser(await ctx.dataSource.getRepository(User).findOneOrFail({ where: { id }, relations: { organisation: true } }))
}

describe('50 quotes issued at the same moment', () => {
  it('get 50 distinct, gap-free numbers', async () => {
    const list = await priceListFor(ctx.dataSource, prefix)
    const org = await createOrganisation(ctx.dataSource, 'customer', 'distributor')
    const salesRow = await createUser(ctx.dataSource, 'sales')
    await assignAccount(ctx.dataSource, org.id, list.id, salesRow)
    const buyer = await sessionUser((await createUser(ctx.dataSource, 'buyer', org)).id)
    const sales = await sessionUser(salesRow.id)
    // The PDF and the mail are not what this test is about: a minimal document and no mail.
    const quotes = new QuoteService({
      dataSource: ctx.dataSource,
      catalogue: ctx.handle.services.catalogue,
      dataDir: ctx.config.DATA_DIR,
      publicUrl: 'http://127.0.0.1',
      renderPdf: async (doc) => Buffer.from(`%PDF-1.4\n% ${doc.number}${doc.revision}\n%%EOF\n`),
      mailer: { issued: async () => undefined, accepted: async () => undefined },
    })
    const requested = []
    for (let index = 0; index < 50; index += 1) {
      requested.push(await quotes.request(buyer, { partNumber: `${prefix}-PSC`, quantityPerYear: 500 + index, lotSize: 100, note: '' }))
    }
    const issued = await Promise.allSettled(requested.map((quote) => quotes.issue(sales, quote.id, quote.version)))
    const failures = issued.filter((result) => result.status === 'rejected')
    expect(failures).toEqual([])
    const numbers = issued.map((result) => (result.status === 'fulfilled' ? result.value.number : null))
    expect(new Set(numbers).size).toBe(50)
    const sequences = numbers.map((number) => Number(number?.slice(-5))).sort((a, b) => a - b)
    const first = sequences[0] ?? 0
    expect(sequences).toEqual(Array.from({ length: 50 }, (_value, index) => first + index))
    expect(await ctx.dataSource.getRepository(QuoteRevisionRecord).countBy({ fullNumber: numbers.map((number) => `${number}A`)[0] })).toBe(1)
  }, 180_000)
})
