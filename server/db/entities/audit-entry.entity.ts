import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm'

/** Who changed what and when. Written by services next to the change, in the same transaction. */
@Entity('audit_entry')
export class AuditEntry {
  @PrimaryGeneratedColumn({ type: 'bigint' })
  id: string

  @Index()
  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  at: Date

  @Column({ type: 'uuid', nullable: true })
  actorId: string | null

  @Column({ type: 'varchar', length: 254, nullable: true })
  actorEmail: string | null

  @Index()
  @Column({ type: 'varchar', length: 40 })
  entity: string

  @Column({ type: 'varchar', length: 64 })
  entityId: string

  @Column({ type: 'varchar', length: 40 })
  action: string

  @Column({ type: 'json', nullable: true })
  detail: Record<string, unknown> | null
}
