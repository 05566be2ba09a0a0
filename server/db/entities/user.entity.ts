import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, type Relation } from 'typeorm'
import { Organisation } from './organisation.entity'

@Entity('user')
export class User {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 254 })
  email: string

  @Column({ type: 'varchar', length: 160 })
  name: string

  /** bcrypt hash; null until an invited user sets a password. */
  @Column({ type: 'varchar', length: 100, nullable: true })
  passwordHash: string | null

  @Column({ type: 'enum', enum: ['admin', 'sales', 'buyer'] })
  role: 'admin' | 'sales' | 'buyer'

  @Column({ type: 'enum', enum: ['si', 'us'], default: 'si' })
  units: 'si' | 'us'

  @Column({ type: 'uuid' })
  organisationId: string

  @ManyToOne(() => Organisation, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'organisationId' })
  organisation: Relation<Organisation>

  @Column({ type: 'datetime', precision: 3, nullable: true })
  disabledAt: Date | null

  /** Largest extra discount a sales engineer may give on a quote line, basis points. */
  @Column({ type: 'int', default: 0 })
  discountLimitBp: number

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt: Date
}
