import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { AccountTerms, AuditEntry, CopperIndexRecord, PriceListEntryRecord, PriceListRecord } from '../../server/db/entities'
import { insertVariants } from './catalogue-fixtures'
import { priceListFor } from './quote-fixtures'
import { createOrganisation, createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

// Invented prices in US cents; the pricing rules themselves are tested in shared/pricing.
const TODAY = '2026-12-01'
const prefix = `AP${randomUUID().slice(0, 6).toUpperCase()}`
let ctx: TestContext
let admin: SignedInAgent
let second: SignedInAgent
let list: PriceListRecord

beforeAll(async () => {
  ctx = await startTestApp()
  // A fixed "today" keeps the copper-index date rules repeatable.
  ctx.handle.close()
  const { createApp } = await import('../../server/app')
  ctx.handle = createApp({ config: ctx.config, dataSource: ctx.dataSource, today: () => TODAY, log: (error) => console.error('[app error]', error) })
  await insertVariants(ctx.dataSource, prefix, [
    { partNumber: 'A', type: 'psc', volts: 230, hz: 50 },
    { partNumber: 'B', type: 'psc', volts: 230, hz: 50 },
    { partNumber: 'C', type: 'shaded-pole', volts: 120, hz: 60 },
  ])
  list = await priceListFor(ctx.dataSource, prefix)
  const maker = await createOrganisation(ctx.dataSource, 'maker')
  admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin', maker))
  second = await signInAs(ctx, await createUser(ctx.dataSource, 'admin', maker))
})
afterAll(async () => {
  await ctx.close()
})

async function fresh(): Promise<PriceListRecord> {
  return ctx.dataSource.getRepository(PriceListRecord).findOneByOrFail({ id: list.id })
}

function header(record: PriceListRecord, changes: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    name: record.name,
    validFrom: record.validFrom,
    validTo: record.validTo,
    baseCopperIndexPerKg: record.baseCopperIndexPerKg,
    copperCreditBelowBase: record.copperCreditBelowBase,
    tierDiscountBp: record.tierDiscountBp,
    version: record.version,
    ...changes,
  }
}

describe('GET /api/admin/price-lists and entries', () => {
  it('lists the price list with its counts and pages its entries on the server by part number', async () => {
    const lists = await admin.agent.get('/api/admin/price-lists').query({ search: list.code }).expect(200)
    expect(lists.body.items).toHaveLength(1)
    expect(lists.body.items[0]).toMatchObject({ code: list.code, entryCount: 3, accountCount: 0, version: 1 })
    const page = await admin.agent.get(`/api/admin/price-lists/${list.id}/entries`).query({ pageSize: 2, page: 2 }).expect(200)
    expect(page.body.total).toBe(3)
    expect(page.body.items.map((entry: { partNumber: string }) => entry.partNumber)).toEqual([`${prefix}-C`])
    const search = await admin.agent.get(`/api/admin/price-lists/${list.id}/entries`).query({ search: `${prefix}-B` }).expect(200)
    expect(search.body.total).toBe(1)
    expect(search.body.items[0]).toMatchObject({ unitPrice: 2500, moq: 100, leadTimeDays: 42, breaks: [{ minQuantity: 500, unitPrice: 2350 }, { minQuantity: 2000, unitPrice: 2200 }] })
  })
})

