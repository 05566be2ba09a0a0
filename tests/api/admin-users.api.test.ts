import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { In, IsNull, Not } from 'typeorm'
import { AuditEntry, Organisation, SessionRecord, User } from '../../server/db/entities'
import { AdminUserService } from '../../server/services/admin-users.service'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { anonymousAgent, createOrganisation, createUser, PASSWORD, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
let admin: SignedInAgent
let maker: Organisation

beforeAll(async () => {
  ctx = await startTestApp()
  maker = await createOrganisation(ctx.dataSource, 'maker')
  admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin', maker))
})
afterAll(async () => {
  await ctx.close()
})

const SOME_ID = '00000000-0000-4000-8000-000000000000'

function concretePath(path: string): string {
  return path.replace(/:[A-Za-z]+/g, (param) => (param === ':index' ? '0' : param === ':token' ? 'A'.repeat(43) : SOME_ID))
}

async function latestAudit(entityId: string, action: string): Promise<AuditEntry> {
  return ctx.dataSource.getRepository(AuditEntry).findOneOrFail({ where: { entityId, action }, order: { id: 'DESC' } })
}

describe('every /api/admin route', () => {
  it('answers 401 to anonymous visitors and 403 to buyers and sales engineers', async () => {
    const adminRoutes = ctx.handle.routes.filter((route) => route.path.startsWith('/api/admin/'))
    expect(adminRoutes.length).toBeGreaterThan(15)
    for (const route of adminRoutes) expect(route.access, `${route.method} ${route.path}`).toEqual(['admin'])
    const buyer = await signInAs(ctx, await createUser(ctx.dataSource, 'buyer'))
    const sales = await signInAs(ctx, await createUser(ctx.dataSource, 'sales', maker))
    const anonymous = await anonymousAgent(ctx)
    for (const route of adminRoutes) {
      const path = concretePath(route.path)
      const label = `${route.method.toUpperCase()} ${path}`
      expect((await anonymous.agent[route.method](path).set('X-CSRF-Token', anonymous.csrf).send({})).status, label).toBe(401)
      expect((await buyer.agent[route.method](path).set('X-CSRF-Token', buyer.csrf).send({})).status, label).toBe(403)
      expect((await sales.agent[route.method](path).set('X-CSRF-Token', sales.csrf).send({})).status, label).toBe(403)
    }
  })
})

describe('GET /api/admin/users', () => {
  it('pages on the server and filters by search and role', async () => {
    const tag = randomUUID().slice(0, 8)
    const customer = await createOrganisation(ctx.dataSource, 'customer')
    for (let i = 0; i < 3; i += 1) {
      await ctx.dataSource.getRepository(User).insert({ email: `zz-${tag}-${i}@example.test`, name: `Paging ${tag}`, role: 'buyer', organisationId: customer.id, passwordHash: null })
    }
    const page = await admin.agent.get('/api/admin/users').query({ search: tag, pageSize: 2, page: 2 }).expect(200)
    expect(page.body.total).toBe(3)
    expect(page.body.items).toHaveLength(1)
    expect(page.body.items[0]).toMatchObject({ email: `zz-${tag}-2@example.test`, status: 'invited', organisation: customer.name })
    const sales = await admin.agent.get('/api/admin/users').query({ search: tag, role: 'sales' }).expect(200)
    expect(sales.body.total).toBe(0)
    const bad = await admin.agent.get('/api/admin/users').query({ role: 'owner', pageSize: 5000 })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['query.pageSize', 'query.role'])
  })
})

