import path from 'node:path'
import { rmSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { startMaria, type MariaInstance } from '../../scripts/lib/mariadb'
import { freePort } from '../../scripts/lib/services'
import { createApp } from '../../server/app'
import { createDataSource } from '../../server/db/data-source'
import { startTestApp, testConfig, type TestContext } from './support'

describe('GET /api/health', () => {
  let ctx: TestContext
  beforeAll(async () => {
    ctx = await startTestApp()
  })
  afterAll(async () => {
    await ctx.close()
  })

  it('answers ok when the database answers', async () => {
    const response = await request(ctx.handle.app).get('/api/health')
    expect(response.status).toBe(200)
    expect(response.body).toEqual({ status: 'ok', database: 'ok' })
  })

  it('sets the security headers, with a content security policy that allows nothing from elsewhere', async () => {
    const response = await request(ctx.handle.app).get('/api/health')
    const policy = String(response.headers['content-security-policy'])
    expect(policy).toContain("default-src 'self'")
    expect(policy).toContain("script-src 'self'")
    expect(policy).not.toMatch(/https?:/)
    expect(response.headers['x-powered-by']).toBeUndefined()
  })
})

describe('GET /api/health with the database stopped under the running app', () => {
  // A MariaDB of its own, so stopping it does not disturb the other suites.
  const dir = path.resolve(`.data/test-fault-${process.pid}/mariadb`)
  let maria: MariaInstance
  let port: number

  beforeAll(async () => {
    rmSync(dir, { recursive: true, force: true })
    port = await freePort(3357)
    maria = await startMaria({ dir, port, database: 'spinwright_fault', user: 'spinwright', password: 'fault-test' })
  })
  afterAll(async () => {
    await maria.stop()
    rmSync(path.dirname(dir), { recursive: true, force: true })
  })

  it('answers 503 with the reason while the database is down, and ok again when it returns', async () => {
    const config = testConfig({ DB_PORT: String(port), DB_NAME: 'spinwright_fault', DB_PASSWORD: 'fault-test' })
    const dataSource = createDataSource(config)
    await dataSource.initialize()
    await dataSource.runMigrations()
    const handle = createApp({ config, dataSource, log: () => undefined })
    try {
      expect((await request(handle.app).get('/api/health')).status).toBe(200)
      const visitor = request.agent(handle.app)
      await visitor.get('/api/auth/csrf').expect(200)

      await maria.stop()
      const down = await request(handle.app).get('/api/health')
      expect(down.status).toBe(503)
      expect(down.body.status).toBe('error')
      expect(down.body.database).toBe('unreachable')
      expect(down.body.reason).toMatch(/database/)

      // Other routes fail clearly too, in the common error shape, without a stack trace.
      const during = await visitor.get('/api/auth/csrf')
      expect(during.status).toBe(503)
      expect(during.body.error.code).toBe('database_unavailable')
      expect(JSON.stringify(during.body)).not.toMatch(/at .*\.ts:\d+/)

      maria = await startMaria({ dir, port, database: 'spinwright_fault', user: 'spinwright', password: 'fault-test' })
      let recovered = 0
      for (let attempt = 0; attempt < 20 && recovered !== 200; attempt += 1) {
        recovered = (await request(handle.app).get('/api/health')).status
        if (recovered !== 200) await new Promise((resolve) => setTimeout(resolve, 250))
      }
      expect(recovered).toBe(200)
      expect((await visitor.get('/api/auth/csrf')).status).toBe(200)
    } finally {
      handle.close()
      await dataSource.destroy()
    }
  })
})
