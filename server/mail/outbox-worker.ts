// Sends what the outbox holds. Several app processes may run a worker over one database: each
// claims due rows with SELECT ... FOR UPDATE SKIP LOCKED in a short transaction and marks them
// 'sending', so no row is claimed twice; the SMTP conversation happens outside any transaction.
import path from 'node:path'
import type { SendMailOptions } from 'nodemailer'
import type { DataSource } from 'typeorm'
import { In } from 'typeorm'
import { MailOutbox } from '../db/entities/mail-outbox.entity'
import { DEFAULT_BACKOFF, retryDelayMs, type BackoffOptions } from './backoff'
import { isInsideDataDir } from './outbox'
import type { MailTransport } from './transport'

export interface OutboxWorkerOptions {
  /** The From header of every message (MAIL_FROM). */
  from: string
  /** Attachment paths are resolved against this folder (DATA_DIR). */
  dataDir: string
  /** Pause between polls when nothing was due (default 2 s). */
  pollMs: number
  /** Rows claimed per transaction (default 10). */
  batchSize: number
  /** Attempts before a row is given up as 'failed' (default 8, about 10 min of retries). */
  maxAttempts: number
  backoff: BackoffOptions
  /** A row 'sending' for longer than this was left by a crashed process and is handed back (default 15 min). */
  sendingTimeoutMs: number
  /** Clock and dice, replaceable in tests. */
  now: () => Date
  random: () => number
  log: (message: string, error?: unknown) => void
}

export type OutboxWorkerSettings = Pick<OutboxWorkerOptions, 'from' | 'dataDir'> & Partial<Omit<OutboxWorkerOptions, 'from' | 'dataDir'>>

export interface OutboxRunResult {
  /** Rows claimed by this run. */
  claimed: number
  sent: number
  /** Failed this time, to be tried again later. */
  retrying: number
  /** Failed for good (attempts used up, or refused permanently by the server). */
  failed: number
  /** Rows found stuck in 'sending' and handed back. */
  recovered: number
}

const ERROR_LENGTH = 1000

export class OutboxWorker {
  private readonly options: OutboxWorkerOptions
  private running = false
  private timer: NodeJS.Timeout | null = null
  private inFlight: Promise<unknown> | null = null

  constructor(
    private readonly dataSource: DataSource,
    private readonly transport: MailTransport,
    settings: OutboxWorkerSettings,
  ) {
    this.options = {
      pollMs: 2_000,
      batchSize: 10,
      maxAttempts: 8,
      backoff: DEFAULT_BACKOFF,
      sendingTimeoutMs: 15 * 60_000,
      now: () => new Date(),
      random: Math.random,
      log: (message, error) => console.error(`[outbox] ${message}`, error ?? ''),
      ...settings,
    }
    if (!Number.isInteger(this.options.batchSize) || this.options.batchSize < 1) throw new RangeError('batchSize must be a positive integer')
    if (!Number.isInteger(this.options.maxAttempts) || this.options.maxAttempts < 1) throw new RangeError('maxAttempts must be a positive integer')
  }

  /** Polls until stop(); a full batch is followed at once by the next one. */
  start(): void {
    if (this.running) return
    this.running = true
    this.schedule(0)
  }

  /** Stops polling and waits for the batch in flight to finish. */
  async stop(): Promise<void> {
    this.running = false
    if (this.timer) clearTimeout(this.timer)
    this.timer = null
    await this.inFlight
  }

  /** One round: hand back stuck rows, claim one batch of due rows, send them, record the outcome. */
  async runOnce(): Promise<OutboxRunResult> {
    const recovered = await this.recoverStuck()
    const rows = await this.claim()
    const result: OutboxRunResult = { claimed: rows.length, sent: 0, retrying: 0, failed: 0, recovered }
    for (const row of rows) {
      const outcome = await this.deliver(row)
      result[outcome] += 1
    }
    return result
  }

  private schedule(delayMs: number): void {
    this.timer = setTimeout(() => void this.tick(), delayMs)
    // The worker alone must not keep a process alive (tests, CLI scripts).
    this.timer.unref()
  }

  private async tick(): Promise<void> {
    this.timer = null
    if (!this.running) return
    let full = false
    const round = this.runOnce().then(
      (result) => {
        full = result.claimed === this.options.batchSize
      },
      (error: unknown) => this.options.log('a round of the outbox failed; trying again later', error),
    )
    this.inFlight = round
    await round
    this.inFlight = null
    if (this.running) this.schedule(full ? 0 : this.options.pollMs)
  }

  private async recoverStuck(): Promise<number> {
    const now = this.options.now()
    const before = new Date(now.getTime() - this.options.sendingTimeoutMs)
    const result = await this.dataSource.query(
      "UPDATE `mail_outbox` SET `status` = IF(`attempts` >= ?, 'failed', 'pending'), `nextAttemptAt` = ?, `claimedAt` = NULL, " +
        "`lastError` = 'The sending process stopped before the server answered; the message may have gone out once already' " +
        "WHERE `status` = 'sending' AND `claimedAt` < ?",
      [this.options.maxAttempts, now, before],
    )
    return affectedRows(result)
  }

