import { Column, CreateDateColumn, Entity, Index, OneToMany, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn, type Relation } from 'typeorm'
import { MotorVariant } from './motor-variant.entity'

@Entity('motor_family')
export class MotorFamily {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 24 })
  code: string

  @Column({ type: 'varchar', length: 120 })
  name: string

  @Column({ type: 'enum', enum: ['shaded-pole', 'psc'] })
  type: 'shaded-pole' | 'psc'

  @Column({ type: 'text' })
  description: string

  @Column({ type: 'enum', enum: ['active', 'not-for-new-designs', 'discontinued'], default: 'active' })
  lifecycle: 'active' | 'not-for-new-designs' | 'discontinued'

  @OneToMany(() => MotorVariant, (variant) => variant.family)
  variants: Relation<MotorVariant[]>

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt: Date

  @VersionColumn({ type: 'int' })
  version: number
}
