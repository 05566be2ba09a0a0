import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm'

export const IMPORT_BATCH_KINDS = ['catalogue', 'performance'] as const
export type ImportBatchKind = (typeof IMPORT_BATCH_KINDS)[number]

/**
 * An uploaded file that was previewed and may be committed. The catalogue CSV is kept with its
 * SHA-256 so the commit applies exactly the previewed file; `catalogueRevision` (or, for
 * performance data, the row it replaces) tells whether the catalogue moved on since the preview.
 */
@Entity('import_batch')
@Index(['kind', 'createdAt'])
export class ImportBatch {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Column({ type: 'enum', enum: IMPORT_BATCH_KINDS })
  kind: ImportBatchKind

  @Column({ type: 'enum', enum: ['previewed', 'committed'], default: 'previewed' })
  status: 'previewed' | 'committed'

  @Column({ type: 'varchar', length: 255 })
  fileName: string

  @Column({ type: 'char', length: 64 })
  fileSha256: string

  /** The uploaded text, as received (catalogue CSVs and performance files). */
  @Column({ type: 'longtext' })
  content: string

  /** What the preview decided, for the kind's own use (the performance row to write, counts). */
  @Column({ type: 'json' })
  plan: Record<string, unknown>

  @Column({ type: 'int' })
  catalogueRevision: number

  @Column({ type: 'uuid', nullable: true })
  createdById: string | null

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date

  @Column({ type: 'datetime', precision: 3, nullable: true })
  committedAt: Date | null
}
