import { Column, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm'

/**
 * One row counting catalogue changes. Every catalogue write bumps it in the same transaction, so
 * each app process can tell cheaply whether its cache of prepared motors is still current.
 */
@Entity('catalogue_revision')
export class CatalogueRevision {
  @PrimaryColumn({ type: 'tinyint' })
  id: number

  @Column({ type: 'int' })
  revision: number

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  changedAt: Date
}
