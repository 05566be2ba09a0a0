// Helpers for API tests: the in-process app over the real test database, and data builders.
import { randomUUID } from 'node:crypto'
import { inject } from 'vitest'
import request from 'supertest'
import type { DataSource } from 'typeorm'
import { createApp, type AppHandle } from '../../server/app'
import { loadConfig, type Config } from '../../server/config'
import { createDataSource } from '../../server/db/data-source'
import { Organisation, User } from '../../server/db/entities'
import { hashPassword } from '../../server/services/user.service'
import type { Role } from '../../shared/contracts/auth.contract'

export const PASSWORD = 'Correct-horse-7'

export interface TestContext {
  config: Config
  dataSource: DataSource
  handle: AppHandle
  close(): Promise<void>
}

export function testConfig(overrides: NodeJS.ProcessEnv = {}): Config {
  const db = inject('testDatabase')
  return loadConfig({
    NODE_ENV: 'test',
    SESSION_SECRET: 'test-secret-that-is-long-enough-1234567890',
    DB_HOST: db.host,
    DB_PORT: String(db.port),
    DB_NAME: db.database,
    DB_USER: 'spinwright',
    DB_PASSWORD: db.password,
    SIGNIN_LIMIT_PER_IP: '10000',
    SIGNIN_LIMIT_PER_ACCOUNT: '10000',
    ...overrides,
  })
}

/** `log` receives what the app logs as an error (default: printed); a test may collect it. */
export async function startTestApp(overrides: NodeJS.ProcessEnv = {}, log: (error: unknown) => void = (error) => console.error('[app error]', error)): Promise<TestContext> {
  const config = testConfig(overrides)
  const dataSource = createDataSource(config)
  await dataSource.initialize()
  const handle = createApp({ config, dataSource, log })
  return {
    config,
    dataSource,
    handle,
    close: async () => {
      handle.close()
      await dataSource.destroy()
    },
  }
}

export async function createOrganisation(dataSource: DataSource, kind: 'maker' | 'customer' = 'customer', tier: 'oem' | 'distributor' | null = 'oem'): Promise<Organisation> {
  const repository = dataSource.getRepository(Organisation)
  return repository.save(repository.create({ name: `Org ${randomUUID().slice(0, 8)}`, kind, tier: kind === 'maker' ? null : tier, currency: 'USD' }))
}

export async function createUser(dataSource: DataSource, role: Role, organisation?: Organisation): Promise<User> {
  const org = organisation ?? (await createOrganisation(dataSource, role === 'buyer' ? 'customer' : 'maker'))
  const repository = dataSource.getRepository(User)
  return repository.save(
    repository.create({
      email: `${role}-${randomUUID().slice(0, 8)}@example.test`,
      name: `Test ${role}`,
      role,
      passwordHash: await hashPassword(PASSWORD),
      organisationId: org.id,
    }),
  )
}

export interface SignedInAgent {
  agent: ReturnType<typeof request.agent>
  csrf: string
  user: User
}

/** A supertest agent (cookie jar) signed in as `user`, with the session's CSRF token. */
export async function signInAs(ctx: TestContext, user: User, password = PASSWORD): Promise<SignedInAgent> {
  const agent = request.agent(ctx.handle.app)
  const first = await agent.get('/api/auth/csrf').expect(200)
  const signIn = await agent.post('/api/auth/sign-in').set('X-CSRF-Token', first.body.token).send({ email: user.email, password })
  if (signIn.status !== 200) throw new Error(`sign-in failed: ${signIn.status} ${JSON.stringify(signIn.body)}`)
  const csrf = await agent.get('/api/auth/csrf').expect(200)
  return { agent, csrf: csrf.body.token, user }
}

export async function anonymousAgent(ctx: TestContext): Promise<{ agent: ReturnType<typeof request.agent>; csrf: string }> {
  const agent = request.agent(ctx.handle.app)
  const response = await agent.get('/api/auth/csrf').expect(200)
  return { agent, csrf: response.body.token }
}
