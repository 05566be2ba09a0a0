import { describe, expect, it } from 'vitest'
import { prepareLoad, solveOperatingPoint, type Supply } from '../engineering'
import { studyInputSchema, type StudyInput } from '../contracts/study.contract'
import { demoCatalogueEntries } from '../../server/seed/demo-entries'
import { DEMO_FANS } from '../../server/seed/demo-fans'
import { studyLoad } from './air'
import { provablyShort, runSelection, shortfallTest } from './run-selection'

const entries = demoCatalogueEntries()

function studyFor(fanCode: string, supply: Supply, dutyScale: number, offsetShare: number): StudyInput {
  const fan = DEMO_FANS.find((item) => item.code === fanCode)
  if (!fan) throw new Error(`no demo fan ${fanCode}`)
  const duty = { flowM3s: fan.suggestedDuty.flowM3s * dutyScale, staticPa: fan.suggestedDuty.staticPa * dutyScale * dutyScale }
  return studyInputSchema.parse({
    name: 'spec',
    fan: { source: 'curve', refRpm: fan.refRpm, refDensity: fan.refDensity, points: fan.points },
    duty,
    system: { offsetPa: duty.staticPa * offsetShare },
    supply,
    ambient: {},
    energy: {},
    constraints: { activeOnly: false },
    tolerance: {},
  })
}

const supplies: Supply[] = [
  { volts: 120, hz: 60 },
  { volts: 230, hz: 50 },
]
const cases = DEMO_FANS.flatMap((fan) => supplies.flatMap((supply) => [0.6, 1, 1.4].flatMap((scale) => [0, 0.3].map((offset) => ({ fan: fan.code, supply, scale, offset })))))

describe('skipping hopeless candidates', () => {
  // The skip is a proof, not a guess: every candidate it calls short must be short when solved.
  it('never calls a candidate short that meets the flow at nominal supply', () => {
    let proven = 0
    let checked = 0
    for (const c of cases) {
      const input = studyFor(c.fan, c.supply, c.scale, c.offset)
      const fanLoad = studyLoad(input)
      const load = prepareLoad(fanLoad, 'fan')
      const required = input.duty.flowM3s * (1 + input.tolerance.minMarginPct / 100)
      const test = shortfallTest(load, fanLoad, required, c.supply.hz)
      if (!test) continue
      for (const entry of entries) {
        for (const row of entry.performance) {
          if (row.hz !== c.supply.hz || Math.abs(c.supply.volts - row.volts) / row.volts > 0.1) continue
          if (!provablyShort(test, row, entry.poles, c.supply)) continue
          proven += 1
          let point
          try {
            point = solveOperatingPoint(row.prepared, load, c.supply)
          } catch {
            continue // off the end of the fan curve: not a meeting candidate either
          }
          checked += 1
          const meets = point.status === 'running' && !point.crawl && (point.flowM3s ?? 0) >= required
          expect(meets, `${entry.partNumber} ${row.tap} on ${c.fan} x${c.scale} offset ${c.offset}`).toBe(false)
        }
      }
    }
    // The test must have had something to prove: most small motors fall short of the big fans.
    expect(proven).toBeGreaterThan(1000)
    expect(checked).toBeGreaterThan(1000)
  })

  it('returns the same ranked candidates with and without the skip', () => {
    const big = Array.from({ length: 6 }, (_, copy) => entries.map((entry) => ({ ...entry, variantId: `${entry.variantId}#${copy}`, partNumber: `${entry.partNumber}-${copy}` }))).flat()
    for (const c of cases.filter((item) => item.scale === 1)) {
      const input = studyFor(c.fan, c.supply, c.scale, c.offset)
      for (const limit of [20, 150]) {
        const fast = runSelection(big, input, { limit })
        const full = runSelection(big, input, { limit, skipHopeless: false })
        expect(fast.candidates, `${c.fan} ${c.supply.volts} V limit ${limit}`).toEqual(full.candidates)
        expect(fast.candidateTotal).toBe(full.candidateTotal)
        expect(fast.curves).toEqual(full.curves)
        expect(fast.loadCurve).toEqual(full.loadCurve)
      }
    }
  })
})

describe('ranking', () => {
  const input = studyFor('RH-BLOWER-A', { volts: 120, hz: 60 }, 1, 0)
  const result = runSelection(entries, input)

  it('puts every candidate that meets the duty at worst case first, then nominal-only, then the rest', () => {
    const tiers = result.candidates.map((candidate) => 4 - Math.floor(candidate.score / 1000))
    expect(tiers).toEqual([...tiers].sort((a, b) => a - b))
    const meeting = result.candidates.filter((candidate) => candidate.meetsDuty)
    expect(meeting.length).toBeGreaterThan(0)
    expect(result.candidates.slice(0, meeting.length).every((candidate) => candidate.meetsDuty)).toBe(true)
    expect(result.candidates.map((candidate) => candidate.rank)).toEqual(result.candidates.map((_, index) => index + 1))
  })

  it('only calls a candidate meeting the duty when nominal, low line and hot winding all deliver the flow', () => {
    const required = input.duty.flowM3s * (1 + input.tolerance.minMarginPct / 100)
    for (const candidate of result.candidates.filter((item) => item.meetsDuty)) {
      expect(candidate.nominal.flowM3s).toBeGreaterThanOrEqual(required)
      expect(candidate.lowLine.flowM3s).toBeGreaterThanOrEqual(required)
      if (candidate.hot) expect(candidate.hot.flowM3s).toBeGreaterThanOrEqual(required)
      expect(candidate.nominal.crawl || candidate.lowLine.crawl).toBe(false)
    }
  })

  it('caps the returned list and still counts every candidate', () => {
    const capped = runSelection(entries, input, { limit: 10 })
    expect(capped.candidates).toHaveLength(10)
    expect(capped.candidateTotal).toBe(result.candidateTotal)
    expect(capped.candidates).toEqual(result.candidates.slice(0, 10))
  })
})
