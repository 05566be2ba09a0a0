// express-session store over the `session` table, sharing the app's TypeORM pool so that several
// app processes behind a load balancer see the same sign-ins.
import session from 'express-session'
import { LessThan, type DataSource, type Repository } from 'typeorm'
import { SessionRecord } from '../db/entities'

const DAY_MS = 24 * 60 * 60 * 1000

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

  constructor(dataSource: DataSource, pruneEveryMs = 15 * 60 * 1000) {
    super()
    this.repository = dataSource.getRepository(SessionRecord)
    if (pruneEveryMs > 0) {
      this.pruneTimer = setInterval(() => void this.prune().catch(() => undefined), pruneEveryMs)
      this.pruneTimer.unref()
    }
  }

  override get(sid: string, callback: (error: unknown, session?: session.SessionData | null) => void): void {
    this.repository
      .findOneBy({ id: sid })
      .then((row) => {
        if (!row || row.expiresAt <= Date.now()) return callback(null, null)
        const parsed: session.SessionData = JSON.parse(row.data)
        callback(null, parsed)
      })
      .catch((error: unknown) => callback(error))
  }

  override set(sid: string, data: session.SessionData, callback?: Callback): void {
    this.repository
      .upsert({ id: sid, data: JSON.stringify(data), expiresAt: expiryOf(data), userId: userIdOf(data) }, ['id'])
      .then(() => callback?.())
      .catch((error: unknown) => callback?.(error))
  }

  override destroy(sid: string, callback?: Callback): void {
    this.repository
      .delete({ id: sid })
      .then(() => callback?.())
      .catch((error: unknown) => callback?.(error))
  }

  override touch(sid: string, data: session.SessionData, callback?: Callback): void {
    this.repository
      .update({ id: sid }, { expiresAt: expiryOf(data) })
      .then(() => callback?.())
      .catch((error: unknown) => callback?.(error))
  }

  /** Ends every session of a user (disabled account, changed role, reset password). */
  async destroyForUser(userId: string): Promise<void> {
    await this.repository.delete({ userId })
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