describe('PUT /api/admin/price-lists/:id', () => {
  it('of two admins editing one version, one succeeds and the other gets 409; the winner is audited', async () => {
    const loaded = await fresh()
    const [a, b] = await Promise.all([
      admin.agent.put(`/api/admin/price-lists/${list.id}`).set('X-CSRF-Token', admin.csrf).send(header(loaded, { tierDiscountBp: { oem: 900, distributor: 1500 } })),
      second.agent.put(`/api/admin/price-lists/${list.id}`).set('X-CSRF-Token', second.csrf).send(header(loaded, { baseCopperIndexPerKg: 950 })),
    ])
    expect([a.status, b.status].sort()).toEqual([200, 409])
    const loser = a.status === 409 ? a : b
    expect(loser.body.error.code).toBe('stale_version')
    const after = await fresh()
    expect(after.version).toBe(loaded.version + 1)
    const winnerChangedTier = a.status === 200
    expect(after.tierDiscountBp.oem).toBe(winnerChangedTier ? 900 : 800)
    expect(after.baseCopperIndexPerKg).toBe(winnerChangedTier ? 900 : 950)
    const audits = await ctx.dataSource.getRepository(AuditEntry).findBy({ entity: 'price_list', entityId: list.id, action: 'updated' })
    expect(audits).toHaveLength(1)
    expect(audits[0]?.actorId).toBe(winnerChangedTier ? admin.user.id : second.user.id)
    expect(audits[0]?.detail).toHaveProperty(winnerChangedTier ? 'changes.tierDiscountBp.before.oem' : 'changes.baseCopperIndexPerKg.before', winnerChangedTier ? 800 : 900)
  })

  it('refuses an end date before the start and a discount over 100 %, naming the fields', async () => {
    const loaded = await fresh()
    const response = await admin.agent
      .put(`/api/admin/price-lists/${list.id}`)
      .set('X-CSRF-Token', admin.csrf)
      .send(header(loaded, { validFrom: '2027-01-01', validTo: '2026-06-30', tierDiscountBp: { oem: 12_000, distributor: 0 } }))
    expect(response.status).toBe(400)
    expect(response.body.error.fields).toHaveProperty(['tierDiscountBp.oem'])
    const dates = await admin.agent.put(`/api/admin/price-lists/${list.id}`).set('X-CSRF-Token', admin.csrf).send(header(loaded, { validFrom: '2027-01-01', validTo: '2026-06-30' }))
    expect(dates.status).toBe(400)
    expect(dates.body.error.fields.validTo).toMatch(/before/)
    expect((await fresh()).version).toBe(loaded.version)
  })
})

describe('PUT /api/admin/price-lists/:id/entries/:entryId', () => {
  it('saves price, breaks, MOQ and lead time under the list version, and a stale version gets 409', async () => {
    const loaded = await fresh()
    const entry = await ctx.dataSource.getRepository(PriceListEntryRecord).findOneByOrFail({ priceListId: list.id })
    const body = { unitPrice: 2600, breaks: [{ minQuantity: 1000, unitPrice: 2400 }], moq: 250, leadTimeDays: 35, version: loaded.version }
    const saved = await admin.agent.put(`/api/admin/price-lists/${list.id}/entries/${entry.id}`).set('X-CSRF-Token', admin.csrf).send(body).expect(200)
    expect(saved.body.version).toBe(loaded.version + 1)
    expect(saved.body.entry).toMatchObject({ unitPrice: 2600, moq: 250, leadTimeDays: 35 })
    const stored = await ctx.dataSource.getRepository(PriceListEntryRecord).findOneByOrFail({ id: entry.id })
    expect(stored).toMatchObject({ unitPrice: 2600, breaks: [{ minQuantity: 1000, unitPrice: 2400 }], moq: 250 })
    const stale = await second.agent.put(`/api/admin/price-lists/${list.id}/entries/${entry.id}`).set('X-CSRF-Token', second.csrf).send({ ...body, unitPrice: 2700 })
    expect(stale.status).toBe(409)
    expect((await ctx.dataSource.getRepository(PriceListEntryRecord).findOneByOrFail({ id: entry.id })).unitPrice).toBe(2600)
    const audit = await ctx.dataSource.getRepository(AuditEntry).findOneByOrFail({ entityId: list.id, action: 'entry-updated' })
    expect(audit.detail).toMatchObject({ changes: { unitPrice: { before: 2500, after: 2600 }, moq: { before: 100, after: 250 } } })
  })

  it('refuses a break that raises the price, with the break named', async () => {
    const loaded = await fresh()
    const entry = await ctx.dataSource.getRepository(PriceListEntryRecord).findOneByOrFail({ priceListId: list.id })
    const response = await admin.agent
      .put(`/api/admin/price-lists/${list.id}/entries/${entry.id}`)
      .set('X-CSRF-Token', admin.csrf)
      .send({ unitPrice: 2000, breaks: [{ minQuantity: 500, unitPrice: 2100 }], moq: 0, leadTimeDays: 10, version: loaded.version })
    expect(response.status).toBe(400)
    expect(response.body.error.fields).toHaveProperty('moq')
    const raising = await admin.agent
      .put(`/api/admin/price-lists/${list.id}/entries/${entry.id}`)
      .set('X-CSRF-Token', admin.csrf)
      .send({ unitPrice: 2000, breaks: [{ minQuantity: 500, unitPrice: 2100 }], moq: 1, leadTimeDays: 10, version: loaded.version })
    expect(raising.status).toBe(400)
    expect(raising.body.error.fields['breaks.0.unitPrice']).toMatch(/raise/)
  })
})

