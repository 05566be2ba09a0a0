import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm'
import { User } from './user.entity'

/**
 * A set-password link sent to an invited user. Only the SHA-256 of the link's token is stored, so a
 * copy of the table cannot be turned back into working links.
 */
@Entity('invitation')
export class Invitation {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Index()
  @Column({ type: 'uuid' })
  userId: string

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'userId' })
  user: Relation<User>

  /** Hex SHA-256 of the token in the link. */
  @Index({ unique: true })
  @Column({ type: 'char', length: 64 })
  tokenHash: string

  @Column({ type: 'datetime', precision: 3 })
  expiresAt: Date

  /** When the password was set through this link; a used link never works again. */
  @Column({ type: 'datetime', precision: 3, nullable: true })
  usedAt: Date | null

  /** When a newer invitation to the same user replaced this one. */
  @Column({ type: 'datetime', precision: 3, nullable: true })
  revokedAt: Date | null

  @Column({ type: 'uuid', nullable: true })
  createdById: string | null

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date
}
