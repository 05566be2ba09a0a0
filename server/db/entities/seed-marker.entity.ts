import { CreateDateColumn, Entity, PrimaryColumn } from 'typeorm'

/** One row per demo seed step that has run, so `npm start` seeds once and keeps later edits. */
@Entity('seed_marker')
export class SeedMarker {
  @PrimaryColumn({ type: 'varchar', length: 64 })
  step: string

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  at: Date
}