describe('POST /api/admin/price-lists/:id/copy', () => {
  it('copies header and every entry under a new code and validity; a taken code is 409', async () => {
    const code = `${prefix}-NEXT`
    const response = await admin.agent
      .post(`/api/admin/price-lists/${list.id}/copy`)
      .set('X-CSRF-Token', admin.csrf)
      .send({ code, name: 'Next year', validFrom: '2028-01-01', validTo: '2028-12-31' })
      .expect(201)
    expect(response.body).toMatchObject({ code, validFrom: '2028-01-01', validTo: '2028-12-31', entryCount: 3, version: 1 })
    const copied = await ctx.dataSource.getRepository(PriceListEntryRecord).findBy({ priceListId: response.body.id })
    const source = await ctx.dataSource.getRepository(PriceListEntryRecord).findBy({ priceListId: list.id })
    const key = (entry: PriceListEntryRecord) => `${entry.variantId}:${entry.unitPrice}:${JSON.stringify(entry.breaks)}:${entry.moq}`
    expect(copied.map(key).sort()).toEqual(source.map(key).sort())
    expect(await ctx.dataSource.getRepository(AuditEntry).existsBy({ entityId: response.body.id, action: 'copied' })).toBe(true)
    const again = await admin.agent.post(`/api/admin/price-lists/${list.id}/copy`).set('X-CSRF-Token', admin.csrf).send({ code, name: 'Again', validFrom: '2028-01-01', validTo: null })
    expect(again.status).toBe(409)
    expect(again.body.error.fields).toHaveProperty('code')
  })
})

describe('copper index', () => {
  const currency = 'GBP'

  it('adds values with effective dates, keeps the history and reports the value in force', async () => {
    const first = await admin.agent.post('/api/admin/copper-index').set('X-CSRF-Token', admin.csrf).send({ currency, valuePerKg: 810, effectiveFrom: TODAY }).expect(201)
    expect(first.body.current).toMatchObject({ valuePerKg: 810, effectiveFrom: TODAY, createdBy: admin.user.email })
    const later = await admin.agent.post('/api/admin/copper-index').set('X-CSRF-Token', admin.csrf).send({ currency, valuePerKg: 845, effectiveFrom: '2027-01-01' }).expect(201)
    expect(later.body.history.map((value: { valuePerKg: number }) => value.valuePerKg)).toEqual([845, 810])
    // Not yet in force: today's value is still the current one.
    expect(later.body.current.valuePerKg).toBe(810)
    expect(await ctx.dataSource.getRepository(CopperIndexRecord).countBy({ currency })).toBe(2)
    const audit = await ctx.dataSource.getRepository(AuditEntry).findOneOrFail({ where: { entity: 'copper_index', action: 'value-added' }, order: { id: 'DESC' } })
    expect(audit.detail).toMatchObject({ currency, valuePerKg: { before: 810, after: 845 } })
  })

  it('never edits history: a second value on the same date is 409 and a backdated one 400', async () => {
    const same = await admin.agent.post('/api/admin/copper-index').set('X-CSRF-Token', admin.csrf).send({ currency, valuePerKg: 999, effectiveFrom: TODAY })
    expect(same.status).toBe(409)
    const past = await admin.agent.post('/api/admin/copper-index').set('X-CSRF-Token', admin.csrf).send({ currency, valuePerKg: 999, effectiveFrom: '2026-11-30' })
    expect(past.status).toBe(400)
    expect(past.body.error.fields.effectiveFrom).toMatch(/past/)
    const bad = await admin.agent.post('/api/admin/copper-index').set('X-CSRF-Token', admin.csrf).send({ currency: 'XXX', valuePerKg: 1.5, effectiveFrom: 'soon' })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['currency', 'effectiveFrom', 'valuePerKg'])
    const history = await admin.agent.get('/api/admin/copper-index').query({ currency }).expect(200)
    expect(history.body.history.map((value: { valuePerKg: number }) => value.valuePerKg)).toEqual([845, 810])
  })
})

