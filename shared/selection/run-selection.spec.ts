import { describe, expect, it } from 'vitest'
import { prepareLoad, solveOperatingPoint, type Supply } from '../engineering'
import { studyInputSchema, type StudyInput } from '../contracts/study.contract'
import { demoCatalogueEntries } from '../../server/seed/demo-entries'
import { DEMO_FANS } from '../../server/seed/demo-fans'
import { studyLoad } from './air'
import { assembleResult, mergeShares, picksByShare, provablyShort, rankCatalogue, runSelection, shortAtRequired, shortfallTest, sig, studyFrame } from './run-selection'

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

/** Each case with a shortfall test, its load and required flow, and the demo rows on its supply. */
function* shortfallCases() {
  for (const c of cases) {
    const input = studyFor(c.fan, c.supply, c.scale, c.offset)
    const fanLoad = studyLoad(input)
    const load = prepareLoad(fanLoad, 'fan')
    const required = input.duty.flowM3s * (1 + input.tolerance.minMarginPct / 100)
    const test = shortfallTest(load, fanLoad, required, c.supply.hz)
    if (!test) continue
    const rows = entries.flatMap((entry) =>
      entry.performance.filter((row) => row.hz === c.supply.hz && Math.abs(c.supply.volts - row.volts) / row.volts <= 0.1).map((row) => ({ entry, row })),
    )
    const low: Supply = { volts: c.supply.volts * (1 - input.tolerance.voltagePct / 100), hz: c.supply.hz }
    yield { c, load, required, test, rows, low, label: `${c.fan} x${c.scale} offset ${c.offset}` }
  }
}

/** Whether the motor, solved, meets the required flow (undefined when the fan runs off its curve: not a meeting motor either). */
function meetsWhenSolved(motor: Parameters<typeof solveOperatingPoint>[0], load: ReturnType<typeof prepareLoad>, supply: Supply, required: number): boolean | undefined {
  let point
  try {
    point = solveOperatingPoint(motor, load, supply)
  } catch {
    return undefined
  }
  return point.status === 'running' && !point.crawl && (point.flowM3s ?? 0) >= required
}

describe('skipping hopeless candidates', () => {
  // The skip is a proof, not a guess: every candidate it calls short must be short when solved.
  it('never calls a candidate short that meets the flow at nominal supply', () => {
    let proven = 0
    let checked = 0
    for (const { c, load, required, test, rows, label } of shortfallCases()) {
      for (const { entry, row } of rows) {
        if (!provablyShort(test, row, entry.poles, c.supply)) continue
        proven += 1
        const meets = meetsWhenSolved(row.prepared, load, c.supply, required)
        if (meets === undefined) continue
        checked += 1
        expect(meets, `${entry.partNumber} ${row.tap} on ${label}`).toBe(false)
      }
    }
    // The test must have had something to prove: most small motors fall short of the big fans.
    expect(proven).toBeGreaterThan(1000)
    expect(checked).toBeGreaterThan(1000)
  })

  it('never calls a motor short at required speed (one evaluation) that meets the flow when solved, at nominal, low line or hot', () => {
    let proven = 0
    for (const { c, load, required, test, rows, low, label } of shortfallCases()) {
      for (const { entry, row } of rows) {
        const motors = [
          { motor: row.prepared, supply: c.supply },
          { motor: row.prepared, supply: low },
          ...(row.hotPrepared ? [{ motor: row.hotPrepared, supply: low }] : []),
        ]
        for (const { motor, supply } of motors) {
          if (!shortAtRequired(test, motor.bind(supply))) continue
          proven += 1
          expect(meetsWhenSolved(motor, load, supply, required), `${entry.partNumber} ${row.tap} at ${supply.volts} V on ${label}`).not.toBe(true)
        }
      }
    }
    expect(proven).toBeGreaterThan(1000)
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

describe('a catalogue ranked in shares', () => {
  // The worker pool ranks shares of the catalogue apart and merges them; the answer must be the
  // one a single thread gives over the whole catalogue, figure for figure.
  const big = Array.from({ length: 3 }, (_, copy) => entries.map((entry) => ({ ...entry, variantId: `${entry.variantId}#${copy}`, partNumber: `${entry.partNumber}-${copy}` }))).flat()
  for (const shareCount of [2, 3]) {
    it(`merges ${shareCount} shares into the single-thread answer`, () => {
      for (const c of cases.filter((item) => item.scale === 1 && item.supply.hz === 60)) {
        const input = studyFor(c.fan, c.supply, c.scale, c.offset)
        for (const limit of [25, 500]) {
          const whole = runSelection(big, input, { limit })
          const frame = studyFrame(input)
          const shares = Array.from({ length: shareCount }, (_, s) => big.filter((_, i) => i % shareCount === s))
          const rankings = shares.map((share) => rankCatalogue(share, frame, { limit }))
          const picks = picksByShare(mergeShares(rankings.map((r) => r.share), limit), shareCount)
          const merged = assembleResult(frame, rankings.map((r) => r.share), rankings.map((r, s) => r.build(picks[s] ?? [])))
          expect(merged, `${c.fan} offset ${c.offset} limit ${limit}`).toEqual(whole)
        }
      }
    })
  }
})

describe('answer figures', () => {
  it('keep six significant digits and print as such', () => {
    for (const x of [0.07655763245675712, 1154.3493295769583, -3.14159265358979, 279.61068516435404, 123456789.123, 2e-9]) {
      const rounded = sig(x)
      expect(Math.abs(rounded - x)).toBeLessThanOrEqual(5e-6 * Math.abs(x))
      // The significant digits as printed: sign, exponent, point and leading or trailing zeros dropped.
      const digits = String(rounded).replace(/^-/, '').replace(/e.*$/, '').replace('.', '').replace(/^0+/, '').replace(/0+$/, '')
      expect(digits.length, String(rounded)).toBeLessThanOrEqual(6)
    }
    expect(sig(0)).toBe(0)
    expect(sig(1154.3493295769583)).toBe(1154.35)
    expect(sig(0.07655763245675712)).toBe(0.0765576)
  })
})
