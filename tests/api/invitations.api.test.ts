import { createHash, randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { AuditEntry, Invitation, User } from '../../server/db/entities'
import { invitationMails, latestInvitationToken } from './admin-support'
import { anonymousAgent, createOrganisation, createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
let admin: SignedInAgent

beforeAll(async () => {
  ctx = await startTestApp()
  admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin'))
})
afterAll(async () => {
  await ctx.close()
})

const NEW_PASSWORD = 'Fan-curve-at-duty-42'

async function inviteBuyer(): Promise<User> {
  const customer = await createOrganisation(ctx.dataSource, 'customer', 'oem')
  const email = `invitee-${randomUUID().slice(0, 8)}@example.test`
  const response = await admin.agent
    .post('/api/admin/users')
    .set('X-CSRF-Token', admin.csrf)
    .send({ name: 'Ines Invited', email, role: 'buyer', organisationId: customer.id })
    .expect(201)
  return ctx.dataSource.getRepository(User).findOneByOrFail({ id: response.body.id })
}

async function signIn(email: string, password: string): Promise<number> {
  const { agent, csrf } = await anonymousAgent(ctx)
  const response = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', csrf).send({ email, password })
  return response.status
}

describe('GET /api/auth/invitations/:token', () => {
  it('describes a fresh invitation and stores only the SHA-256 of its token', async () => {
    const user = await inviteBuyer()
    const token = await latestInvitationToken(ctx.dataSource, user.id)
    const { agent } = await anonymousAgent(ctx)
    const response = await agent.get(`/api/auth/invitations/${token}`).expect(200)
    expect(response.body).toMatchObject({ email: user.email, name: 'Ines Invited' })
    const hoursLeft = (new Date(response.body.expiresAt).getTime() - Date.now()) / 3_600_000
    expect(hoursLeft).toBeGreaterThan(71.9)
    expect(hoursLeft).toBeLessThanOrEqual(72)
    const stored = await ctx.dataSource.getRepository(Invitation).findOneByOrFail({ userId: user.id })
    expect(stored.tokenHash).toBe(createHash('sha256').update(token).digest('hex'))
    expect(JSON.stringify(stored)).not.toContain(token)
    expect(user.passwordHash).toBeNull()
  })

  it('refuses a token past its expiry with 410 and a message saying it expired', async () => {
    const user = await inviteBuyer()
    const token = await latestInvitationToken(ctx.dataSource, user.id)
    await ctx.dataSource.getRepository(Invitation).update({ userId: user.id }, { expiresAt: new Date(Date.now() - 60_000) })
    const { agent, csrf } = await anonymousAgent(ctx)
    const check = await agent.get(`/api/auth/invitations/${token}`)
    expect(check.status).toBe(410)
    expect(check.body.error.code).toBe('invitation_expired')
    expect(check.body.error.message).toMatch(/expired on .* ask .* new one/i)
    const set = await agent.post(`/api/auth/invitations/${token}`).set('X-CSRF-Token', csrf).send({ password: NEW_PASSWORD })
    expect(set.status).toBe(410)
    expect((await ctx.dataSource.getRepository(User).findOneByOrFail({ id: user.id })).passwordHash).toBeNull()
  })

  it('answers 404 for an unknown token and 400 for something that is not a token', async () => {
    const { agent } = await anonymousAgent(ctx)
    expect((await agent.get(`/api/auth/invitations/${'A'.repeat(43)}`)).status).toBe(404)
    const malformed = await agent.get('/api/auth/invitations/short')
    expect(malformed.status).toBe(400)
    expect(malformed.body.error.fields).toHaveProperty('params.token')
  })
})

describe('POST /api/auth/invitations/:token', () => {
  it('sets the password, after which the person signs in; the link cannot be used again', async () => {
    const user = await inviteBuyer()
    const token = await latestInvitationToken(ctx.dataSource, user.id)
    expect(await signIn(user.email, NEW_PASSWORD)).toBe(401)
    const { agent, csrf } = await anonymousAgent(ctx)
    const set = await agent.post(`/api/auth/invitations/${token}`).set('X-CSRF-Token', csrf).send({ password: NEW_PASSWORD })
    expect(set.status).toBe(200)
    expect(set.body).toEqual({ email: user.email })
    expect(await signIn(user.email, NEW_PASSWORD)).toBe(200)

    const again = await agent.post(`/api/auth/invitations/${token}`).set('X-CSRF-Token', csrf).send({ password: 'Another-password-99' })
    expect(again.status).toBe(410)
    expect(again.body.error.code).toBe('invitation_used')
    expect(await signIn(user.email, 'Another-password-99')).toBe(401)
    const invitation = await ctx.dataSource.getRepository(Invitation).findOneByOrFail({ userId: user.id })
    expect(invitation.usedAt).not.toBeNull()
    const audit = await ctx.dataSource.getRepository(AuditEntry).findOneByOrFail({ entity: 'user', entityId: user.id, action: 'password-set' })
    expect(audit.actorId).toBe(user.id)
  })

  it('refuses a password shorter than 12 characters with 400 naming the field', async () => {
    const user = await inviteBuyer()
    const token = await latestInvitationToken(ctx.dataSource, user.id)
    const { agent, csrf } = await anonymousAgent(ctx)
    const response = await agent.post(`/api/auth/invitations/${token}`).set('X-CSRF-Token', csrf).send({ password: 'eleven-char' })
    expect(response.status).toBe(400)
    expect(response.body.error.fields.password).toMatch(/12/)
    expect((await ctx.dataSource.getRepository(User).findOneByOrFail({ id: user.id })).passwordHash).toBeNull()
  })

  it('after a resend only the newest link works', async () => {
    const user = await inviteBuyer()
    const first = await latestInvitationToken(ctx.dataSource, user.id)
    await admin.agent.post(`/api/admin/users/${user.id}/invitation`).set('X-CSRF-Token', admin.csrf).expect(200)
    const second = await latestInvitationToken(ctx.dataSource, user.id)
    expect(second).not.toBe(first)
    expect(await invitationMails(ctx.dataSource, user.id)).toHaveLength(2)
    const { agent, csrf } = await anonymousAgent(ctx)
    const old = await agent.post(`/api/auth/invitations/${first}`).set('X-CSRF-Token', csrf).send({ password: NEW_PASSWORD })
    expect(old.status).toBe(410)
    expect(old.body.error.code).toBe('invitation_replaced')
    await agent.post(`/api/auth/invitations/${second}`).set('X-CSRF-Token', csrf).send({ password: NEW_PASSWORD }).expect(200)
    const resendAgain = await admin.agent.post(`/api/admin/users/${user.id}/invitation`).set('X-CSRF-Token', admin.csrf)
    expect(resendAgain.status).toBe(409)
  })

  it('refuses the link of an account disabled before it was used', async () => {
    const user = await inviteBuyer()
    const token = await latestInvitationToken(ctx.dataSource, user.id)
    await admin.agent.post(`/api/admin/users/${user.id}/disable`).set('X-CSRF-Token', admin.csrf).expect(200)
    const { agent, csrf } = await anonymousAgent(ctx)
    const response = await agent.post(`/api/auth/invitations/${token}`).set('X-CSRF-Token', csrf).send({ password: NEW_PASSWORD })
    expect(response.status).toBe(410)
    expect((await ctx.dataSource.getRepository(User).findOneByOrFail({ id: user.id })).passwordHash).toBeNull()
  })
})
