import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { pscCircuit } from '../../shared/engineering/examples'
import { DutyStudy, MotorVariant, StudyRun } from '../../server/db/entities'
import { bumpCatalogueRevision } from '../../server/services/catalogue.service'
import { blowerStudy, insertVariants, lowerTap } from './catalogue-fixtures'
import { anonymousAgent, createOrganisation, createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
const prefix = `ST${randomUUID().slice(0, 6).toUpperCase()}`
let buyer: SignedInAgent
let colleague: SignedInAgent
let outsider: SignedInAgent
let sales: SignedInAgent
let visitor: { agent: ReturnType<typeof request.agent>; csrf: string }

beforeAll(async () => {
  ctx = await startTestApp()
  await insertVariants(ctx.dataSource, prefix, [
    { partNumber: 'PSC', type: 'psc', volts: 230, hz: 50, taps: [{ tap: 'high', motor: pscCircuit }, { tap: 'low', motor: lowerTap(pscCircuit, 1.6) }] },
    { partNumber: 'SP', type: 'shaded-pole', volts: 230, hz: 50 },
    { partNumber: 'SPOLD', type: 'shaded-pole', volts: 230, hz: 50, lifecycle: 'discontinued' },
    { partNumber: 'P120', type: 'psc', volts: 120, hz: 60 },
    { partNumber: 'PSCA', type: 'psc', volts: 230, hz: 50, insulationClass: 'A' },
  ])
  const org = await createOrganisation(ctx.dataSource)
  buyer = await signInAs(ctx, await createUser(ctx.dataSource, 'buyer', org))
  colleague = await signInAs(ctx, await createUser(ctx.dataSource, 'buyer', org))
  outsider = await signInAs(ctx, await createUser(ctx.dataSource, 'buyer'))
  sales = await signInAs(ctx, await createUser(ctx.dataSource, 'sales'))
  visitor = await anonymousAgent(ctx)
})

const preview = (body: object) => visitor.agent.post('/api/v1/studies/preview-run').set('X-CSRF-Token', visitor.csrf).send(body)
afterAll(async () => {
  await ctx.close()
})

type Row = { partNumber: string; tap: string; meetsDuty: boolean; rank: number; warnings: { code: string }[]; nominal: { flowM3s: number; status: string } }
const ours = (candidates: Row[]) => candidates.filter((candidate) => candidate.partNumber.startsWith(prefix))

describe('POST /api/v1/studies/preview-run', () => {
  it('answers the same through the worker pool as in the app’s own thread', async () => {
    // The pool normally takes catalogues of 10,000 variants and more; here it takes every run.
    // A failing pool falls back to the app's thread and logs why: nothing may be logged here.
    const logged: unknown[] = []
    const pooled = await startTestApp({ SELECTION_WORKERS: '2', SELECTION_POOL_MIN_VARIANTS: '0' }, (error) => logged.push(error))
    try {
      const other = await anonymousAgent(pooled)
      const viaPool = await other.agent.post('/api/v1/studies/preview-run').set('X-CSRF-Token', other.csrf).send({ input: blowerStudy() })
      const here = await preview({ input: blowerStudy() })
      expect(viaPool.status, JSON.stringify(viaPool.body).slice(0, 300)).toBe(200)
      expect(ours(viaPool.body.candidates).length).toBeGreaterThan(0)
      const strip = (body: { ranAt: string; durationMs: number }) => ({ ...body, ranAt: '', durationMs: 0 })
      expect(strip(viaPool.body)).toEqual(strip(here.body))
      expect(logged).toEqual([])
    } finally {
      await pooled.close()
    }
  })

  it('sends the answer gzip-compressed to a client that accepts it, and plain to one that does not', async () => {
    const plain = await preview({ input: blowerStudy() }).set('Accept-Encoding', 'identity')
    expect(plain.status).toBe(200)
    expect(plain.headers['content-encoding']).toBeUndefined()
    const packed = await preview({ input: blowerStudy() }).set('Accept-Encoding', 'gzip')
    expect(packed.status).toBe(200)
    expect(packed.headers['content-encoding']).toBe('gzip')
    // The same answer once unpacked (supertest inflates it), apart from the run's own time stamp.
    const strip = (body: { ranAt: string; durationMs: number }) => ({ ...body, ranAt: '', durationMs: 0 })
    expect(strip(packed.body)).toEqual(strip(plain.body))
  })

  it('solves every matching candidate for an anonymous visitor and ranks those meeting the duty first', async () => {
    const response = await preview({ input: blowerStudy() })
    expect(response.status).toBe(200)
    const candidates = ours(response.body.candidates)
    // Only the 230 V 50 Hz rows take part; the 120 V 60 Hz motor and the discontinued one do not.
    expect(candidates.map((candidate) => `${candidate.partNumber.slice(prefix.length + 1)}/${candidate.tap}`).sort()).toEqual(['PSC/high', 'PSC/low', 'PSCA/high', 'SP/high'])
    const ranks = response.body.candidates.map((candidate: Row) => candidate.rank)
    expect(ranks).toEqual([...ranks].sort((a: number, b: number) => a - b))
    const psc = candidates.filter((candidate) => candidate.partNumber === `${prefix}-PSC`)
    const shaded = candidates.find((candidate) => candidate.partNumber === `${prefix}-SP`)
    expect(psc.every((candidate) => candidate.meetsDuty)).toBe(true)
    expect(shaded?.meetsDuty).toBe(false)
    expect(Math.max(...psc.map((candidate) => candidate.rank))).toBeLessThan(shaded?.rank ?? 0)
    // A 10 W shaded-pole motor on a 30 W blower: it runs slow, well short of the duty flow.
    expect(shaded?.nominal.flowM3s).toBeLessThan(0.1)
    expect(response.body.loadCurve.length).toBeGreaterThan(10)
    expect(response.body.curves.length).toBeGreaterThan(0)
  })

  it('warns about discontinued motors and low insulation when the buyer lets them in', async () => {
    const input = blowerStudy({ constraints: { motorTypes: [], mountings: [], enclosures: [], protections: [], activeOnly: false, minInsulationClass: 'B' } })
    const response = await preview({ input })
    const candidates = ours(response.body.candidates)
    const old = candidates.find((candidate) => candidate.partNumber === `${prefix}-SPOLD`)
    expect(old?.warnings.map((warning) => warning.code)).toContain('discontinued')
    const classA = candidates.find((candidate) => candidate.partNumber === `${prefix}-PSCA`)
    expect(classA?.warnings.map((warning) => warning.code)).toContain('insulation-below-requirement')
  })

  it('applies hard constraints and reports what they excluded', async () => {
    const input = blowerStudy({ constraints: { motorTypes: ['shaded-pole'], mountings: [], enclosures: [], protections: [], activeOnly: true } })
    const response = await preview({ input })
    expect(ours(response.body.candidates).every((candidate) => candidate.partNumber.includes('-SP'))).toBe(true)
    expect(response.body.excluded.find((item: { reason: string }) => item.reason === 'motor type')?.count).toBeGreaterThanOrEqual(2)
  })

  it('answers 400 naming the field when the fan flows do not rise', async () => {
    const input = blowerStudy()
    const body = JSON.parse(JSON.stringify({ input }))
    body.input.fan.points[2].flowM3s = 0.01
    const response = await preview(body)
    expect(response.status).toBe(400)
    expect(response.body.error.fields).toHaveProperty('input.fan.points.2.flowM3s')
  })

  it('answers 400 naming the field when the offset is not below the duty pressure', async () => {
    const input = { ...blowerStudy(), system: { offsetPa: 90 } }
    const response = await preview({ input })
    expect(response.status).toBe(400)
    expect(response.body.error.fields).toHaveProperty('input.system.offsetPa')
  })

  it('answers 400 with several named fields for an impossible study', async () => {
    const response = await preview({ input: { ...blowerStudy(), name: '', supply: { volts: -5, hz: 55 }, duty: { flowM3s: 'lots', staticPa: 80 } } })
    expect(response.status).toBe(400)
    expect(Object.keys(response.body.error.fields)).toEqual(expect.arrayContaining(['input.name', 'input.supply.volts', 'input.supply.hz', 'input.duty.flowM3s']))
  })
})

describe('duty studies of a buyer', () => {
  it('are saved, run, re-run with changes, exported and isolated from other organisations', async () => {
    const created = await buyer.agent.post('/api/v1/studies').set('X-CSRF-Token', buyer.csrf).send({ input: blowerStudy({ name: 'Hood blower study' }) })
    expect(created.status).toBe(201)
    const id: string = created.body.id
    expect(created.body).toMatchObject({ name: 'Hood blower study', version: 1, editable: true })
    const stored = await ctx.dataSource.getRepository(DutyStudy).findOneByOrFail({ id })
    expect(stored.organisationId).toBe(buyer.user.organisationId)

    const run = await buyer.agent.post(`/api/v1/studies/${id}/runs`).set('X-CSRF-Token', buyer.csrf).send({})
    expect(run.status).toBe(201)
    expect(run.body.changes).toBeNull()
    expect(await ctx.dataSource.getRepository(StudyRun).countBy({ studyId: id })).toBe(1)

    // The catalogue changes: one motor is withdrawn. The re-run says what changed.
    await ctx.dataSource.transaction(async (manager) => {
      await manager.update(MotorVariant, { partNumber: `${prefix}-PSCA` }, { lifecycle: 'discontinued' })
      await bumpCatalogueRevision(manager)
    })
    const rerun = await buyer.agent.post(`/api/v1/studies/${id}/runs`).set('X-CSRF-Token', buyer.csrf).send({})
    expect(rerun.body.changes.catalogueChanged).toBe(true)
    expect(rerun.body.changes.removed).toContain(`${prefix}-PSCA (high)`)
    await ctx.dataSource.transaction(async (manager) => {
      await manager.update(MotorVariant, { partNumber: `${prefix}-PSCA` }, { lifecycle: 'active' })
      await bumpCatalogueRevision(manager)
    })

    const csv = await buyer.agent.get(`/api/v1/studies/${id}/runs/${rerun.body.id}/export.csv?units=us`)
    expect(csv.status).toBe(200)
    expect(csv.headers['content-type']).toMatch(/text\/csv/)
    const lines = csv.text.trim().split('\r\n')
    const header = lines[0]?.split(',') ?? []
    expect(header.indexOf('flow_cfm')).toBeGreaterThan(-1)
    expect(header.indexOf('flow_cfm')).toBeLessThan(header.indexOf('flow_m3h'))
    expect(lines.length - 1).toBe(rerun.body.result.candidates.length)

    // Another organisation sees nothing of it: 404 everywhere, and not in its list.
    expect((await outsider.agent.get(`/api/v1/studies/${id}`)).status).toBe(404)
    expect((await outsider.agent.post(`/api/v1/studies/${id}/runs`).set('X-CSRF-Token', outsider.csrf).send({})).status).toBe(404)
    expect((await outsider.agent.get(`/api/v1/studies/${id}/runs/${rerun.body.id}/export.csv`)).status).toBe(404)
    const outsiderList = await outsider.agent.get('/api/v1/studies')
    expect(outsiderList.body.items.map((item: { id: string }) => item.id)).not.toContain(id)

    // A colleague sees it only once it is shared, and read-only.
    expect((await colleague.agent.get(`/api/v1/studies/${id}`)).status).toBe(404)
    const shared = await buyer.agent.post(`/api/v1/studies/${id}/share`).set('X-CSRF-Token', buyer.csrf).send({})
    const token: string = shared.body.shareToken
    expect(token).toMatch(/^[A-Za-z0-9_-]{40,}$/)
    const viaLink = await colleague.agent.get(`/api/v1/shared/studies/${token}`)
    expect(viaLink.status).toBe(200)
    expect(viaLink.body.editable).toBe(false)
    expect(viaLink.body.latestRun.id).toBe(rerun.body.id)
    expect((await outsider.agent.get(`/api/v1/shared/studies/${token}`)).status).toBe(404)
    expect((await colleague.agent.put(`/api/v1/studies/${id}`).set('X-CSRF-Token', colleague.csrf).send({ input: blowerStudy(), version: 1 })).status).toBe(404)
    await buyer.agent.delete(`/api/v1/studies/${id}/share`).set('X-CSRF-Token', buyer.csrf).expect(200)
    expect((await colleague.agent.get(`/api/v1/shared/studies/${token}`)).status).toBe(404)

    // The sales engineer can read customers' studies (to quote from them) but not edit them.
    const asSales = await sales.agent.get(`/api/v1/studies/${id}`)
    expect(asSales.status).toBe(200)
    expect(asSales.body.editable).toBe(false)
  })

  it('refuses a stale edit with 409 and keeps the newer data', async () => {
    const created = await buyer.agent.post('/api/v1/studies').set('X-CSRF-Token', buyer.csrf).send({ input: blowerStudy({ name: 'Version test' }) })
    const id: string = created.body.id
    const first = await buyer.agent.put(`/api/v1/studies/${id}`).set('X-CSRF-Token', buyer.csrf).send({ input: blowerStudy({ name: 'Edited in tab one' }), version: 1 })
    expect(first.status).toBe(200)
    expect(first.body.version).toBe(2)
    const stale = await buyer.agent.put(`/api/v1/studies/${id}`).set('X-CSRF-Token', buyer.csrf).send({ input: blowerStudy({ name: 'Edited in tab two' }), version: 1 })
    expect(stale.status).toBe(409)
    expect(stale.body.error.code).toBe('stale_version')
    expect((await ctx.dataSource.getRepository(DutyStudy).findOneByOrFail({ id })).name).toBe('Edited in tab one')
  })

  it('needs a signed-in user to save; anonymous callers get 401', async () => {
    const agent = request.agent(ctx.handle.app)
    const csrf = (await agent.get('/api/auth/csrf')).body.token
    expect((await agent.post('/api/v1/studies').set('X-CSRF-Token', csrf).send({ input: blowerStudy() })).status).toBe(401)
    expect((await agent.get('/api/v1/studies')).status).toBe(401)
  })

  it('answers 404 for a study id that does not exist and 400 for one that is not an id', async () => {
    expect((await buyer.agent.get(`/api/v1/studies/${randomUUID()}`)).status).toBe(404)
    const bad = await buyer.agent.get('/api/v1/studies/not-an-id')
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields).toHaveProperty('params.id')
  })
})
