import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm'
import type { MotorModel } from '../../../shared/engineering'
import { MotorVariant } from './motor-variant.entity'

/**
 * Performance data of a variant at one speed tap and supply. Replacing data keeps the old row
 * (current = false) as history.
 */
@Entity('motor_performance')
@Index(['variantId', 'tap', 'volts', 'hz', 'current'])
export class MotorPerformance {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Column({ type: 'uuid' })
  variantId: string

  @ManyToOne(() => MotorVariant, (variant) => variant.performance, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'variantId' })
  variant: Relation<MotorVariant>

  @Column({ type: 'varchar', length: 20 })
  tap: string

  @Column({ type: 'double' })
  volts: number

  @Column({ type: 'double' })
  hz: number

  @Column({ type: 'enum', enum: ['curve', 'circuit'] })
  model: 'curve' | 'circuit'

  @Column({ type: 'enum', enum: ['measured', 'datasheet', 'fitted'] })
  source: 'measured' | 'datasheet' | 'fitted'

  @Column({ type: 'double', default: 25 })
  referenceTempC: number

  @Column({ type: 'json' })
  motor: MotorModel

  @Index()
  @Column({ type: 'boolean', default: true })
  current: boolean

  @Column({ type: 'uuid', nullable: true })
  createdById: string | null

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date
}
