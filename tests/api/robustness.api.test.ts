// Hostile and random input over every JSON route: answers are 4xx with the common error shape,
// never a 500 and never a crash. The route list comes from the app itself, so new routes are
// covered the day they are added.
import { randomUUID } from 'node:crypto'
import { rmSync } from 'node:fs'
import path from 'node:path'
import { startFakeMail } from '../../server/fakes/mail/fake-mail'
import fc from 'fast-check'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DutyStudy } from '../../server/db/entities'
import { blowerStudy } from './catalogue-fixtures'
import { createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
let admin: SignedInAgent
let buyer: SignedInAgent
let mail: Awaited<ReturnType<typeof startFakeMail>>

beforeAll(async () => {
  // The mailbox routes read the local mail fake; with it down they would rightly answer 503.
  mail = await startFakeMail({ smtpPort: 0, httpPort: 0, dir: path.resolve(`.data/test-robust-mail-${process.pid}`) })
  ctx = await startTestApp({ MAILBOX_URL: `http://127.0.0.1:${mail.httpPort}`, SMTP_PORT: String(mail.smtpPort) })
  admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin'))
  buyer = await signInAs(ctx, await createUser(ctx.dataSource, 'buyer'))
})
afterAll(async () => {
  await ctx.close()
  await mail.close()
  rmSync(path.resolve(`.data/test-robust-mail-${process.pid}`), { recursive: true, force: true })
})

/** Fills path parameters with a random id (or a hostile string). */
function concrete(path: string, value: string): string {
  return path.replace(/:[A-Za-z]+/g, encodeURIComponent(value))
}

const hostileStrings = ["' OR 1=1 --", '<script>alert(1)</script>', '../../etc/passwd', '\u0000', 'Ω'.repeat(300), '{"__proto__":{"x":1}}']

const jsonBody = fc.oneof(
  fc.anything({ maxDepth: 3, maxKeys: 6 }),
  fc.dictionary(fc.constantFrom('input', 'draft', 'version', 'email', 'password', 'name', 'units', 'reason', 'revision', 'organisationId', 'partNumber', 'quantityPerYear', 'lotSize'), fc.oneof(fc.string(), fc.integer(), fc.double(), fc.constant(null), fc.array(fc.string()), fc.constantFrom(...hostileStrings))),
)

describe('every state-changing JSON route under random and hostile bodies', () => {
  it('answers below 500, in the common error shape when it refuses', async () => {
    // Sign-out would end the session the rest of the run relies on; it has its own tests.
    const routes = ctx.handle.routes.filter((route) => route.method !== 'get' && !route.path.includes('webhook') && !route.path.endsWith('/sign-out'))
    expect(routes.length).toBeGreaterThan(10)
    for (const agent of [admin, buyer]) {
      for (const route of routes) {
        await fc.assert(
          fc.asyncProperty(jsonBody, fc.constantFrom(randomUUID(), ...hostileStrings), async (body, param) => {
            const response = await agent.agent[route.method](concrete(route.path, param)).set('X-CSRF-Token', agent.csrf).set('Content-Type', 'application/json').send(JSON.stringify(body))
            if (response.status >= 500) throw new Error(`${route.method.toUpperCase()} ${route.path} answered ${response.status}: ${JSON.stringify(response.body)} for ${JSON.stringify(body)}`)
            if (response.status >= 400) expect(response.body.error?.code, `${route.method} ${route.path}`).toEqual(expect.any(String))
          }),
          { numRuns: 12 },
        )
      }
      // Still signed in: the answers above were real refusals, not a lost session.
      expect((await agent.agent.get('/api/auth/me')).status).toBe(200)
    }
  }, 240_000)

  it('refuses malformed JSON and wrong content on every such route with 400 or 415-like answers, never 500', async () => {
    const routes = ctx.handle.routes.filter((route) => route.method !== 'get' && !route.path.includes('webhook') && !route.path.endsWith('/sign-out'))
    for (const route of routes) {
      const response = await admin.agent[route.method](concrete(route.path, randomUUID())).set('X-CSRF-Token', admin.csrf).set('Content-Type', 'application/json').send('{"input": [1, 2,')
      expect(response.status, `${route.method} ${route.path}`).toBeLessThan(500)
    }
  })
})

describe('every GET route under hostile parameters and query strings', () => {
  it('answers below 500', async () => {
    const routes = ctx.handle.routes.filter((route) => route.method === 'get')
    for (const route of routes) {
      for (const value of [randomUUID(), ...hostileStrings]) {
        const response = await admin.agent.get(concrete(route.path, value)).query({ page: value, pageSize: value, search: value, sort: value, units: value })
        expect(response.status, `GET ${route.path} with ${value.slice(0, 20)}`).toBeLessThan(500)
      }
    }
  }, 120_000)
})

// CSV-shaped noise: separators, quotes, numbers in odd forms, headers that almost fit.
const csvCell = fc.oneof(fc.string({ maxLength: 12 }), fc.double().map(String), fc.integer().map(String), fc.constantFrom('', '"', '""', 'NaN', '-0', '1e400', '1,5', ' 12 ', '=1+1', ...hostileStrings))
const csvText = fc
  .tuple(
    fc.oneof(fc.constantFrom('flow_cfm,static_inh2o,shaft_w', 'flow_m3s,static_pa,shaft_w', 'part_number,name', 'rpm,torque_nm,current_a,input_w'), fc.array(fc.string({ maxLength: 10 }), { maxLength: 6 }).map((cells) => cells.join(','))),
    fc.constantFrom(',', ';', '\t'),
    fc.array(fc.array(csvCell, { maxLength: 8 }), { maxLength: 25 }),
  )
  .map(([header, separator, rows]) => [header, ...rows.map((cells) => cells.join(separator))].join('\n'))

describe('the CSV and curve parsers under random files', () => {
  it('read any text without a 500: rows or row errors', async () => {
    await fc.assert(
      fc.asyncProperty(csvText, async (text) => {
        const asJson = await buyer.agent.post('/api/v1/fan-curves/parse').set('X-CSRF-Token', buyer.csrf).send({ text })
        if (asJson.status >= 500) throw new Error(`fan curve parse answered ${asJson.status} for ${JSON.stringify(text)}`)
        const asFile = await admin.agent.post('/api/admin/catalogue/import').set('X-CSRF-Token', admin.csrf).attach('file', Buffer.from(text), 'random.csv')
        if (asFile.status >= 500) throw new Error(`catalogue import answered ${asFile.status} for ${JSON.stringify(text)}`)
        const curve = await admin.agent
          .post('/api/admin/catalogue/performance')
          .set('X-CSRF-Token', admin.csrf)
          .field('partNumber', 'NO-SUCH-PART')
          .field('tap', 'HI')
          .field('volts', '120')
          .field('hz', '60')
          .attach('file', Buffer.from(text), 'curve.csv')
        if (curve.status >= 500) throw new Error(`performance upload answered ${curve.status} for ${JSON.stringify(text)}`)
      }),
      { numRuns: 40 },
    )
  }, 180_000)
})

describe('request size and SQL-looking text', () => {
  it('refuses a body over the limit with 413', async () => {
    const huge = JSON.stringify({ input: { name: 'x'.repeat(2 * 1024 * 1024) } })
    const response = await buyer.agent.post('/api/v1/studies').set('X-CSRF-Token', buyer.csrf).set('Content-Type', 'application/json').send(huge)
    expect(response.status).toBe(413)
    expect(response.body.error.code).toBe('body_too_large')
  })

  it('stores SQL-looking names as text and shows them back unchanged', async () => {
    const name = "Robert'); DROP TABLE duty_study; --"
    const created = await buyer.agent.post('/api/v1/studies').set('X-CSRF-Token', buyer.csrf).send({ input: blowerStudy({ name }) })
    expect(created.status).toBe(201)
    expect(created.body.name).toBe(name)
    const stored = await ctx.dataSource.getRepository(DutyStudy).findOneByOrFail({ id: created.body.id })
    expect(stored.name).toBe(name)
    expect(await ctx.dataSource.getRepository(DutyStudy).count()).toBeGreaterThan(0)
  })
})
