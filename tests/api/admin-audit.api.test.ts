import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { AuditEntry } from '../../server/db/entities'
import { createOrganisation, createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
let admin: SignedInAgent
const entity = `test_${randomUUID().slice(0, 8)}`

beforeAll(async () => {
  ctx = await startTestApp()
  admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin', await createOrganisation(ctx.dataSource, 'maker')))
  const rows = [
    { at: new Date('2026-03-01T09:00:00Z'), action: 'created', actorEmail: 'maren@ashcombe.test' },
    { at: new Date('2026-03-02T23:59:59Z'), action: 'updated', actorEmail: 'maren@ashcombe.test' },
    { at: new Date('2026-03-03T00:00:00Z'), action: 'updated', actorEmail: 'tobias@ashcombe.test' },
    { at: new Date('2026-03-05T12:00:00Z'), action: 'disabled', actorEmail: null },
  ]
  for (const [index, row] of rows.entries()) {
    await ctx.dataSource.getRepository(AuditEntry).insert({ ...row, actorId: null, entity, entityId: `e-${index}`, detail: { index } })
  }
})
afterAll(async () => {
  await ctx.close()
})

const ids = (body: { items: { entityId: string }[] }) => body.items.map((item) => item.entityId)

describe('GET /api/admin/audit', () => {
  it('filters by entity and action, newest first', async () => {
    const response = await admin.agent.get('/api/admin/audit').query({ entity, action: 'updated' }).expect(200)
    expect(response.body.total).toBe(2)
    expect(ids(response.body)).toEqual(['e-2', 'e-1'])
  })

  it('filters by part of the actor’s e-mail', async () => {
    const response = await admin.agent.get('/api/admin/audit').query({ entity, actor: 'TOBIAS' }).expect(200)
    expect(ids(response.body)).toEqual(['e-2'])
  })

  it('takes whole UTC days at both ends of a date range', async () => {
    const response = await admin.agent.get('/api/admin/audit').query({ entity, from: '2026-03-02', to: '2026-03-03' }).expect(200)
    expect(ids(response.body)).toEqual(['e-2', 'e-1'])
  })

  it('pages on the server', async () => {
    const response = await admin.agent.get('/api/admin/audit').query({ entity, pageSize: 3, page: 2 }).expect(200)
    expect(response.body).toMatchObject({ total: 4, page: 2, pageSize: 3 })
    expect(ids(response.body)).toEqual(['e-0'])
  })

  it('answers 400 for a range that ends before it starts or a date that is not one', async () => {
    const reversed = await admin.agent.get('/api/admin/audit').query({ from: '2026-03-05', to: '2026-03-01' })
    expect(reversed.status).toBe(400)
    expect(reversed.body.error.fields).toHaveProperty('query.to')
    const bad = await admin.agent.get('/api/admin/audit').query({ from: 'yesterday' })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields).toHaveProperty('query.from')
  })

  it('records admin changes made through the API with actor, entity and before/after', async () => {
    const customer = await createOrganisation(ctx.dataSource, 'customer')
    const invite = await admin.agent
      .post('/api/admin/users')
      .set('X-CSRF-Token', admin.csrf)
      .send({ name: 'Audit Trail', email: `trail-${randomUUID().slice(0, 6)}@example.test`, role: 'buyer', organisationId: customer.id })
      .expect(201)
    await admin.agent.post(`/api/admin/users/${invite.body.id}/disable`).set('X-CSRF-Token', admin.csrf).expect(200)
    const response = await admin.agent.get('/api/admin/audit').query({ entity: 'user', entityId: invite.body.id }).expect(200)
    expect(response.body.items.map((item: { action: string }) => item.action)).toEqual(['disabled', 'invited'])
    expect(response.body.items[0]).toMatchObject({ actorEmail: admin.user.email, actorId: admin.user.id, detail: { disabledAt: { before: null } } })
    const facets = await admin.agent.get('/api/admin/audit/facets').expect(200)
    expect(facets.body.entities).toEqual(expect.arrayContaining([entity, 'user']))
    expect(facets.body.actions).toEqual(expect.arrayContaining(['invited', 'disabled', 'created']))
  })
})