describe('POST /api/admin/users (invite)', () => {
  it('creates the account without a password, mails a link and writes an audit entry', async () => {
    const customer = await createOrganisation(ctx.dataSource, 'customer')
    const email = `New.Buyer-${randomUUID().slice(0, 6)}@Example.test`
    const response = await admin.agent
      .post('/api/admin/users')
      .set('X-CSRF-Token', admin.csrf)
      .send({ name: 'Noor Newcomb', email, role: 'buyer', organisationId: customer.id })
      .expect(201)
    expect(response.body).toMatchObject({ email: email.toLowerCase(), role: 'buyer', status: 'invited' })
    expect(response.body.invitationExpiresAt).toBeTruthy()
    const user = await ctx.dataSource.getRepository(User).findOneByOrFail({ email: email.toLowerCase() })
    expect(user.passwordHash).toBeNull()
    const audit = await latestAudit(user.id, 'invited')
    expect(audit).toMatchObject({ actorId: admin.user.id, actorEmail: admin.user.email, entity: 'user' })
    expect(audit.detail).toMatchObject({ role: 'buyer', organisation: customer.name })

    const twice = await admin.agent.post('/api/admin/users').set('X-CSRF-Token', admin.csrf).send({ name: 'Again', email, role: 'buyer', organisationId: customer.id })
    expect(twice.status).toBe(409)
  })

  it('refuses a buyer in the maker and a sales engineer in a customer, with the field named', async () => {
    const customer = await createOrganisation(ctx.dataSource, 'customer')
    const buyerInMaker = await admin.agent
      .post('/api/admin/users')
      .set('X-CSRF-Token', admin.csrf)
      .send({ name: 'Wrong Place', email: `wp-${randomUUID().slice(0, 6)}@example.test`, role: 'buyer', organisationId: maker.id })
    expect(buyerInMaker.status).toBe(400)
    expect(buyerInMaker.body.error.fields.role).toMatch(/maker/)
    const salesInCustomer = await admin.agent
      .post('/api/admin/users')
      .set('X-CSRF-Token', admin.csrf)
      .send({ name: 'Wrong Place', email: `wp-${randomUUID().slice(0, 6)}@example.test`, role: 'sales', organisationId: customer.id })
    expect(salesInCustomer.status).toBe(400)
    expect(salesInCustomer.body.error.fields.role).toMatch(/buyers/)
  })

  it('answers 400 with every bad field', async () => {
    const response = await admin.agent.post('/api/admin/users').set('X-CSRF-Token', admin.csrf).send({ name: '', email: 'nope', role: 'owner', organisationId: 'x' })
    expect(response.status).toBe(400)
    expect(Object.keys(response.body.error.fields).sort()).toEqual(['email', 'name', 'organisationId', 'role'])
  })
})

describe('PUT /api/admin/users/:id/role', () => {
  it('changes the role, ends the user’s sessions so the new role rules the next request, and audits before/after', async () => {
    const target = await createUser(ctx.dataSource, 'sales', maker)
    const session = await signInAs(ctx, target)
    await session.agent.get('/api/auth/me').expect(200)
    expect(await ctx.dataSource.getRepository(SessionRecord).countBy({ userId: target.id })).toBe(1)

    const response = await admin.agent.put(`/api/admin/users/${target.id}/role`).set('X-CSRF-Token', admin.csrf).send({ role: 'admin' }).expect(200)
    expect(response.body.role).toBe('admin')
    expect(await ctx.dataSource.getRepository(SessionRecord).countBy({ userId: target.id })).toBe(0)
    expect((await session.agent.get('/api/auth/me')).status).toBe(401)
    const again = await signInAs(ctx, target)
    expect((await again.agent.get('/api/auth/me').expect(200)).body.role).toBe('admin')
    const audit = await latestAudit(target.id, 'role-changed')
    expect(audit.detail).toMatchObject({ role: { before: 'sales', after: 'admin' }, sessionsEnded: 1 })
  })

  it('refuses a role that does not fit the organisation', async () => {
    const buyer = await createUser(ctx.dataSource, 'buyer')
    const response = await admin.agent.put(`/api/admin/users/${buyer.id}/role`).set('X-CSRF-Token', admin.csrf).send({ role: 'sales' })
    expect(response.status).toBe(400)
    expect(response.body.error.fields).toHaveProperty('role')
  })

  it('refuses to demote or disable the last administrator who can sign in', async () => {
    const lastAdmin = await createUser(ctx.dataSource, 'admin', maker)
    const others = await ctx.dataSource.getRepository(User).findBy({ role: 'admin', disabledAt: IsNull(), id: Not(lastAdmin.id) })
    const otherIds = others.map((user) => user.id)
    // Only `lastAdmin` can sign in while the other admins are (temporarily) disabled.
    await ctx.dataSource.getRepository(User).update({ id: In(otherIds) }, { disabledAt: new Date() })
    try {
      // Acting as another admin so the own-account rule does not answer first.
      const service = new AdminUserService(ctx.dataSource, 'http://portal.test')
      const sessionActor: SessionUser = { id: SOME_ID, email: 'someone@example.test', name: 'Someone', role: 'admin', units: 'si', organisation: { id: maker.id, name: maker.name, kind: 'maker', tier: null } }
      await expect(service.changeRole(sessionActor, lastAdmin.id, 'sales')).rejects.toMatchObject({ status: 409, code: 'last_admin' })
      await expect(service.setDisabled(sessionActor, lastAdmin.id, true)).rejects.toMatchObject({ status: 409, code: 'last_admin' })
      expect((await ctx.dataSource.getRepository(User).findOneByOrFail({ id: lastAdmin.id })).role).toBe('admin')
    } finally {
      await ctx.dataSource.getRepository(User).update({ id: In(otherIds) }, { disabledAt: null })
    }
  })

  it('refuses changing your own role', async () => {
    const response = await admin.agent.put(`/api/admin/users/${admin.user.id}/role`).set('X-CSRF-Token', admin.csrf).send({ role: 'sales' })
    expect(response.status).toBe(409)
    expect(response.body.error.code).toBe('own_account')
  })
})

