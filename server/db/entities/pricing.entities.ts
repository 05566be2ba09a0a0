import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn, type Relation } from 'typeorm'
import type { OptionAdder, QuantityBreak } from '../../../shared/pricing'
import { Organisation } from './organisation.entity'

/** A price list in one currency with its validity and the copper index its prices were set at. */
@Entity('price_list')
export class PriceListRecord {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 40 })
  code: string

  @Column({ type: 'varchar', length: 120 })
  name: string

  @Column({ type: 'char', length: 3 })
  currency: string

  @Column({ type: 'date' })
  validFrom: string

  @Column({ type: 'date', nullable: true })
  validTo: string | null

  /** Minor units per kg. */
  @Column({ type: 'int' })
  baseCopperIndexPerKg: number

  @Column({ type: 'boolean', default: false })
  copperCreditBelowBase: boolean

  @Column({ type: 'json' })
  tierDiscountBp: { oem: number; distributor: number }

  @Column({ type: 'json' })
  options: OptionAdder[]

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt: Date

  @VersionColumn({ type: 'int' })
  version: number
}

@Entity('price_list_entry')
@Index(['priceListId', 'variantId'], { unique: true })
export class PriceListEntryRecord {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Column({ type: 'uuid' })
  priceListId: string

  @ManyToOne(() => PriceListRecord, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'priceListId' })
  priceList: Relation<PriceListRecord>

  @Column({ type: 'uuid' })
  variantId: string

  /** Minor units per unit. */
  @Column({ type: 'int' })
  unitPrice: number

  @Column({ type: 'json' })
  breaks: QuantityBreak[]

  @Column({ type: 'int' })
  moq: number

  @Column({ type: 'int' })
  leadTimeDays: number
}

/** Copper index values (minor units per kg) maintained by admin, with effective dates; history kept. */
@Entity('copper_index')
@Index(['currency', 'effectiveFrom'])
export class CopperIndexRecord {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Column({ type: 'char', length: 3 })
  currency: string

  @Column({ type: 'int' })
  valuePerKg: number

  @Column({ type: 'date' })
  effectiveFrom: string

  @Column({ type: 'uuid', nullable: true })
  createdById: string | null

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date
}

/** Commercial terms of a customer account: its price list, overrides, and the assigned sales engineer. */
@Entity('account_terms')
export class AccountTerms {
  @PrimaryColumn({ type: 'uuid' })
  organisationId: string

  @ManyToOne(() => Organisation, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'organisationId' })
  organisation: Relation<Organisation>

  @Column({ type: 'uuid' })
  priceListId: string

  @Column({ type: 'uuid', nullable: true })
  salesEngineerId: string | null

  /** Per-variant or whole-account discount overrides (see shared/pricing DiscountOverride). */
  @Column({ type: 'json' })
  overrides: { variantId?: string; discountBp: number }[]

  @VersionColumn({ type: 'int' })
  version: number
}
