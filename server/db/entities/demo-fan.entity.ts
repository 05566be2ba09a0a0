import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm'
import type { FanPoint } from '../../../shared/engineering'

/** Example fans (invented) that a study can start from. */
@Entity('demo_fan')
export class DemoFan {
  @PrimaryGeneratedColumn('uuid')
  id: string

  @Index({ unique: true })
  @Column({ type: 'varchar', length: 40 })
  code: string

  @Column({ type: 'varchar', length: 120 })
  name: string

  @Column({ type: 'varchar', length: 120 })
  application: string

  @Column({ type: 'double' })
  refRpm: number

  @Column({ type: 'double' })
  refDensity: number

  @Column({ type: 'json' })
  points: FanPoint[]

  @Column({ type: 'json' })
  suggestedDuty: { flowM3s: number; staticPa: number }
}
