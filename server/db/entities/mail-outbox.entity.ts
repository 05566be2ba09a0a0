import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm'
import { OUTBOX_STATUSES, type OutboxStatus } from '../../../shared/contracts/mailbox.contract'

export { OUTBOX_STATUSES, type OutboxStatus }

/**
 * A file to attach: either `path`, relative to the data directory (generated PDFs live there), or
 * small `contentBase64` kept in the row itself. Exactly one of the two is set.
 */
export interface OutboxAttachment {
  filename: string
  contentType: string
  path?: string
  contentBase64?: string
}

/**
 * One e-mail waiting to go out, written in the same transaction as the business change that
 * causes it. Worker processes claim due rows with SELECT ... FOR UPDATE SKIP LOCKED.
 */
@Entity('mail_outbox')
@Index(['status', 'nextAttemptAt'])
@Index(['kind', 'reference'])
export class MailOutbox {
  @PrimaryGeneratedColumn('uuid')
  id: string

  /** What the mail is about, for the admin's view ('quote-issued', 'deposit-received' ...). */
  @Column({ type: 'varchar', length: 40 })
  kind: string

  /** The business record it belongs to (e.g. a quote id), when there is one. */
  @Column({ type: 'varchar', length: 64, nullable: true })
  reference: string | null

  @Column({ type: 'json' })
  to: string[]

  @Column({ type: 'json' })
  cc: string[]

  @Column({ type: 'varchar', length: 300 })
  subject: string

  @Column({ type: 'mediumtext' })
  text: string

  @Column({ type: 'mediumtext', nullable: true })
  html: string | null

  @Column({ type: 'json' })
  attachments: OutboxAttachment[]

  @Column({ type: 'enum', enum: OUTBOX_STATUSES, default: 'pending' })
  status: OutboxStatus

  /** Sending attempts started so far (counted when a worker claims the row). */
  @Column({ type: 'int', default: 0 })
  attempts: number

  @Column({ type: 'datetime', precision: 3 })
  nextAttemptAt: Date

  /** When a worker marked the row 'sending'; a row left there too long is handed back. */
  @Column({ type: 'datetime', precision: 3, nullable: true })
  claimedAt: Date | null

  @Column({ type: 'varchar', length: 1000, nullable: true })
  lastError: string | null

  /** The Message-ID the transport reported, to find the mail in a server's logs. */
  @Column({ type: 'varchar', length: 255, nullable: true })
  messageId: string | null

  @Index()
  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date

  @Column({ type: 'datetime', precision: 3, nullable: true })
  sentAt: Date | null
}
