// Demo activity of the invented Ashcombe scenario, so a fresh `npm start` shows each role some
// work in progress. Each customer's buyer has a saved duty study and has asked for a quote on the
// motor that ranks first for it; the sales engineer finds both requests waiting. Larkspur (the
// OEM) designs a range-hood canopy on 120 V 60 Hz; Quillon (the distributor) stocks a service
// replacement for a condensing unit's fan on 230 V 50 Hz.
import type { EntityManager } from 'typeorm'
import { studyInputSchema, type StudyInput } from '../../shared/contracts/study.contract'
import type { Supply } from '../../shared/engineering'
import { runSelection } from '../../shared/selection/run-selection'
import { DutyStudy, User } from '../db/entities'
import { recordQuoteRequest } from '../services/quote.service'
import { demoCatalogueEntries } from './demo-entries'
import { DEMO_FANS } from './demo-fans'

interface DemoActivity {
  buyer: string
  studyName: string
  fanCode: string
  supply: Supply
  request: { quantityPerYear: number; lotSize: number; note: string }
}

const OEM_ACTIVITY: DemoActivity = {
  buyer: 'buyer@larkspur.test',
  studyName: 'Range hood, 600 mm canopy',
  fanCode: 'RH-BLOWER-A',
  supply: { volts: 120, hz: 60 },
  request: { quantityPerYear: 8000, lotSize: 2000, note: 'Pilot run for the spring canopy line; samples first, please.' },
}

const DISTRIBUTOR_ACTIVITY: DemoActivity = {
  buyer: 'buyer@quillon.test',
  studyName: 'Condenser fan 250 mm, service replacement',
  fanCode: 'COND-AX-250',
  supply: { volts: 230, hz: 50 },
  request: { quantityPerYear: 1200, lotSize: 300, note: 'Shelf stock for refrigeration service trade; quarterly call-offs.' },
}

export function demoStudyInput(activity: DemoActivity = OEM_ACTIVITY): StudyInput {
  const fan = DEMO_FANS.find((item) => item.code === activity.fanCode)
  if (!fan) throw new Error(`the demo fan ${activity.fanCode} is missing`)
  return studyInputSchema.parse({
    name: activity.studyName,
    fan: { source: 'curve', refRpm: fan.refRpm, refDensity: fan.refDensity, points: fan.points, demoFanCode: fan.code },
    duty: fan.suggestedDuty,
    system: {},
    supply: activity.supply,
    ambient: {},
    energy: {},
    constraints: {},
    tolerance: {},
  })
}

async function seedActivity(manager: EntityManager, activity: DemoActivity): Promise<void> {
  const buyer = await manager.findOneBy(User, { email: activity.buyer })
  if (!buyer) throw new Error(`demo user ${activity.buyer} missing (seed the users first)`)
  const input = demoStudyInput(activity)
  const study = await manager.save(manager.create(DutyStudy, { organisationId: buyer.organisationId, ownerId: buyer.id, name: input.name, input, shareToken: null }))
  // The motor the study ranks first (the seeded catalogue is the demo one this reads).
  const best = runSelection(demoCatalogueEntries(), input).candidates.find((candidate) => candidate.meetsDuty)
  if (!best) throw new Error(`no demo motor meets the duty of "${activity.studyName}"`)
  await recordQuoteRequest(manager, { id: buyer.id, email: buyer.email, organisationId: buyer.organisationId }, { studyId: study.id, partNumber: best.partNumber, tap: best.tap, ...activity.request })
}

export function seedDemoActivity(manager: EntityManager): Promise<void> {
  return seedActivity(manager, OEM_ACTIVITY)
}

export function seedDistributorActivity(manager: EntityManager): Promise<void> {
  return seedActivity(manager, DISTRIBUTOR_ACTIVITY)
}
