// express-session store over the `session` table, sharing the app's TypeORM pool so that several
// app processes behind a load balancer see the same sign-ins.
import session from 'express-session'
import { LessThan, type DataSource, type Repository } from 'typeorm'
import { SessionRecord } from '../db/entities'

const DAY_MS = 24 * 60 * 60 * 1000
/**
 * A rolling session's expiry is written at most this often per session and process: express-session
 * touches the store on every response and holds the response until the write commits, so an
 * unthrottled touch costs every request a committed UPDATE. Sessions last 8 hours; a minute of
 * slack in their end is immaterial.
 */
export const TOUCH_EVERY_MS = 60 * 1000
/** Sessions whose stored expiry this process remembers (oldest forgotten first). */
const REMEMBERED_SESSIONS = 10_000

type Callback = (error?: unknown) => void

function expiryOf(data: session.SessionData): number {
  const expires = data.cookie?.expires
  return expires ? new Date(expires).getTime() : Date.now() + DAY_MS
}

function userIdOf(data: session.SessionData): string | null {
  const user: unknown = data.passport?.user
  return typeof user === 'string' ? user : null
}

export class TypeormSessionStore extends session.Store {
  private readonly repository: Repository<SessionRecord>
  private pruneTimer: NodeJS.Timeout | undefined
  /** Stored expiry per session id, as last read or written by this process. */
  private readonly storedExpiry = new Map<string, number>()

  constructor(dataSource: DataSource, pruneEveryMs = 15 * 60 * 1000) {
    super()
    this.repository = dataSource.getRepository(SessionRecord)
    if (pruneEveryMs > 0) {
      this.pruneTimer = setInterval(() => void this.prune().catch(() => undefined), pruneEveryMs)
      this.pruneTimer.unref()
    }
  }

  override get(sid: string, callback: (error: unknown, session?: session.SessionData | null) => void): void {
    // A plain query: it runs before every API request, and the query builder cost more than the round trip.
    this.repository.manager
      .query('SELECT data, expiresAt FROM session WHERE id = ?', [sid])
      .then((rows: Array<{ data: string; expiresAt: number | string }>) => {
        const found = rows[0]
        const row = found ? { data: found.data, expiresAt: Number(found.expiresAt) } : undefined
        if (!row || row.expiresAt <= Date.now()) {
          this.storedExpiry.delete(sid)
          return callback(null, null)
        }
        this.remember(sid, row.expiresAt)
        const parsed: session.SessionData = JSON.parse(row.data)
        callback(null, parsed)
      })
      .catch((error: unknown) => callback(error))
  }

  override set(sid: string, data: session.SessionData, callback?: Callback): void {
    const expiresAt = expiryOf(data)
    this.repository
      .upsert({ id: sid, data: JSON.stringify(data), expiresAt, userId: userIdOf(data) }, ['id'])
      .then(() => {
        this.remember(sid, expiresAt)
        callback?.()
      })
      .catch((error: unknown) => callback?.(error))
  }

  override destroy(sid: string, callback?: Callback): void {
    this.storedExpiry.delete(sid)
    this.repository
      .delete({ id: sid })
      .then(() => callback?.())
      .catch((error: unknown) => callback?.(error))
  }

  override touch(sid: string, data: session.SessionData, callback?: Callback): void {
    const expiresAt = expiryOf(data)
    const stored = this.storedExpiry.get(sid)
    if (stored !== undefined && expiresAt - stored < TOUCH_EVERY_MS) {
      callback?.()
      return
    }
    this.repository
      .update({ id: sid }, { expiresAt })
      .then(() => {
        this.remember(sid, expiresAt)
        callback?.()
      })
      .catch((error: unknown) => callback?.(error))
  }

  /** Ends every session of a user (disabled account, changed role, reset password). */
  async destroyForUser(userId: string): Promise<void> {
    await this.repository.delete({ userId })
  }

  private remember(sid: string, expiresAt: number): void {
    this.storedExpiry.delete(sid)
    this.storedExpiry.set(sid, expiresAt)
    if (this.storedExpiry.size > REMEMBERED_SESSIONS) {
      const oldest = this.storedExpiry.keys().next()
      if (!oldest.done) this.storedExpiry.delete(oldest.value)
    }
  }

  async prune(): Promise<void> {
    await this.repository.delete({ expiresAt: LessThan(Date.now()) })
  }

  close(): void {
    if (this.pruneTimer) clearInterval(this.pruneTimer)
  }
}

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string
    passport?: { user?: unknown }
  }
}
