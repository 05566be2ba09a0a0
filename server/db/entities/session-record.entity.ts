import { Column, Entity, Index, PrimaryColumn } from 'typeorm'

/** express-session rows, kept in MariaDB so several app processes share sign-ins. */
@Entity('session')
export class SessionRecord {
  @PrimaryColumn({ type: 'varchar', length: 128 })
  id: string

  @Index()
  @Column({ type: 'bigint', transformer: { to: (value: number) => value, from: (value: string) => Number(value) } })
  expiresAt: number

  @Index()
  @Column({ type: 'uuid', nullable: true })
  userId: string | null

  @Column({ type: 'mediumtext' })
  data: string
}
