// Demo seeding: each step runs once per database (a marker row records it), so a second start
// keeps whatever users changed since. `npm run db:reset` starts over.
import type { DataSource, EntityManager } from 'typeorm'
import { SeedMarker } from '../db/entities'
import { seedDemoUsers } from './demo-users'
import { seedDemoCatalogue } from './seed-catalogue'
import { seedDemoPricing } from './demo-pricing'
import { seedDemoActivity, seedDistributorActivity } from './demo-activity'

export interface SeedStep {
  step: string
  run(manager: EntityManager): Promise<void>
}

export const SEED_STEPS: SeedStep[] = [
  { step: 'demo-users-v1', run: seedDemoUsers },
  { step: 'demo-catalogue-v1', run: seedDemoCatalogue },
  { step: 'demo-pricing-v1', run: seedDemoPricing },
  // After the pricing: the request takes the account's sales engineer and currency.
  { step: 'demo-activity-v1', run: seedDemoActivity },
  { step: 'demo-activity-distributor-v1', run: seedDistributorActivity },
]

export async function seedDemoData(dataSource: DataSource, steps: SeedStep[] = SEED_STEPS): Promise<string[]> {
  const ran: string[] = []
  for (const { step, run } of steps) {
    const done = await dataSource.transaction(async (manager) => {
      if (await manager.existsBy(SeedMarker, { step })) return false
      await run(manager)
      await manager.insert(SeedMarker, { step })
      return true
    })
    if (done) ran.push(step)
  }
  return ran
}
