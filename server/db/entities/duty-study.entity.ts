import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn, type Relation } from 'typeorm'
import type { StudyInput } from '../../../shared/contracts/study.contract'
import { Organisation } from './organisation.entity'
import { User } from './user.entity'

@Entity('duty_study')
export class DutyStudy {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Index()
  @Column({ type: 'uuid' })
  organisationId: string

  @ManyToOne(() => Organisation, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'organisationId' })
  organisation: Relation<Organisation>

  @Column({ type: 'uuid' })
  ownerId: string

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'ownerId' })
  owner: Relation<User>

  @Column({ type: 'varchar', length: 120 })
  name: string

  @Column({ type: 'json' })
  input: StudyInput

  /** Read-only link for colleagues of the same organisation; null when not shared. */
  @Index({ unique: true })
  @Column({ type: 'varchar', length: 43, nullable: true })
  shareToken: string | null

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt: Date

  @VersionColumn({ type: 'int' })
  version: number
}
