import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { bumpCatalogueRevision, CatalogueService, REVISION_TTL_MS } from '../../server/services/catalogue.service'
import { MotorPerformance, MotorVariant } from '../../server/db/entities'
import { catalogueSource } from '../../shared/selection/run-selection'
import type { InsulationClassCode } from '../../shared/contracts/catalogue.contract'
import { insertVariants } from './catalogue-fixtures'
import { startTestApp, type TestContext } from './support'

let ctx: TestContext
const prefix = `CT${randomUUID().slice(0, 6).toUpperCase()}`

beforeAll(async () => {
  ctx = await startTestApp()
  await insertVariants(ctx.dataSource, prefix, [
    { partNumber: 'P230', type: 'psc', volts: 230, hz: 50, outputW: 40 },
    { partNumber: 'P120', type: 'psc', volts: 120, hz: 60, outputW: 60, frameDiameterMm: 140 },
    { partNumber: 'S230', type: 'shaded-pole', volts: 230, hz: 50, outputW: 8 },
    { partNumber: 'S230OLD', type: 'shaded-pole', volts: 230, hz: 50, outputW: 6, lifecycle: 'discontinued' },
  ])
})
afterAll(async () => {
  await ctx.close()
})

const list = (query: Record<string, string>) => request(ctx.handle.app).get('/api/v1/catalogue/variants').query({ search: prefix, ...query })

describe('GET /api/v1/catalogue/variants', () => {
  it('is open to anonymous visitors and finds variants by part-number fragment', async () => {
    const response = await list({})
    expect(response.status).toBe(200)
    expect(response.body.total).toBe(4)
    expect(response.body.items.every((row: { partNumber: string }) => row.partNumber.startsWith(prefix))).toBe(true)
  })

  it('filters by type and supply together', async () => {
    const response = await list({ type: 'psc', supply: '230-50' })
    expect(response.body.items.map((row: { partNumber: string }) => row.partNumber)).toEqual([`${prefix}-P230`])
  })

  it('filters by output range, frame and lifecycle', async () => {
    expect((await list({ minOutputW: '7', maxOutputW: '50' })).body.total).toBe(2)
    expect((await list({ maxFrameMm: '130' })).body.total).toBe(3)
    const old = await list({ lifecycle: 'discontinued' })
    expect(old.body.items.map((row: { partNumber: string }) => row.partNumber)).toEqual([`${prefix}-S230OLD`])
  })

  it('sorts on the server and pages', async () => {
    const sorted = await list({ sort: 'ratedOutputW', order: 'desc' })
    expect(sorted.body.items.map((row: { ratedOutputW: number }) => row.ratedOutputW)).toEqual([60, 40, 8, 6])
    const second = await list({ sort: 'ratedOutputW', order: 'desc', page: '2', pageSize: '1' })
    expect(second.body.items).toHaveLength(1)
    expect(second.body.items[0].ratedOutputW).toBe(40)
    expect(second.body.total).toBe(4)
  })

  it('answers 400 naming the query field for a bad filter', async () => {
    const response = await list({ supply: '230V', pageSize: '0', sort: 'price' })
    expect(response.status).toBe(400)
    expect(Object.keys(response.body.error.fields).sort()).toEqual(['query.pageSize', 'query.sort', 'query.supply.0'])
  })

  it('treats SQL-looking search text as text', async () => {
    const response = await request(ctx.handle.app).get('/api/v1/catalogue/variants').query({ search: "' OR 1=1 --" })
    expect(response.status).toBe(200)
    expect(response.body.total).toBe(0)
  })
})

