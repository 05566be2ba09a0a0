// The session store over MariaDB: rolling expiry written at most once a minute per session, so a
// busy page does not commit an UPDATE on every request, and still extended when it matters.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { SessionData } from 'express-session'
import { TOUCH_EVERY_MS, TypeormSessionStore } from '../../server/auth/session-store'
import { SessionRecord } from '../../server/db/entities'
import { startTestApp, type TestContext } from './support'

let ctx: TestContext
let store: TypeormSessionStore

beforeAll(async () => {
  ctx = await startTestApp()
  store = new TypeormSessionStore(ctx.dataSource, 0)
})

afterAll(async () => {
  store.close()
  await ctx.close()
})

const call = (fn: (done: (error?: unknown) => void) => void) => new Promise<void>((resolve, reject) => fn((error) => (error ? reject(error) : resolve())))
const data = (expires: number) => ({ cookie: { expires: new Date(expires), originalMaxAge: 8 * 3600_000 } }) as unknown as SessionData
const storedExpiry = async (sid: string) => (await ctx.dataSource.getRepository(SessionRecord).findOneByOrFail({ id: sid })).expiresAt

describe('session store', () => {
  it('skips a touch within a minute of the stored expiry and writes one after it', async () => {
    const sid = randomUUID()
    const start = Date.now() + 8 * 3600_000
    await call((done) => store.set(sid, data(start), done))
    expect(await storedExpiry(sid)).toBe(start)

    await call((done) => store.touch(sid, data(start + 5_000), done))
    expect(await storedExpiry(sid)).toBe(start)

    await call((done) => store.touch(sid, data(start + TOUCH_EVERY_MS + 1), done))
    expect(await storedExpiry(sid)).toBe(start + TOUCH_EVERY_MS + 1)
  })

  it('writes the touch of a session it has not read or written itself', async () => {
    const sid = randomUUID()
    const start = Date.now() + 3600_000
    const other = new TypeormSessionStore(ctx.dataSource, 0)
    await call((done) => other.set(sid, data(start), done))
    other.close()
    await call((done) => store.touch(sid, data(start + 1_000), done))
    expect(await storedExpiry(sid)).toBe(start + 1_000)
  })

  it('forgets a destroyed session, so it is not found again', async () => {
    const sid = randomUUID()
    await call((done) => store.set(sid, data(Date.now() + 3600_000), done))
    await call((done) => store.destroy(sid, done))
    const found = await new Promise((resolve, reject) => store.get(sid, (error, session) => (error ? reject(error) : resolve(session))))
    expect(found).toBeNull()
  })
})
