import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn, type Relation } from 'typeorm'
import type { QuoteDocument, QuoteDraft, QuoteRequest, QuoteState } from '../../../shared/contracts/quote.contract'
import { QUOTE_STATES } from '../../../shared/contracts/quote.contract'
import { Organisation } from './organisation.entity'
import { User } from './user.entity'

/** The quote as it lives: request, current draft, state. Issued revisions are QuoteRevisionRecord rows. */
@Entity('quote')
@Index(['organisationId', 'updatedAt'])
export class QuoteRecordEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string

  /** SW-<year>-<sequence>, given at the first issue. */
  @Index({ unique: true })
  @Column({ type: 'varchar', length: 20, nullable: true })
  number: string | null

  @Column({ type: 'enum', enum: QUOTE_STATES })
  state: QuoteState

  @Column({ type: 'uuid' })
  organisationId: string

  @ManyToOne(() => Organisation, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'organisationId' })
  organisation: Relation<Organisation>

  @Column({ type: 'uuid', nullable: true })
  requestedById: string | null

  @ManyToOne(() => User, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'requestedById' })
  requestedBy: Relation<User> | null

  @Column({ type: 'uuid', nullable: true })
  salesEngineerId: string | null

  @ManyToOne(() => User, { onDelete: 'RESTRICT', nullable: true })
  @JoinColumn({ name: 'salesEngineerId' })
  salesEngineer: Relation<User> | null

  @Column({ type: 'uuid', nullable: true })
  studyId: string | null

  @Column({ type: 'char', length: 3 })
  currency: string

  @Column({ type: 'json', nullable: true })
  request: QuoteRequest | null

  @Column({ type: 'json', nullable: true })
  draft: QuoteDraft | null

  /** Letter of the newest issued revision. */
  @Column({ type: 'varchar', length: 2, nullable: true })
  currentRevision: string | null

  @Column({ type: 'date', nullable: true })
  validUntil: string | null

  @Column({ type: 'varchar', length: 500, nullable: true })
  withdrawnReason: string | null

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt: Date

  @VersionColumn({ type: 'int' })
  version: number
}

/** An issued revision: frozen, never updated. */
@Entity('quote_revision')
@Index(['quoteId', 'letter'], { unique: true })
export class QuoteRevisionRecord {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Column({ type: 'uuid' })
  quoteId: string

  @ManyToOne(() => QuoteRecordEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'quoteId' })
  quote: Relation<QuoteRecordEntity>

  @Column({ type: 'varchar', length: 2 })
  letter: string

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 22 })
  fullNumber: string

  @Column({ type: 'uuid' })
  issuedById: string

  @Column({ type: 'date' })
  validUntil: string

  @Column({ type: 'int' })
  total: number

  @Column({ type: 'int' })
  depositAmount: number

  @Column({ type: 'json' })
  document: QuoteDocument

  /** Generated PDF under the data directory (a generated name, never user input). */
  @Column({ type: 'varchar', length: 200, nullable: true })
  pdfFile: string | null

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  issuedAt: Date
}

/** Next quote sequence per year, claimed with SELECT ... FOR UPDATE so concurrent issues get unique numbers. */
@Entity('quote_sequence')
export class QuoteSequence {
  @PrimaryColumn({ type: 'smallint' })
  year: number

  @Column({ type: 'int' })
  next: number
}

@Entity('quote_acceptance')
export class QuoteAcceptance {
  @PrimaryColumn({ type: 'uuid' })
  quoteId: string

  @Column({ type: 'uuid' })
  revisionId: string

  @Column({ type: 'varchar', length: 2 })
  revision: string

  @Column({ type: 'uuid' })
  acceptedById: string

  @Column({ type: 'varchar', length: 120 })
  acceptedByName: string

  @Column({ type: 'varchar', length: 60 })
  purchaseOrderRef: string

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  acceptedAt: Date
}

/** A deposit attempt through a Checkout Session; at most one of a quote is ever paid. */
@Entity('deposit_payment')
export class DepositPayment {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Index()
  @Column({ type: 'uuid' })
  quoteId: string

  @Column({ type: 'varchar', length: 2 })
  revision: string

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 255 })
  checkoutSessionId: string

  @Column({ type: 'int' })
  amount: number

  @Column({ type: 'char', length: 3 })
  currency: string

  @Column({ type: 'enum', enum: ['open', 'paid', 'expired'] })
  status: 'open' | 'paid' | 'expired'

  @Column({ type: 'varchar', length: 255, nullable: true })
  paymentIntentId: string | null

  /** Unique when set: the database itself refuses a second paid deposit of one quote. */
  @Index({ unique: true })
  @Column({ type: 'uuid', nullable: true })
  paidQuoteId: string | null

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date

  @Column({ type: 'datetime', precision: 3, nullable: true })
  paidAt: Date | null
}

/** Webhook events already handled (replays and duplicates change nothing). */
@Entity('payment_event')
export class PaymentEvent {
  @PrimaryColumn({ type: 'varchar', length: 255 })
  eventId: string

  @Column({ type: 'varchar', length: 80 })
  type: string

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  receivedAt: Date
}

@Entity('sales_order')
export class SalesOrder {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 24 })
  number: string

  @Index({ unique: true })
  @Column({ type: 'uuid' })
  quoteId: string

  @Column({ type: 'varchar', length: 2 })
  revision: string

  @Index()
  @Column({ type: 'uuid' })
  organisationId: string

  @Column({ type: 'int' })
  total: number

  @Column({ type: 'int' })
  depositPaid: number

  @Column({ type: 'char', length: 3 })
  currency: string

  @Column({ type: 'varchar', length: 60 })
  purchaseOrderRef: string

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date

  @Column({ type: 'datetime', precision: 3, nullable: true })
  confirmedAt: Date | null
}