describe('GET /api/v1/catalogue/variants/:partNumber', () => {
  it('returns specifications and performance data', async () => {
    const response = await request(ctx.handle.app).get(`/api/v1/catalogue/variants/${prefix}-P230`)
    expect(response.status).toBe(200)
    expect(response.body).toMatchObject({ partNumber: `${prefix}-P230`, type: 'psc', capacitorUf: 3, rotation: 'ccw', rotationViewedFrom: 'shaft-end' })
    expect(response.body.performance).toHaveLength(1)
    expect(response.body.performance[0].motor.model).toBe('circuit')
  })

  it('answers 404 for an unknown part number and 400 for a malformed one', async () => {
    expect((await request(ctx.handle.app).get('/api/v1/catalogue/variants/NOPE-123')).status).toBe(404)
    expect((await request(ctx.handle.app).get('/api/v1/catalogue/variants/bad%20part')).status).toBe(400)
  })
})

describe('GET /api/v1/catalogue/facets', () => {
  it('lists the supplies with counts', async () => {
    const response = await request(ctx.handle.app).get('/api/v1/catalogue/facets')
    expect(response.status).toBe(200)
    const supply = response.body.supplies.find((item: { volts: number; hz: number }) => item.volts === 230 && item.hz === 50)
    expect(supply.count).toBeGreaterThanOrEqual(3)
  })
})

describe('catalogue answers cached per revision', () => {
  // A change written by another app process (here: plain SQL, which this process does not see
  // as its own bump) shows once the revision is read again, at most REVISION_TTL_MS later.
  it('serves a change made elsewhere within the revision time-to-live, and at once after a change here', async () => {
    const part = `${prefix}-P230`
    const detail = () => request(ctx.handle.app).get(`/api/v1/catalogue/variants/${part}`)
    const before = await detail()
    expect(before.status).toBe(200)
    const renamed = `Renamed elsewhere ${randomUUID().slice(0, 6)}`
    await ctx.dataSource.query('UPDATE motor_variant SET name = ? WHERE partNumber = ?', [renamed, part])
    await ctx.dataSource.query('UPDATE catalogue_revision SET revision = revision + 1 WHERE id = 1')
    await new Promise((resolve) => setTimeout(resolve, REVISION_TTL_MS + 50))
    expect((await detail()).body.name).toBe(renamed)
    expect((await list({})).body.items.find((row: { partNumber: string }) => row.partNumber === part)?.name).toBe(renamed)

    const local = `Renamed here ${randomUUID().slice(0, 6)}`
    await ctx.dataSource.transaction(async (manager) => {
      await manager.query('UPDATE motor_variant SET name = ? WHERE partNumber = ?', [local, part])
      await bumpCatalogueRevision(manager)
    })
    expect((await detail()).body.name).toBe(local)
  })
})

describe('the catalogue as the solver loads it', () => {
  // load() reads two plain queries; the entities are the reference for what each field holds.
  it('holds every variant and current performance row with the same values as the entities', async () => {
    const catalogue = new CatalogueService(ctx.dataSource)
    const { sources } = await catalogue.catalogueSources()
    const variants = await ctx.dataSource.getRepository(MotorVariant).find({ order: { partNumber: 'ASC' } })
    const rows = await ctx.dataSource.getRepository(MotorPerformance).find({ where: { current: true } })
    // Field for field what catalogueSource() makes of each entity (the code before the plain queries).
    const fromEntities = variants.map((variant) => catalogueSource(variant.id, variant, variant.type, variant.insulationClass as InsulationClassCode))
    expect(sources.map((source) => ({ ...source, performance: [] }))).toEqual(fromEntities)
    expect(sources.some((source) => source.partNumber === `${prefix}-P120` && source.frameDiameterMm === 140)).toBe(true)
    expect(sources.every((source) => typeof source.otherRotationAvailable === 'boolean')).toBe(true)
    for (const item of sources) {
      const expected = rows
        .filter((row) => row.variantId === item.variantId)
        .map((row) => ({ id: row.id, tap: row.tap, volts: row.volts, hz: row.hz, referenceTempC: row.referenceTempC, motor: row.motor }))
        .sort((a, b) => a.id.localeCompare(b.id))
      expect([...item.performance].sort((a, b) => a.id.localeCompare(b.id))).toEqual(expected)
    }
  })
})
