import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, OneToMany, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn, type Relation } from 'typeorm'
import { MotorFamily } from './motor-family.entity'
import { MotorPerformance } from './motor-performance.entity'

const float = { type: 'double' } as const

/** One orderable part number. Type is copied from the family so the catalogue filters on one table. */
@Entity('motor_variant')
@Index(['ratedVolts', 'ratedHz'])
@Index(['type', 'poles'])
export class MotorVariant {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 40 })
  partNumber: string

  @Column({ type: 'uuid' })
  familyId: string

  @ManyToOne(() => MotorFamily, (family) => family.variants, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'familyId' })
  family: Relation<MotorFamily>

  @Column({ type: 'varchar', length: 160 })
  name: string

  @Column({ type: 'enum', enum: ['shaded-pole', 'psc'] })
  type: 'shaded-pole' | 'psc'

  @Column({ type: 'tinyint' })
  poles: number

  @Column(float)
  ratedVolts: number

  @Column({ type: 'tinyint' })
  ratedHz: number

  @Column({ type: 'boolean', default: false })
  dualFrequency: boolean

  @Index()
  @Column(float)
  ratedOutputW: number

  @Column(float)
  ratedRpm: number

  @Column(float)
  ratedCurrentA: number

  @Column(float)
  ratedInputW: number

  @Column(float)
  lockedRotorTorqueNm: number

  @Column(float)
  breakdownTorqueNm: number

  @Index()
  @Column(float)
  frameDiameterMm: number

  @Column(float)
  stackLengthMm: number

  @Column(float)
  shaftDiameterMm: number

  @Column(float)
  shaftLengthMm: number

  @Column({ type: 'varchar', length: 20 })
  mounting: string

  @Column({ type: 'enum', enum: ['cw', 'ccw'] })
  rotation: 'cw' | 'ccw'

  @Column({ type: 'enum', enum: ['shaft-end', 'lead-end'] })
  rotationViewedFrom: 'shaft-end' | 'lead-end'

  @Column({ type: 'boolean' })
  otherRotationAvailable: boolean

  @Column({ type: 'varchar', length: 20 })
  enclosure: string

  @Column({ type: 'char', length: 1 })
  insulationClass: string

  @Column({ type: 'varchar', length: 20 })
  protection: string

  @Column(float)
  maxAmbientC: number

  @Column({ type: 'double', nullable: true })
  capacitorUf: number | null

  @Column({ type: 'double', nullable: true })
  capacitorVac: number | null

  @Column({ type: 'int' })
  copperMassG: number

  @Column({ type: 'int' })
  weightG: number

  @Column({ type: 'int', default: 100 })
  moq: number

  @Column({ type: 'int', default: 42 })
  leadTimeDays: number

  @Index()
  @Column({ type: 'enum', enum: ['active', 'not-for-new-designs', 'discontinued'], default: 'active' })
  lifecycle: 'active' | 'not-for-new-designs' | 'discontinued'

  @Column({ type: 'json' })
  speedTaps: string[]

  /** Part number, name and family in one column for the catalogue's text search. */
  @Index({ fulltext: true })
  @Column({ type: 'varchar', length: 400 })
  searchText: string

  @OneToMany(() => MotorPerformance, (performance) => performance.variant)
  performance: Relation<MotorPerformance[]>

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt: Date

  @VersionColumn({ type: 'int' })
  version: number
}