describe('organisations', () => {
  it('creates a customer with terms, edits it under its version (stale 409) and refuses a list in another currency', async () => {
    const sales = await createUser(ctx.dataSource, 'sales', await createOrganisation(ctx.dataSource, 'maker'))
    const name = `Brackwater Fans ${randomUUID().slice(0, 6)}`
    const created = await admin.agent
      .post('/api/admin/organisations')
      .set('X-CSRF-Token', admin.csrf)
      .send({ name, tier: 'distributor', currency: 'USD', priceListId: list.id, salesEngineerId: sales.id, overrides: [{ partNumber: `${prefix}-A`, discountBp: 1200 }, { discountBp: 500 }] })
      .expect(201)
    expect(created.body).toMatchObject({ name, kind: 'customer', tier: 'distributor', priceList: { id: list.id }, salesEngineer: { id: sales.id }, version: 1 })
    expect(created.body.overrides).toEqual(expect.arrayContaining([expect.objectContaining({ partNumber: `${prefix}-A`, discountBp: 1200 }), { variantId: null, partNumber: null, discountBp: 500 }]))
    const terms = await ctx.dataSource.getRepository(AccountTerms).findOneByOrFail({ organisationId: created.body.id })
    expect(terms.salesEngineerId).toBe(sales.id)

    const body = { name, tier: 'oem', currency: 'USD', priceListId: list.id, salesEngineerId: null, overrides: [], version: 1 }
    const edited = await admin.agent.put(`/api/admin/organisations/${created.body.id}`).set('X-CSRF-Token', admin.csrf).send(body).expect(200)
    expect(edited.body).toMatchObject({ tier: 'oem', salesEngineer: null, overrides: [], version: 2 })
    const stale = await second.agent.put(`/api/admin/organisations/${created.body.id}`).set('X-CSRF-Token', second.csrf).send({ ...body, tier: 'distributor' })
    expect(stale.status).toBe(409)
    const audit = await ctx.dataSource.getRepository(AuditEntry).findOneByOrFail({ entityId: created.body.id, action: 'updated' })
    expect(audit.detail).toMatchObject({ changes: { tier: { before: 'distributor', after: 'oem' }, salesEngineerId: { before: sales.id, after: null } } })

    const euro = await admin.agent.put(`/api/admin/organisations/${created.body.id}`).set('X-CSRF-Token', admin.csrf).send({ ...body, currency: 'EUR', version: 2 })
    expect(euro.status).toBe(400)
    expect(euro.body.error.fields.priceListId).toMatch(/USD/)
    const duplicate = await admin.agent.post('/api/admin/organisations').set('X-CSRF-Token', admin.csrf).send({ ...body, version: undefined })
    expect(duplicate.status).toBe(409)
    expect(duplicate.body.error.fields).toHaveProperty('name')
    const unknownPart = await admin.agent
      .post('/api/admin/organisations')
      .set('X-CSRF-Token', admin.csrf)
      .send({ name: `${name} 2`, tier: 'oem', currency: 'USD', priceListId: list.id, salesEngineerId: null, overrides: [{ partNumber: 'NO-SUCH-MOTOR', discountBp: 100 }] })
    expect(unknownPart.status).toBe(400)
    expect(unknownPart.body.error.fields['overrides.0.partNumber']).toMatch(/NO-SUCH-MOTOR/)
  })
})
