import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { AuditEntry, CatalogueRevision, ImportBatch, MotorFamily, MotorVariant } from '../../server/db/entities'
import { CATALOGUE_COLUMNS } from '../../server/imports/catalogue-columns'
import { csvOf, variantRow } from './catalogue-csv-fixtures'
import type { ImportPreview } from '../../shared/contracts/import.contract'
import { anonymousAgent, createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
let admin: SignedInAgent
let buyer: SignedInAgent

beforeAll(async () => {
  ctx = await startTestApp()
  admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin'))
  buyer = await signInAs(ctx, await createUser(ctx.dataSource, 'buyer'))
})
afterAll(async () => {
  await ctx.close()
})

function unique(tag: string): string {
  return `${tag}${randomUUID().slice(0, 6).toUpperCase()}`
}

async function preview(text: string, name = 'catalogue.csv'): Promise<{ status: number; body: ImportPreview & { error?: { code: string; message: string; fields?: Record<string, string> } } }> {
  const response = await admin.agent.post('/api/admin/catalogue/import').set('X-CSRF-Token', admin.csrf).attach('file', Buffer.from(text, 'utf8'), name)
  return { status: response.status, body: response.body }
}

async function commit(batchId: string) {
  return admin.agent.post(`/api/admin/catalogue/import/batches/${batchId}/commit`).set('X-CSRF-Token', admin.csrf)
}

async function revision(): Promise<number> {
  return (await ctx.dataSource.getRepository(CatalogueRevision).findOneByOrFail({ id: 1 })).revision
}

async function variantCount(): Promise<number> {
  return ctx.dataSource.getRepository(MotorVariant).count()
}

describe('admin catalogue routes', () => {
  const routes = [
    ['get', '/api/admin/catalogue/import/template.csv'],
    ['post', '/api/admin/catalogue/import'],
    ['get', `/api/admin/catalogue/import/batches/${randomUUID()}`],
    ['post', `/api/admin/catalogue/import/batches/${randomUUID()}/commit`],
    ['post', '/api/admin/catalogue/performance'],
    ['post', `/api/admin/catalogue/performance/batches/${randomUUID()}/commit`],
    ['get', '/api/admin/catalogue/datasheets'],
    ['post', '/api/admin/catalogue/datasheets'],
    ['delete', `/api/admin/catalogue/datasheets/${randomUUID()}`],
  ] as const

  it('refuses buyers with 403 and anonymous visitors with 401 on every admin catalogue route', async () => {
    const anonymous = await anonymousAgent(ctx)
    for (const [method, path] of routes) {
      const asBuyer = await buyer.agent[method](path).set('X-CSRF-Token', buyer.csrf)
      expect(asBuyer.status, `${method} ${path} as buyer`).toBe(403)
      const asNobody = await anonymous.agent[method](path).set('X-CSRF-Token', anonymous.csrf)
      expect(asNobody.status, `${method} ${path} anonymous`).toBe(401)
    }
  })

  it('lists every admin catalogue route in the route table as admin-only', () => {
    const table = ctx.handle.routes.filter((route) => route.path.startsWith('/api/admin/catalogue'))
    expect(table.length).toBe(routes.length)
    expect(table.every((route) => Array.isArray(route.access) && route.access.length === 1 && route.access[0] === 'admin')).toBe(true)
  })
})

describe('GET /api/admin/catalogue/import/template.csv', () => {
  it('downloads the documented header and an example row that previews without errors', async () => {
    const response = await admin.agent.get('/api/admin/catalogue/import/template.csv')
    expect(response.status).toBe(200)
    expect(response.headers['content-type']).toMatch(/^text\/csv/)
    expect(response.headers['content-disposition']).toContain('attachment')
    const lines = response.text.trim().split(/\r?\n/)
    expect(lines[0]?.split(',')).toEqual(CATALOGUE_COLUMNS)
    expect(lines).toHaveLength(2)
    const result = await preview(response.text.replace(/SP84/g, unique('TPL')), 'template.csv')
    expect(result.status).toBe(201)
    expect(result.body.counts.error).toBe(0)
    expect(result.body.fileErrors).toEqual([])
  })
})

describe('POST /api/admin/catalogue/import (preview)', () => {
  it('reports new rows as additions and writes nothing to the catalogue', async () => {
    const family = unique('FA')
    const before = { variants: await variantCount(), revision: await revision() }
    const result = await preview(csvOf([variantRow(family, `${family}-A`), variantRow(family, `${family}-B`)]))
    expect(result.status).toBe(201)
    expect(result.body.counts).toMatchObject({ rows: 2, add: 2, change: 0, unchanged: 0, error: 0, familiesAdded: 1 })
    expect(result.body.committable).toBe(true)
    expect(result.body.rows.map((row) => [row.row, row.partNumber, row.action])).toEqual([
      [2, `${family}-A`, 'add'],
      [3, `${family}-B`, 'add'],
    ])
    expect(result.body.fileSha256).toMatch(/^[0-9a-f]{64}$/)
    expect(await variantCount()).toBe(before.variants)
    expect(await revision()).toBe(before.revision)
    expect(await ctx.dataSource.getRepository(MotorFamily).countBy({ code: family })).toBe(0)
    const batch = await ctx.dataSource.getRepository(ImportBatch).findOneByOrFail({ id: result.body.batchId })
    expect(batch.status).toBe('previewed')
  })

  it('names the missing and the unknown columns of a wrong header', async () => {
    const columns = CATALOGUE_COLUMNS.filter((c) => c !== 'frame_diameter_mm' && c !== 'weight_g').concat(['colour'])
    const result = await preview(csvOf([variantRow(unique('FW'), unique('PW'))], columns))
    expect(result.status).toBe(201)
    expect(result.body.committable).toBe(false)
    expect(result.body.fileErrors).toHaveLength(2)
    expect(result.body.fileErrors[0]).toBe('missing columns: frame_diameter_mm, weight_g')
    expect(result.body.fileErrors[1]).toContain('unknown column: colour')
  })

  it('reports bad numbers with row number, column and reason', async () => {
    const family = unique('FN')
    const result = await preview(
      csvOf([
        variantRow(family, `${family}-1`),
        variantRow(family, `${family}-2`, { rated_output_w: '9,5', poles: 'four' }),
        variantRow(family, `${family}-3`, { frame_diameter_mm: '-84', rated_frequency_hz: '55' }),
      ]),
    )
    expect(result.body.counts).toMatchObject({ add: 1, error: 2 })
    expect(result.body.committable).toBe(false)
    const byRow = new Map(result.body.rows.map((row) => [row.row, row]))
    const second = byRow.get(3)?.errors.map((e) => [e.row, e.column]) ?? []
    expect(second).toEqual(expect.arrayContaining([[3, 'rated_output_w'], [3, 'poles']]))
    expect(byRow.get(3)?.errors.find((e) => e.column === 'rated_output_w')?.message).toContain('"9,5" is not a number')
    const third = byRow.get(4)?.errors ?? []
    expect(third.find((e) => e.column === 'frame_diameter_mm')?.message).toBe('frame diameter must be above 0')
    expect(third.find((e) => e.column === 'rated_frequency_hz')?.message).toBe('rated Hz must be 50 or 60')
  })

  it('refuses a part number given twice in one file, on the later row', async () => {
    const family = unique('FD')
    const result = await preview(csvOf([variantRow(family, `${family}-X`), variantRow(family, `${family}-Y`), variantRow(family, `${family}-X`, { rated_output_w: '10' })]))
    expect(result.body.counts).toMatchObject({ add: 2, error: 1 })
    const error = result.body.rows.find((row) => row.action === 'error')
    expect(error?.row).toBe(4)
    expect(error?.errors[0]).toEqual({ row: 4, column: 'part_number', message: `part number ${family}-X is also on row 2; give each variant one row` })
  })

  it('refuses an unknown family that the file does not describe', async () => {
    const family = unique('FU')
    const result = await preview(csvOf([variantRow(family, `${family}-1`, { family_name: '', family_type: '' })]))
    expect(result.body.counts.error).toBe(1)
    expect(result.body.rows[0]?.errors[0]?.column).toBe('family_code')
    expect(result.body.rows[0]?.errors[0]?.message).toContain(`unknown family ${family}`)
  })

  it('refuses PSC rows without a capacitor and shaded-pole rows with one', async () => {
    const psc = unique('FP')
    const result = await preview(
      csvOf([
        variantRow(psc, `${psc}-1`, { family_type: 'psc' }),
        variantRow(unique('FS'), unique('PS'), { capacitor_uf: '3' }),
      ]),
    )
    expect(result.body.counts.error).toBe(2)
    expect(result.body.rows[0]?.errors.map((e) => e.column)).toEqual(['capacitor_uf', 'capacitor_vac'])
    expect(result.body.rows[1]?.errors.map((e) => e.column)).toEqual(['capacitor_uf'])
  })

  it('previews a 10,000-row file, reporting the one bad row among them', async () => {
    const family = unique('FBIG')
    const rows = Array.from({ length: 10_000 }, (_, i) => variantRow(family, `${family}-${String(i).padStart(5, '0')}`, { rated_output_w: String(5 + (i % 20)) }))
    rows[7_777] = variantRow(family, `${family}-07777`, { rated_input_w: 'lots' })
    const text = csvOf(rows)
    // Its speed is measured by `npm run bench` (documents part), not asserted here.
    const result = await preview(text, 'big.csv')
    expect(result.status).toBe(201)
    expect(result.body.counts).toMatchObject({ rows: 10_000, add: 9_999, error: 1 })
    expect(result.body.rows.find((row) => row.action === 'error')?.row).toBe(7_779)
  }, 60_000)
})

describe('POST /api/admin/catalogue/import/batches/:id/commit', () => {
  it('writes the previewed rows in one go, bumps the revision, audits; a re-import then changes nothing', async () => {
    const family = unique('FC')
    const text = csvOf([variantRow(family, `${family}-A`), variantRow(family, `${family}-B`, { speed_taps: 'high|low' })])
    const first = await preview(text)
    const before = await revision()
    const response = await commit(first.body.batchId)
    expect(response.status).toBe(200)
    expect(response.body).toMatchObject({ added: 2, changed: 0, familiesAdded: 1, catalogueRevision: before + 1 })
    const stored = await ctx.dataSource.getRepository(MotorVariant).findOneOrFail({ where: { partNumber: `${family}-B` }, relations: { family: true } })
    expect(stored.family.code).toBe(family)
    expect(stored.type).toBe('shaded-pole')
    expect(stored.speedTaps).toEqual(['high', 'low'])
    expect(stored.capacitorUf).toBeNull()
    expect(stored.searchText).toContain(`${family}-B`)
    const audit = await ctx.dataSource.getRepository(AuditEntry).findOneByOrFail({ entity: 'catalogue', entityId: first.body.batchId })
    expect(audit.actorId).toBe(admin.user.id)
    expect(audit.detail).toMatchObject({ added: 2, fileSha256: first.body.fileSha256 })

    const again = await commit(first.body.batchId)
    expect(again.status).toBe(409)
    expect(again.body.error.code).toBe('batch_committed')

    const second = await preview(text)
    expect(second.body.counts).toMatchObject({ rows: 2, add: 0, change: 0, unchanged: 2, error: 0, familiesAdded: 0, familiesChanged: 0 })
    expect(second.body.unchangedPartNumbers).toEqual([`${family}-A`, `${family}-B`])
    expect(second.body.committable).toBe(false)
  })

  it('shows changes field by field (old -> new) and applies them', async () => {
    const family = unique('FX')
    await commit((await preview(csvOf([variantRow(family, `${family}-A`), variantRow(family, `${family}-B`)]))).body.batchId)
    const changed = await preview(csvOf([variantRow(family, `${family}-A`, { rated_output_w: '11', lifecycle: 'not-for-new-designs', family_name: 'Renamed family' }), variantRow(family, `${family}-B`, { family_name: '' })]))
    expect(changed.body.counts).toMatchObject({ change: 1, unchanged: 1, familiesChanged: 1 })
    expect(changed.body.rows[0]?.changes).toEqual([
      { column: 'rated_output_w', from: '9', to: '11' },
      { column: 'lifecycle', from: 'active', to: 'not-for-new-designs' },
    ])
    expect(changed.body.families).toEqual([{ code: family, action: 'change', changes: [{ column: 'family_name', from: `Test family ${family}`, to: 'Renamed family' }] }])
    expect((await commit(changed.body.batchId)).status).toBe(200)
    const a = await ctx.dataSource.getRepository(MotorVariant).findOneByOrFail({ partNumber: `${family}-A` })
    expect(a.ratedOutputW).toBe(11)
    expect(a.version).toBe(2)
    const b = await ctx.dataSource.getRepository(MotorVariant).findOneByOrFail({ partNumber: `${family}-B` })
    // The family's new name reaches the search text of every variant, also the unchanged one.
    expect(b.searchText).toContain('RENAMED FAMILY')
  })

  it('refuses a stale batch with 409 when the catalogue changed since the preview, writing nothing', async () => {
    const family = unique('FT')
    const stale = await preview(csvOf([variantRow(family, `${family}-1`)]))
    await ctx.dataSource.transaction((manager) => manager.increment(CatalogueRevision, { id: 1 }, 'revision', 1))
    const response = await commit(stale.body.batchId)
    expect(response.status).toBe(409)
    expect(response.body.error.code).toBe('batch_stale')
    expect(await ctx.dataSource.getRepository(MotorVariant).countBy({ partNumber: `${family}-1` })).toBe(0)
  })

  it('refuses a batch with row errors (nothing written)', async () => {
    const family = unique('FE')
    const bad = await preview(csvOf([variantRow(family, `${family}-1`), variantRow(family, `${family}-2`, { weight_g: 'heavy' })]))
    const response = await commit(bad.body.batchId)
    expect(response.status).toBe(422)
    expect(await ctx.dataSource.getRepository(MotorFamily).countBy({ code: family })).toBe(0)
  })

  it('leaves the catalogue as it was when the database fails in the middle of the commit', async () => {
    const family = unique('FF')
    await commit((await preview(csvOf([variantRow(family, `${family}-OLD`)]))).body.batchId)
    const newFamily = unique('FG')
    const failing = `${newFamily}-BOOM`
    const text = csvOf([
      variantRow(family, `${family}-OLD`, { rated_output_w: '12' }),
      variantRow(newFamily, `${newFamily}-OK`),
      variantRow(newFamily, failing),
    ])
    const batch = await preview(text)
    expect(batch.body.committable).toBe(true)
    const before = { variants: await variantCount(), families: await ctx.dataSource.getRepository(MotorFamily).count(), revision: await revision() }
    // A real database error part-way: a trigger refuses one of the inserted variants.
    await ctx.dataSource.query('DROP TRIGGER IF EXISTS import_test_fail')
    await ctx.dataSource.query(`CREATE TRIGGER import_test_fail BEFORE INSERT ON motor_variant FOR EACH ROW BEGIN IF NEW.partNumber = '${failing}' THEN SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'simulated failure'; END IF; END`)
    try {
      const response = await commit(batch.body.batchId)
      expect(response.status).toBe(500)
    } finally {
      await ctx.dataSource.query('DROP TRIGGER IF EXISTS import_test_fail')
    }
    expect(await variantCount()).toBe(before.variants)
    expect(await ctx.dataSource.getRepository(MotorFamily).count()).toBe(before.families)
    expect(await revision()).toBe(before.revision)
    expect((await ctx.dataSource.getRepository(MotorVariant).findOneByOrFail({ partNumber: `${family}-OLD` })).ratedOutputW).toBe(9)
    expect((await ctx.dataSource.getRepository(ImportBatch).findOneByOrFail({ id: batch.body.batchId })).status).toBe('previewed')
    // The same batch commits once the fault is gone.
    const retry = await commit(batch.body.batchId)
    expect(retry.status).toBe(200)
    expect(retry.body).toMatchObject({ added: 2, changed: 1, familiesAdded: 1 })
  })
})
