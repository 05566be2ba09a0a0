// Demo activity of the invented Ashcombe scenario, so a fresh `npm start` shows each role some
// work in progress: Larkspur's buyer has a saved duty study for a range-hood blower and has asked
// for a quote on the motor that ranks first for it; the sales engineer finds the request waiting.
import type { EntityManager } from 'typeorm'
import { studyInputSchema, type StudyInput } from '../../shared/contracts/study.contract'
import { runSelection } from '../../shared/selection/run-selection'
import { DutyStudy, User } from '../db/entities'
import { recordQuoteRequest } from '../services/quote.service'
import { demoCatalogueEntries } from './demo-entries'
import { DEMO_FANS } from './demo-fans'

const BUYER = 'buyer@larkspur.test'
const STUDY_NAME = 'Range hood, 600 mm canopy'

export function demoStudyInput(): StudyInput {
  const fan = DEMO_FANS.find((item) => item.code === 'RH-BLOWER-A')
  if (!fan) throw new Error('the demo range-hood blower RH-BLOWER-A is missing')
  return studyInputSchema.parse({
    name: STUDY_NAME,
    fan: { source: 'curve', refRpm: fan.refRpm, refDensity: fan.refDensity, points: fan.points, demoFanCode: fan.code },
    duty: fan.suggestedDuty,
    system: {},
    supply: { volts: 120, hz: 60 },
    ambient: {},
    energy: {},
    constraints: {},
    tolerance: {},
  })
}

export async function seedDemoActivity(manager: EntityManager): Promise<void> {
  const buyer = await manager.findOneBy(User, { email: BUYER })
  if (!buyer) throw new Error(`demo user ${BUYER} missing (seed the users first)`)
  const input = demoStudyInput()
  const study = await manager.save(manager.create(DutyStudy, { organisationId: buyer.organisationId, ownerId: buyer.id, name: input.name, input, shareToken: null }))
  // The motor the study ranks first (the seeded catalogue is the demo one this reads).
  const best = runSelection(demoCatalogueEntries(), input).candidates.find((candidate) => candidate.meetsDuty)
  if (!best) throw new Error('no demo motor meets the demo range-hood duty')
  await recordQuoteRequest(
    manager,
    { id: buyer.id, email: buyer.email, organisationId: buyer.organisationId },
    {
      studyId: study.id,
      partNumber: best.partNumber,
      tap: best.tap,
      quantityPerYear: 8000,
      lotSize: 2000,
      note: 'Pilot run for the spring canopy line; samples first, please.',
    },
  )
}
