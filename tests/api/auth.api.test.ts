import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { SessionRecord, User } from '../../server/db/entities'
import { SESSION_COOKIE } from '../../server/app'
import { anonymousAgent, createUser, PASSWORD, signInAs, startTestApp, type TestContext } from './support'

let ctx: TestContext

beforeAll(async () => {
  ctx = await startTestApp()
})
afterAll(async () => {
  await ctx.close()
})

function sessionIdFrom(cookies: string[] | string | undefined): string | undefined {
  const list = Array.isArray(cookies) ? cookies : cookies ? [cookies] : []
  const cookie = list.find((value) => value.startsWith(`${SESSION_COOKIE}=`))
  if (!cookie) return undefined
  const signed = decodeURIComponent(cookie.split(';')[0]?.split('=')[1] ?? '')
  return signed.slice(2).split('.')[0]
}

describe('POST /api/auth/sign-in', () => {
  it('signs a buyer in, returns the user with its role and stores the session in MariaDB', async () => {
    const user = await createUser(ctx.dataSource, 'buyer')
    const { agent, csrf } = await anonymousAgent(ctx)
    const response = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', csrf).send({ email: user.email.toUpperCase(), password: PASSWORD })
    expect(response.status).toBe(200)
    expect(response.body).toMatchObject({ email: user.email, role: 'buyer', organisation: { id: user.organisationId } })
    expect(response.body).not.toHaveProperty('passwordHash')
    const cookie = String(response.headers['set-cookie'])
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    expect(cookie).not.toMatch(/Secure/i)
    const sid = sessionIdFrom(response.headers['set-cookie'])
    const row = await ctx.dataSource.getRepository(SessionRecord).findOneBy({ id: sid ?? '' })
    expect(row?.userId).toBe(user.id)
    const me = await agent.get('/api/auth/me').expect(200)
    expect(me.body.role).toBe('buyer')
  })

  it('gives a new session id at sign-in, so a planted id is worthless (fixation)', async () => {
    const user = await createUser(ctx.dataSource, 'sales')
    const agent = request.agent(ctx.handle.app)
    const before = await agent.get('/api/auth/csrf')
    const anonymousSid = sessionIdFrom(before.headers['set-cookie'])
    const after = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', before.body.token).send({ email: user.email, password: PASSWORD })
    const signedInSid = sessionIdFrom(after.headers['set-cookie'])
    expect(anonymousSid).toBeTruthy()
    expect(signedInSid).toBeTruthy()
    expect(signedInSid).not.toBe(anonymousSid)
    expect(await ctx.dataSource.getRepository(SessionRecord).existsBy({ id: anonymousSid ?? '' })).toBe(false)
  })

  it('answers 401 with the same message for a wrong password and an unknown e-mail', async () => {
    const user = await createUser(ctx.dataSource, 'buyer')
    const { agent, csrf } = await anonymousAgent(ctx)
    const wrong = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', csrf).send({ email: user.email, password: 'not-the-password' })
    const unknown = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', csrf).send({ email: 'nobody@example.test', password: 'whatever' })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body.error.message).toBe(unknown.body.error.message)
    expect(wrong.body.error.code).toBe('bad_credentials')
  })

  it('refuses a disabled account even with the right password', async () => {
    const user = await createUser(ctx.dataSource, 'buyer')
    await ctx.dataSource.getRepository(User).update({ id: user.id }, { disabledAt: new Date() })
    const { agent, csrf } = await anonymousAgent(ctx)
    const response = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', csrf).send({ email: user.email, password: PASSWORD })
    expect(response.status).toBe(401)
  })

  it('answers 400 naming the fields for a body that is not a sign-in', async () => {
    const { agent, csrf } = await anonymousAgent(ctx)
    const response = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', csrf).send({ email: 'not-an-address' })
    expect(response.status).toBe(400)
    expect(response.body.error.code).toBe('validation_failed')
    expect(Object.keys(response.body.error.fields).sort()).toEqual(['email', 'password'])
  })

  it('answers 400 with a body field for malformed JSON', async () => {
    const { agent, csrf } = await anonymousAgent(ctx)
    const response = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', csrf).set('Content-Type', 'application/json').send('{"email": "a@b.test", ')
    expect(response.status).toBe(400)
    expect(response.body).toEqual({ error: { code: 'bad_json', message: expect.any(String), fields: { body: expect.any(String) } } })
  })

  it('limits failed attempts per account with 429', async () => {
    const limited = await startTestApp({ SIGNIN_LIMIT_PER_ACCOUNT: '3', SIGNIN_LIMIT_PER_IP: '100' })
    try {
      const user = await createUser(limited.dataSource, 'buyer')
      const { agent, csrf } = await anonymousAgent(limited)
      const statuses: number[] = []
      for (let attempt = 0; attempt < 5; attempt += 1) {
        const response = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', csrf).send({ email: user.email, password: 'wrong-password' })
        statuses.push(response.status)
      }
      expect(statuses).toEqual([401, 401, 401, 429, 429])
      const last = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', csrf).send({ email: user.email, password: PASSWORD })
      expect(last.status).toBe(429)
      expect(last.body.error.code).toBe('rate_limited')
    } finally {
      await limited.close()
    }
  })
})

describe('POST /api/auth/sign-out', () => {
  it('ends the session in the store; the old cookie no longer signs in', async () => {
    const user = await createUser(ctx.dataSource, 'buyer')
    const { agent, csrf } = await signInAs(ctx, user)
    const before = await ctx.dataSource.getRepository(SessionRecord).countBy({ userId: user.id })
    expect(before).toBe(1)
    await agent.post('/api/auth/sign-out').set('X-CSRF-Token', csrf).expect(204)
    expect(await ctx.dataSource.getRepository(SessionRecord).countBy({ userId: user.id })).toBe(0)
    await agent.get('/api/auth/me').expect(401)
  })
})

describe('CSRF protection', () => {
  it('refuses a state-changing request without the token', async () => {
    const user = await createUser(ctx.dataSource, 'buyer')
    const { agent } = await signInAs(ctx, user)
    const response = await agent.patch('/api/auth/me/preferences').send({ units: 'us' })
    expect(response.status).toBe(403)
    expect(response.body.error.code).toBe('csrf_failed')
    const stored = await ctx.dataSource.getRepository(User).findOneByOrFail({ id: user.id })
    expect(stored.units).toBe('si')
  })

  it('refuses a token from another session', async () => {
    const user = await createUser(ctx.dataSource, 'buyer')
    const { agent } = await signInAs(ctx, user)
    const other = await anonymousAgent(ctx)
    const response = await agent.patch('/api/auth/me/preferences').set('X-CSRF-Token', other.csrf).send({ units: 'us' })
    expect(response.status).toBe(403)
  })

  it('accepts the session token and saves the preference', async () => {
    const user = await createUser(ctx.dataSource, 'buyer')
    const { agent, csrf } = await signInAs(ctx, user)
    const response = await agent.patch('/api/auth/me/preferences').set('X-CSRF-Token', csrf).send({ units: 'us' })
    expect(response.status).toBe(200)
    expect(response.body.units).toBe('us')
    expect((await ctx.dataSource.getRepository(User).findOneByOrFail({ id: user.id })).units).toBe('us')
  })
})

describe('role checks on the server', () => {
  it('gives a buyer 403 on an admin route, an anonymous caller 401, an admin 200', async () => {
    const buyer = await signInAs(ctx, await createUser(ctx.dataSource, 'buyer'))
    const sales = await signInAs(ctx, await createUser(ctx.dataSource, 'sales'))
    const admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin'))
    const asBuyer = await buyer.agent.get('/api/admin/users')
    expect(asBuyer.status).toBe(403)
    expect(asBuyer.body.error.code).toBe('forbidden')
    expect((await sales.agent.get('/api/admin/users')).status).toBe(403)
    expect((await request(ctx.handle.app).get('/api/admin/users')).status).toBe(401)
    const asAdmin = await admin.agent.get('/api/admin/users?pageSize=5')
    expect(asAdmin.status).toBe(200)
    expect(asAdmin.body.items.length).toBeLessThanOrEqual(5)
    expect(asAdmin.body.total).toBeGreaterThan(0)
  })

  it('ends the access of a user disabled while signed in at the next request', async () => {
    const user = await createUser(ctx.dataSource, 'buyer')
    const { agent } = await signInAs(ctx, user)
    await agent.get('/api/auth/me').expect(200)
    await ctx.dataSource.getRepository(User).update({ id: user.id }, { disabledAt: new Date() })
    await agent.get('/api/auth/me').expect(401)
  })

  it('answers 400 naming the query field for a bad page size', async () => {
    const admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin'))
    const response = await admin.agent.get('/api/admin/users?pageSize=5000')
    expect(response.status).toBe(400)
    expect(response.body.error.fields).toHaveProperty('query.pageSize')
  })
})

describe('reads without a session cookie', () => {
  it('are answered without minting a session: no cookie set, nothing stored, signed-in routes still 401', async () => {
    const sessions = ctx.dataSource.getRepository(SessionRecord)
    const before = await sessions.count()
    const list = await request(ctx.handle.app).get('/api/v1/catalogue/variants?page=1&pageSize=5')
    expect(list.status).toBe(200)
    expect(list.headers['set-cookie']).toBeUndefined()
    const health = await request(ctx.handle.app).get('/api/health')
    expect(health.headers['set-cookie']).toBeUndefined()
    expect((await request(ctx.handle.app).get('/api/auth/me')).status).toBe(401)
    expect((await request(ctx.handle.app).get('/api/admin/users')).status).toBe(401)
    expect(await sessions.count()).toBe(before)
  })

  it('still start a session where one is needed: GET /api/auth/csrf sets the cookie and stores the token', async () => {
    const response = await request(ctx.handle.app).get('/api/auth/csrf')
    expect(response.status).toBe(200)
    const sid = sessionIdFrom(response.headers['set-cookie'])
    expect(sid).toBeTruthy()
    const row = await ctx.dataSource.getRepository(SessionRecord).findOneBy({ id: sid ?? '' })
    expect(row?.data).toContain(response.body.token)
  })

  it('refuse a write without a cookie as before (CSRF), and read a signed-in user from the cookie', async () => {
    const refused = await request(ctx.handle.app).post('/api/auth/sign-out').send({})
    expect(refused.status).toBe(403)
    expect(refused.body.error.code).toBe('csrf_failed')
    const user = await createUser(ctx.dataSource, 'buyer')
    const { agent } = await signInAs(ctx, user)
    expect((await agent.get('/api/auth/me')).body.email).toBe(user.email)
  })
})

describe('unknown API routes', () => {
  it('answer 404 JSON in the common error shape', async () => {
    const response = await request(ctx.handle.app).get('/api/no-such-thing')
    expect(response.status).toBe(404)
    expect(response.body.error.code).toBe('not_found')
  })
})
