import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm'
import type { RunChanges, RunResult, StudyInput } from '../../../shared/contracts/study.contract'
import { DutyStudy } from './duty-study.entity'

/** A saved run: the inputs as they were, the catalogue revision it saw, and its results. */
@Entity('study_run')
@Index(['studyId', 'createdAt'])
export class StudyRun {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Column({ type: 'uuid' })
  studyId: string

  @ManyToOne(() => DutyStudy, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'studyId' })
  study: Relation<DutyStudy>

  @Column({ type: 'uuid' })
  ranById: string

  @Column({ type: 'json' })
  input: StudyInput

  @Column({ type: 'int' })
  catalogueRevision: number

  @Column({ type: 'int' })
  candidateCount: number

  @Column({ type: 'json' })
  result: RunResult

  @Column({ type: 'json', nullable: true })
  changes: RunChanges | null

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date
}
