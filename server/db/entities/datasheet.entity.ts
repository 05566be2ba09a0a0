import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm'
import { MotorFamily } from './motor-family.entity'
import { MotorVariant } from './motor-variant.entity'

/**
 * A PDF datasheet attached to a family or to one variant (exactly one of the two). The file lives
 * under DATA_DIR/datasheets/<storedName>; the name is generated, the uploader's name is kept only
 * for the download.
 */
@Entity('datasheet')
export class Datasheet {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Index()
  @Column({ type: 'uuid', nullable: true })
  familyId: string | null

  @ManyToOne(() => MotorFamily, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'familyId' })
  family: Relation<MotorFamily> | null

  @Index()
  @Column({ type: 'uuid', nullable: true })
  variantId: string | null

  @ManyToOne(() => MotorVariant, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'variantId' })
  variant: Relation<MotorVariant> | null

  /** `<uuid>.pdf`, never derived from anything the uploader sent. */
  @Column({ type: 'varchar', length: 64 })
  storedName: string

  @Column({ type: 'varchar', length: 255 })
  originalName: string

  @Column({ type: 'int' })
  sizeBytes: number

  @Column({ type: 'char', length: 64 })
  sha256: string

  @Column({ type: 'uuid', nullable: true })
  uploadedById: string | null

  @Column({ type: 'varchar', length: 254, nullable: true })
  uploadedByEmail: string | null

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date
}