  private async claim(): Promise<MailOutbox[]> {
    const now = this.options.now()
    // READ COMMITTED: no gap locks, so the claim never blocks callers inserting new mail.
    return this.dataSource.transaction('READ COMMITTED', async (manager) => {
      const rows = await manager
        .createQueryBuilder(MailOutbox, 'mail')
        .where('mail.status = :status', { status: 'pending' })
        .andWhere('mail.nextAttemptAt <= :now', { now })
        .orderBy('mail.nextAttemptAt', 'ASC')
        .limit(this.options.batchSize)
        .setLock('pessimistic_write')
        .setOnLocked('skip_locked')
        .getMany()
      if (rows.length === 0) return []
      await manager
        .createQueryBuilder()
        .update(MailOutbox)
        .set({ status: 'sending', claimedAt: now, attempts: () => '`attempts` + 1' })
        .where({ id: In(rows.map((row) => row.id)) })
        .execute()
      return rows.map((row) => Object.assign(row, { status: 'sending', claimedAt: now, attempts: row.attempts + 1 }))
    })
  }

  private async deliver(row: MailOutbox): Promise<'sent' | 'retrying' | 'failed'> {
    let info: { messageId?: string }
    try {
      info = await this.transport.sendMail(this.compose(row))
    } catch (error) {
      return this.recordFailure(row, error)
    }
    await this.dataSource.query(
      "UPDATE `mail_outbox` SET `status` = 'sent', `sentAt` = ?, `claimedAt` = NULL, `lastError` = NULL, `messageId` = ? " +
        "WHERE `id` = ? AND `status` = 'sending' AND `attempts` = ?",
      [this.options.now(), info.messageId?.slice(0, 255) ?? null, row.id, row.attempts],
    )
    return 'sent'
  }

  private async recordFailure(row: MailOutbox, error: unknown): Promise<'retrying' | 'failed'> {
    const now = this.options.now()
    const giveUp = row.attempts >= this.options.maxAttempts || isPermanentRefusal(error)
    const next = giveUp ? now : new Date(now.getTime() + retryDelayMs(row.attempts, this.options.backoff, this.options.random))
    await this.dataSource.query(
      'UPDATE `mail_outbox` SET `status` = ?, `nextAttemptAt` = ?, `claimedAt` = NULL, `lastError` = ? ' +
        "WHERE `id` = ? AND `status` = 'sending' AND `attempts` = ?",
      [giveUp ? 'failed' : 'pending', next, describeError(error), row.id, row.attempts],
    )
    return giveUp ? 'failed' : 'retrying'
  }

  private compose(row: MailOutbox): SendMailOptions {
    const dataDir = path.resolve(this.options.dataDir)
    return {
      from: this.options.from,
      to: row.to,
      cc: row.cc.length > 0 ? row.cc : undefined,
      subject: row.subject,
      text: row.text,
      html: row.html ?? undefined,
      // One Message-ID per outbox row: a copy sent again after a crash can be recognised as the same mail.
      messageId: `<${row.id}@outbox.spinwright>`,
      headers: { 'X-Spinwright-Kind': row.kind, ...(row.reference ? { 'X-Spinwright-Reference': row.reference } : {}) },
      // Attachments come from our own rows, but never let a stored value make nodemailer fetch a URL.
      disableUrlAccess: true,
      attachments: row.attachments.map((attachment) => {
        if (attachment.contentBase64 !== undefined) {
          return { filename: attachment.filename, contentType: attachment.contentType, content: Buffer.from(attachment.contentBase64, 'base64') }
        }
        const relative = attachment.path ?? ''
        if (!isInsideDataDir(relative)) throw new Error(`attachment path ${relative} is outside the data directory`)
        return { filename: attachment.filename, contentType: attachment.contentType, path: path.join(dataDir, relative) }
      }),
    }
  }
}

/** SMTP 5xx replies (unknown mailbox, message refused) will not change by trying again. */
function isPermanentRefusal(error: unknown): boolean {
  const code = typeof error === 'object' && error !== null && 'responseCode' in error ? error.responseCode : undefined
  // 530/534/535 are authentication problems: fixable by configuration, so keep retrying those.
  return typeof code === 'number' && code >= 500 && code < 600 && ![530, 534, 535].includes(code)
}

function describeError(error: unknown): string {
  const parts: string[] = []
  if (typeof error === 'object' && error !== null) {
    if ('code' in error && typeof error.code === 'string') parts.push(error.code)
    if ('responseCode' in error && typeof error.responseCode === 'number') parts.push(String(error.responseCode))
  }
  const message = error instanceof Error ? error.message : String(error)
  return (parts.length > 0 ? `${parts.join(' ')}: ${message}` : message).slice(0, ERROR_LENGTH)
}

function affectedRows(result: unknown): number {
  if (typeof result === 'object' && result !== null && 'affectedRows' in result && typeof result.affectedRows === 'number') return result.affectedRows
  return 0
}
