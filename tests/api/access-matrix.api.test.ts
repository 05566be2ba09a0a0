// The access matrix: every API route, called as anonymous, buyer (own and another organisation),
// sales and admin. The table below is the specification; the test fails when the app has a route
// the table lacks (or the other way round), when a route's declared roles differ from the table,
// or when a real call answers against it.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import type { Role } from '../../shared/contracts/auth.contract'
import { freePort } from '../../scripts/lib/services'
import { blowerStudy, insertVariants } from './catalogue-fixtures'
import { assignAccount, priceListFor } from './quote-fixtures'
import { anonymousAgent, createOrganisation, createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

type Rule = 'public' | 'signed-in' | readonly Role[]
const staff = ['sales', 'admin'] as const
const all = ['buyer', 'sales', 'admin'] as const
const admin = ['admin'] as const

const MATRIX: Record<string, Rule> = {
  'GET /api/health': 'public',
  'GET /api/auth/csrf': 'public',
  'POST /api/auth/sign-in': 'public',
  'POST /api/auth/sign-out': 'public',
  'GET /api/auth/me': 'signed-in',
  'PATCH /api/auth/me/preferences': 'signed-in',
  'GET /api/auth/invitations/:token': 'public',
  'POST /api/auth/invitations/:token': 'public',
  'GET /api/admin/users': admin,
  'GET /api/admin/users/:id': admin,
  'POST /api/admin/users': admin,
  'POST /api/admin/users/:id/invitation': admin,
  'PUT /api/admin/users/:id/role': admin,
  'POST /api/admin/users/:id/disable': admin,
  'POST /api/admin/users/:id/enable': admin,
  'PUT /api/admin/users/:id/discount-limit': admin,
  'GET /api/admin/organisations': admin,
  'GET /api/admin/organisations/:id': admin,
  'POST /api/admin/organisations': admin,
  'PUT /api/admin/organisations/:id': admin,
  'GET /api/admin/sales-engineers': admin,
  'GET /api/admin/price-lists': admin,
  'GET /api/admin/price-lists/:id': admin,
  'PUT /api/admin/price-lists/:id': admin,
  'GET /api/admin/price-lists/:id/entries': admin,
  'PUT /api/admin/price-lists/:id/entries/:entryId': admin,
  'POST /api/admin/price-lists/:id/copy': admin,
  'GET /api/admin/copper-index': admin,
  'POST /api/admin/copper-index': admin,
  'GET /api/admin/audit': admin,
  'GET /api/admin/audit/facets': admin,
  'GET /api/admin/mailbox': admin,
  'DELETE /api/admin/mailbox': admin,
  'GET /api/admin/mailbox/:id': admin,
  'GET /api/admin/mailbox/:id/attachments/:index': admin,
  'GET /api/admin/outbox': admin,
  'POST /api/admin/outbox/:id/retry': admin,
  'GET /api/admin/catalogue/import/template.csv': admin,
  'POST /api/admin/catalogue/import': admin,
  'GET /api/admin/catalogue/import/batches/:id': admin,
  'POST /api/admin/catalogue/import/batches/:id/commit': admin,
  'POST /api/admin/catalogue/performance': admin,
  'POST /api/admin/catalogue/performance/batches/:id/commit': admin,
  'GET /api/admin/catalogue/datasheets': admin,
  'POST /api/admin/catalogue/datasheets': admin,
  'DELETE /api/admin/catalogue/datasheets/:id': admin,
  'GET /api/v1/catalogue/variants': 'public',
  'GET /api/v1/catalogue/variants/:partNumber': 'public',
  'GET /api/v1/catalogue/facets': 'public',
  'GET /api/v1/catalogue/demo-fans': 'public',
  'GET /api/v1/catalogue/variants/:partNumber/datasheets/:id': 'public',
  'POST /api/v1/fan-curves/parse': 'public',
  'POST /api/v1/studies/preview-run': 'public',
  'GET /api/v1/studies': all,
  'POST /api/v1/studies': all,
  'GET /api/v1/studies/:id': all,
  'PUT /api/v1/studies/:id': all,
  'DELETE /api/v1/studies/:id': all,
  'POST /api/v1/studies/:id/runs': all,
  'GET /api/v1/studies/:id/runs/:runId': all,
  'GET /api/v1/studies/:id/runs/:runId/export.csv': all,
  'POST /api/v1/studies/:id/share': all,
  'DELETE /api/v1/studies/:id/share': all,
  'GET /api/v1/shared/studies/:token': all,
  'GET /api/v1/quotes': all,
  'POST /api/v1/quotes/requests': ['buyer'],
  'POST /api/v1/quotes': staff,
  'GET /api/v1/quotes/:id': all,
  'PUT /api/v1/quotes/:id/draft': staff,
  'POST /api/v1/quotes/:id/issue': staff,
  'POST /api/v1/quotes/:id/accept': ['buyer'],
  'POST /api/v1/quotes/:id/withdraw': all,
  'GET /api/v1/quotes/:id/revisions/:letter/pdf': all,
  'GET /api/v1/accounts': staff,
  'POST /api/v1/quotes/:id/deposit': ['buyer'],
  'GET /api/v1/quotes/:id/deposit': all,
  'GET /api/v1/orders': all,
  'GET /api/v1/orders/:id': all,
  'POST /api/v1/orders/:id/confirm': staff,
}

let ctx: TestContext
let personas: Record<'buyer' | 'otherBuyer' | 'sales' | 'admin', SignedInAgent>
let anonymous: { agent: ReturnType<typeof request.agent>; csrf: string }
const prefix = `AM${randomUUID().slice(0, 6).toUpperCase()}`
const own: { studyId: string; runId: string; quoteId: string } = { studyId: '', runId: '', quoteId: '' }

beforeAll(async () => {
  // A closed port for the mailbox: the matrix must never clear a developer's real mailbox.
  const closed = await freePort(45_000)
  ctx = await startTestApp({ MAILBOX_URL: `http://127.0.0.1:${closed}` })
  await insertVariants(ctx.dataSource, prefix, [{ partNumber: 'PSC', type: 'psc', volts: 230, hz: 50 }])
  const org = await createOrganisation(ctx.dataSource)
  const salesUser = await createUser(ctx.dataSource, 'sales')
  await assignAccount(ctx.dataSource, org.id, (await priceListFor(ctx.dataSource, prefix)).id, salesUser)
  personas = {
    buyer: await signInAs(ctx, await createUser(ctx.dataSource, 'buyer', org)),
    otherBuyer: await signInAs(ctx, await createUser(ctx.dataSource, 'buyer')),
    sales: await signInAs(ctx, salesUser),
    admin: await signInAs(ctx, await createUser(ctx.dataSource, 'admin')),
  }
  anonymous = await anonymousAgent(ctx)
  const buyer = personas.buyer
  own.studyId = (await buyer.agent.post('/api/v1/studies').set('X-CSRF-Token', buyer.csrf).send({ input: blowerStudy() })).body.id
  own.runId = (await buyer.agent.post(`/api/v1/studies/${own.studyId}/runs`).set('X-CSRF-Token', buyer.csrf).send({})).body.id
  own.quoteId = (
    await buyer.agent.post('/api/v1/quotes/requests').set('X-CSRF-Token', buyer.csrf).send({ partNumber: `${prefix}-PSC`, quantityPerYear: 1000, lotSize: 200 })
  ).body.id
})
afterAll(async () => {
  await ctx.close()
})

const key = (route: { method: string; path: string }) => `${route.method.toUpperCase()} ${route.path}`

function fill(path: string): string {
  return path
    .replace(':runId', randomUUID())
    .replace(':entryId', randomUUID())
    .replace(':partNumber', 'NO-SUCH-PART')
    .replace(':letter', 'A')
    .replace(':index', '0')
    .replace(':token', 'x'.repeat(43))
    .replace(':id', randomUUID())
}

async function call(agent: ReturnType<typeof request.agent>, csrf: string, method: string, path: string) {
  const verb = method.toLowerCase()
  if (verb !== 'get' && verb !== 'post' && verb !== 'put' && verb !== 'patch' && verb !== 'delete') throw new Error(`unknown method ${method}`)
  const pending = agent[verb](path)
  return verb === 'get' ? pending : pending.set('X-CSRF-Token', csrf).send({})
}

describe('the access matrix', () => {
  it('lists exactly the routes the app has, with the roles each declares', () => {
    const declared = Object.fromEntries(ctx.handle.routes.map((route) => [key(route), route.access]))
    expect(Object.keys(declared).sort()).toEqual(Object.keys(MATRIX).sort())
    for (const [name, rule] of Object.entries(MATRIX)) expect(declared[name], name).toEqual(rule)
  })

  it('answers every route for every caller as the matrix says', async () => {
    const problems: string[] = []
    for (const [name, rule] of Object.entries(MATRIX)) {
      const [method = 'GET', path = ''] = name.split(' ')
      if (path.endsWith('/sign-out')) continue
      const url = fill(path)
      const anon = await call(anonymous.agent, anonymous.csrf, method, url)
      const anonAllowed = rule === 'public'
      if (anonAllowed ? anon.status === 401 || anon.status === 403 : anon.status !== 401) problems.push(`${name} as anonymous: ${anon.status}`)
      for (const [persona, signed] of Object.entries(personas)) {
        const role: Role = persona === 'otherBuyer' ? 'buyer' : persona === 'buyer' ? 'buyer' : persona === 'sales' ? 'sales' : 'admin'
        const allowed = rule === 'public' || rule === 'signed-in' || rule.includes(role)
        const response = await call(signed.agent, signed.csrf, method, url)
        // The mailbox is deliberately pointed at a closed port here; its 503 is the right answer.
        const mailboxDown = response.status === 503 && path.includes('/mailbox')
        if (response.status >= 500 && !mailboxDown) problems.push(`${name} as ${persona}: ${response.status}`)
        else if (allowed ? response.status === 401 || response.status === 403 : response.status !== 403) problems.push(`${name} as ${persona}: ${response.status}`)
      }
    }
    expect(problems).toEqual([])
  }, 120_000)

  it('keeps one organisation’s studies, runs and quotes from another organisation’s buyer', async () => {
    const reads = [
      `/api/v1/studies/${own.studyId}`,
      `/api/v1/studies/${own.studyId}/runs/${own.runId}`,
      `/api/v1/studies/${own.studyId}/runs/${own.runId}/export.csv`,
      `/api/v1/quotes/${own.quoteId}`,
      `/api/v1/quotes/${own.quoteId}/deposit`,
    ]
    for (const path of reads) {
      expect((await personas.buyer.agent.get(path)).status, `own buyer ${path}`).toBe(200)
      expect((await personas.otherBuyer.agent.get(path)).status, `other buyer ${path}`).toBe(404)
      expect((await personas.sales.agent.get(path)).status, `sales ${path}`).toBe(200)
      expect((await personas.admin.agent.get(path)).status, `admin ${path}`).toBe(200)
    }
  })

  it('refuses the payment webhook without a valid signature, whoever calls it', async () => {
    const response = await request(ctx.handle.app).post('/api/payments/webhook').set('Content-Type', 'application/json').send('{"id":"evt_forged"}')
    expect(response.status).toBe(400)
  })
})