describe('POST /api/admin/users/:id/disable and /enable', () => {
  it('ends the sessions at once: the next request is 401 and sign-in is refused until enabled', async () => {
    const buyer = await createUser(ctx.dataSource, 'buyer')
    const session = await signInAs(ctx, buyer)
    await session.agent.get('/api/auth/me').expect(200)

    const disabled = await admin.agent.post(`/api/admin/users/${buyer.id}/disable`).set('X-CSRF-Token', admin.csrf).expect(200)
    expect(disabled.body).toMatchObject({ disabled: true, status: 'disabled' })
    expect((await session.agent.get('/api/auth/me')).status).toBe(401)
    expect((await session.agent.get('/api/v1/studies')).status).toBe(401)
    expect(await ctx.dataSource.getRepository(SessionRecord).countBy({ userId: buyer.id })).toBe(0)
    await expect(signInAs(ctx, buyer)).rejects.toThrow(/401/)
    expect((await latestAudit(buyer.id, 'disabled')).detail).toMatchObject({ sessionsEnded: 1 })

    await admin.agent.post(`/api/admin/users/${buyer.id}/enable`).set('X-CSRF-Token', admin.csrf).expect(200)
    const back = await signInAs(ctx, buyer, PASSWORD)
    await back.agent.get('/api/auth/me').expect(200)
    expect(await latestAudit(buyer.id, 'enabled')).toBeTruthy()
  })

  it('refuses disabling yourself', async () => {
    const response = await admin.agent.post(`/api/admin/users/${admin.user.id}/disable`).set('X-CSRF-Token', admin.csrf)
    expect(response.status).toBe(409)
  })

  it('answers 404 for an unknown user', async () => {
    expect((await admin.agent.post(`/api/admin/users/${SOME_ID}/disable`).set('X-CSRF-Token', admin.csrf)).status).toBe(404)
  })
})

describe('PUT /api/admin/users/:id/discount-limit', () => {
  it('sets a sales engineer’s limit and audits it; refuses it for a buyer and above 100 %', async () => {
    const sales = await createUser(ctx.dataSource, 'sales', maker)
    const response = await admin.agent.put(`/api/admin/users/${sales.id}/discount-limit`).set('X-CSRF-Token', admin.csrf).send({ discountLimitBp: 1250 }).expect(200)
    expect(response.body.discountLimitBp).toBe(1250)
    expect((await latestAudit(sales.id, 'discount-limit-changed')).detail).toMatchObject({ discountLimitBp: { before: 0, after: 1250 } })
    const buyer = await createUser(ctx.dataSource, 'buyer')
    expect((await admin.agent.put(`/api/admin/users/${buyer.id}/discount-limit`).set('X-CSRF-Token', admin.csrf).send({ discountLimitBp: 100 })).status).toBe(400)
    const tooMuch = await admin.agent.put(`/api/admin/users/${sales.id}/discount-limit`).set('X-CSRF-Token', admin.csrf).send({ discountLimitBp: 10_001 })
    expect(tooMuch.status).toBe(400)
    expect(tooMuch.body.error.fields).toHaveProperty('discountLimitBp')
  })
})
