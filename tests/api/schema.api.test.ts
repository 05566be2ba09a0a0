import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestContext } from './support'

describe('database schema', () => {
  let ctx: TestContext
  beforeAll(async () => {
    ctx = await startTestApp()
  })
  afterAll(async () => {
    await ctx.close()
  })

  it('built by the committed migrations matches the entities exactly', async () => {
    const pending = await ctx.dataSource.driver.createSchemaBuilder().log()
    expect(pending.upQueries.map((query) => query.query)).toEqual([])
  })
})
