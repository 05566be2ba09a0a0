import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm'

@Entity('organisation')
export class Organisation {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Column({ type: 'varchar', length: 160, unique: true })
  name: string

  /** The motor maker that runs the portal, or a customer company. */
  @Column({ type: 'enum', enum: ['maker', 'customer'] })
  kind: 'maker' | 'customer'

  @Column({ type: 'enum', enum: ['oem', 'distributor'], nullable: true })
  tier: 'oem' | 'distributor' | null

  @Column({ type: 'char', length: 3, default: 'USD' })
  currency: string

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date
}
