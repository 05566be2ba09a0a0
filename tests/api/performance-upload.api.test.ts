import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { AuditEntry, CatalogueRevision, MotorPerformance, MotorVariant } from '../../server/db/entities'
import { pscCircuit, shadedPoleCurve } from '../../shared/engineering/examples'
import type { PerformancePreview } from '../../shared/contracts/import.contract'
import { insertVariants } from './catalogue-fixtures'
import { anonymousAgent, createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
let admin: SignedInAgent
const prefix = `PU${randomUUID().slice(0, 6).toUpperCase()}`
const shaded = `${prefix}-S230`
const psc = `${prefix}-P230`
/** NIST SP 811 (2008), B.9: 1 ozf in = 7.061552e-3 N m. */
const OZ_IN = 7.061552e-3

beforeAll(async () => {
  ctx = await startTestApp()
  admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin'))
  await insertVariants(ctx.dataSource, prefix, [
    { partNumber: 'S230', type: 'shaded-pole', volts: 230, hz: 50 },
    { partNumber: 'P230', type: 'psc', volts: 230, hz: 50 },
  ])
})
afterAll(async () => {
  await ctx.close()
})

/** The example shaded-pole curve (4 poles, 50 Hz: n_s = 1500 r/min) with torque scaled, in oz-in. */
function curveCsv(scale = 1.1, header = 'rpm,torque_ozin,current_A,input_W'): string {
  const lines = shadedPoleCurve.points.map((p) => [p.rpm, ((p.torqueNm * scale) / OZ_IN).toFixed(4), p.currentA, p.inputW].join(','))
  return `${header}\n${lines.join('\n')}\n`
}

async function previewUpload(text: string, fields: Record<string, string> = {}) {
  const call = admin.agent.post('/api/admin/catalogue/performance').set('X-CSRF-Token', admin.csrf)
  for (const [key, value] of Object.entries({ partNumber: shaded, tap: 'high', volts: '230', hz: '50', ...fields })) call.field(key, value)
  return call.attach('file', Buffer.from(text), 'curve.csv')
}

const commit = (batchId: string) => admin.agent.post(`/api/admin/catalogue/performance/batches/${batchId}/commit`).set('X-CSRF-Token', admin.csrf)

async function currentRows(partNumber: string) {
  const variant = await ctx.dataSource.getRepository(MotorVariant).findOneByOrFail({ partNumber })
  return ctx.dataSource.getRepository(MotorPerformance).find({ where: { variantId: variant.id }, order: { createdAt: 'ASC' } })
}

function messages(body: { error: { fields: Record<string, string> } }): string[] {
  return Object.entries(body.error.fields).map(([key, message]) => `${key}: ${message}`)
}

describe('POST /api/admin/catalogue/performance (preview)', () => {
  it('reads oz-in from the header, converts to N m and samples the new and the current curves, writing nothing', async () => {
    const before = await currentRows(shaded)
    const response = await previewUpload(curveCsv())
    expect(response.status).toBe(201)
    const body: PerformancePreview = response.body
    expect(body.readAs).toBe('curve')
    expect(body.torqueUnit).toBe('oz-in')
    expect(body.synchronousRpm).toBe(1500)
    expect(body.motor.model).toBe('curve')
    if (body.motor.model !== 'curve') return
    expect(body.motor.points).toHaveLength(12)
    expect(body.motor.points[0]?.torqueNm).toBeCloseTo(0.066, 4)
    expect(body.newCurve.length).toBeGreaterThan(20)
    expect(body.newCurve[0]?.torqueNm).toBeCloseTo(0.066, 4)
    expect(body.currentCurve?.[0]?.torqueNm).toBeCloseTo(0.06, 4)
    expect(body.currentPerformanceId).toBe(before[0]?.id)
    expect(await currentRows(shaded)).toEqual(before)
  })

  it('takes the torque unit chosen on upload when the header names none', async () => {
    const withoutUnit = await previewUpload(curveCsv(1, 'rpm,torque,current_A,input_W'))
    expect(withoutUnit.status).toBe(400)
    expect(messages(withoutUnit.body).join('\n')).toContain('names no unit')
    const chosen = await previewUpload(curveCsv(1, 'rpm,torque,current_A,input_W'), { torqueUnit: 'oz-in' })
    expect(chosen.status).toBe(201)
    expect(chosen.body.torqueUnit).toBe('oz-in')
  })

  it('refuses speeds that do not rise from standstill, too few points, and negative current, naming the lines', async () => {
    const unsorted = curveCsv().replace('\n300,', '\n100,')
    const a = await previewUpload(unsorted)
    expect(a.status).toBe(400)
    expect(messages(a.body)).toContain('line 4 (rpm): speed must rise strictly from row to row (100 after 150)')
    const b = await previewUpload('rpm,torque_Nm\n150,0.05\n500,0.05\n1000,0.06\n1500,0\n')
    expect(messages(b.body).join('\n')).toContain('the first point must be at standstill')
    expect(messages(b.body).join('\n')).toContain('at least 6 points')
    const c = await previewUpload(curveCsv().replace(',0.284,', ',-0.284,'))
    expect(messages(c.body)).toContain('line 5 (current_a): current cannot be negative')
  })

  it('refuses a curve that stops short of synchronous speed or keeps torque there (common practice: within 5 % of n_s)', async () => {
    const short = curveCsv().split('\n').slice(0, 11).join('\n')
    const a = await previewUpload(short)
    expect(a.status).toBe(400)
    expect(messages(a.body).join('\n')).toContain('the curve stops at 1350 r/min; carry it to within 5 % of synchronous speed (1425 to 1500 r/min)')
    const torqueAtEnd = curveCsv().replace(/\n1500,[^,]+,/, '\n1500,5.0,')
    const b = await previewUpload(torqueAtEnd)
    expect(messages(b.body).join('\n')).toContain('torque should be about zero near synchronous speed')
    const above = curveCsv().replace('\n1500,', '\n1600,')
    expect(messages((await previewUpload(above)).body).join('\n')).toContain('above synchronous speed (1500 r/min for 4 poles at 50 Hz)')
  })

  it('refuses a tap or a frequency that the variant does not have', async () => {
    const tap = await previewUpload(curveCsv(), { tap: 'turbo' })
    expect(tap.status).toBe(400)
    expect(tap.body.error.fields.tap).toContain('high')
    const hz = await previewUpload(curveCsv(), { hz: '60' })
    expect(hz.body.error.fields.hz).toBe(`${shaded} is rated for 50 Hz`)
  })

  it('reads equivalent-circuit values for a PSC variant and insists on the auxiliary winding', async () => {
    const lines = [
      'parameter,value',
      `r1_ohm,${pscCircuit.r1}`,
      `x1_ohm,${pscCircuit.x1}`,
      `r2_ohm,${pscCircuit.r2}`,
      `x2_ohm,${pscCircuit.x2}`,
      `xm_ohm,${pscCircuit.xm}`,
      `core_loss_w,${pscCircuit.coreLossW ?? 0}`,
      `friction_w,${pscCircuit.frictionW ?? 0}`,
    ]
    const aux = pscCircuit.aux
    if (!aux) throw new Error('the example PSC motor has an auxiliary winding')
    const missing = await previewUpload(lines.join('\n'), { partNumber: psc })
    expect(missing.status).toBe(400)
    expect(messages(missing.body).join('\n')).toContain('a PSC motor needs its auxiliary winding and capacitor')
    const full = [...lines, `aux_r_ohm,${aux.r}`, `aux_x_ohm,${aux.x}`, `aux_turns_ratio,${aux.turnsRatio}`, `capacitor_uf,${aux.capacitorUf}`].join('\n')
    const ok = await previewUpload(full, { partNumber: psc, source: 'fitted' })
    expect(ok.status).toBe(201)
    expect(ok.body.readAs).toBe('circuit')
    expect(ok.body.motor).toMatchObject({ model: 'circuit', poles: 4, ratedHz: 50, r1: pscCircuit.r1, aux: { capacitorUf: aux.capacitorUf } })
    // A running motor near synchronous speed makes little torque: the sampled curve ends near zero.
    const last = ok.body.newCurve[ok.body.newCurve.length - 1]
    expect(Math.abs(last.torqueNm)).toBeLessThan(0.05 * Math.max(...ok.body.newCurve.map((s: { torqueNm: number }) => s.torqueNm)))
  })
})

describe('POST /api/admin/catalogue/performance/batches/:id/commit', () => {
  it('replaces the current data, keeps the old row as history, bumps the revision and audits', async () => {
    const before = await currentRows(shaded)
    const revision = (await ctx.dataSource.getRepository(CatalogueRevision).findOneByOrFail({ id: 1 })).revision
    const preview = await previewUpload(curveCsv(1.2))
    const response = await commit(preview.body.batchId)
    expect(response.status).toBe(200)
    expect(response.body.replacedId).toBe(before.find((row) => row.current)?.id)
    const after = await currentRows(shaded)
    expect(after).toHaveLength(before.length + 1)
    expect(after.filter((row) => row.current).map((row) => row.id)).toEqual([response.body.performanceId])
    expect(after.find((row) => row.id === response.body.replacedId)?.current).toBe(false)
    expect((await ctx.dataSource.getRepository(CatalogueRevision).findOneByOrFail({ id: 1 })).revision).toBe(revision + 1)
    expect(await ctx.dataSource.getRepository(AuditEntry).countBy({ entity: 'performance', entityId: response.body.performanceId, action: 'replace' })).toBe(1)
    const detail = await request(ctx.handle.app).get(`/api/v1/catalogue/variants/${shaded}`)
    expect(detail.body.performance).toHaveLength(1)
    expect(detail.body.performance[0].motor.points[0].torqueNm).toBeCloseTo(0.072, 4)
    expect((await commit(preview.body.batchId)).status).toBe(409)
  })

  it('refuses a preview whose tap was replaced by another upload since (409), writing nothing', async () => {
    const first = await previewUpload(curveCsv(1.3))
    const second = await previewUpload(curveCsv(1.4))
    expect((await commit(first.body.batchId)).status).toBe(200)
    const rows = await currentRows(shaded)
    const stale = await commit(second.body.batchId)
    expect(stale.status).toBe(409)
    expect(stale.body.error.code).toBe('batch_stale')
    expect(await currentRows(shaded)).toEqual(rows)
  })
})

describe('POST /api/v1/fan-curves/parse', () => {
  it('reads an uploaded file for anyone, with units from the header, into SI points', async () => {
    const { agent, csrf } = await anonymousAgent(ctx)
    const text = '# 1550 r/min\nFlow (CFM),Static (in wg),Shaft (W)\n0,0.5,20\n50,0.4,24\n100,0.2,27\n130,0,28\n'
    const response = await agent.post('/api/v1/fan-curves/parse').set('X-CSRF-Token', csrf).field('flow', 'm3/h').attach('file', Buffer.from(text), 'fan.csv')
    expect(response.status).toBe(200)
    expect(response.body.errors).toEqual([])
    expect(response.body.refRpm).toBe(1550)
    expect(response.body.unitsFromHeader).toEqual(['flow', 'pressure', 'power'])
    // NIST SP 811: 1 ft3/min = 4.719474e-4 m3/s; 1 inH2O (conventional) = 249.0889 Pa.
    expect(response.body.points[1].flowM3s).toBeCloseTo(50 * 4.719474e-4, 8)
    expect(response.body.points[0].staticPa).toBeCloseTo(0.5 * 249.0889, 3)
  })

  it('reports bad rows by line and column from JSON text, in the units chosen', async () => {
    const { agent, csrf } = await anonymousAgent(ctx)
    const response = await agent
      .post('/api/v1/fan-curves/parse')
      .set('X-CSRF-Token', csrf)
      .send({ text: '0;120,5;20\n100;abc;25\n90;50;26\n200;0;27', flow: 'm3/h', pressure: 'Pa', power: 'W' })
    expect(response.status).toBe(200)
    expect(response.body.errors).toEqual([
      { line: 2, column: 'pressure', message: 'static pressure "abc" is not a number' },
      { line: 3, column: 'flow', message: 'flow must rise from row to row' },
    ])
    expect(response.body.points).toHaveLength(2)
    expect(response.body.points[0].staticPa).toBe(120.5)
  })

  it('answers 400 when neither a file nor text is sent', async () => {
    const { agent, csrf } = await anonymousAgent(ctx)
    const response = await agent.post('/api/v1/fan-curves/parse').set('X-CSRF-Token', csrf).send({})
    expect(response.status).toBe(400)
    expect(response.body.error.fields.file).toBeDefined()
  })
})
