import { beforeAll, describe, expect, it } from 'vitest'
import { familySpecSchema, performanceSpecSchema, variantSpecSchema } from '../../shared/contracts/catalogue.contract'
import { fanCurveInputSchema } from '../../shared/contracts/study.contract'
import {
  breakdownTorque,
  evaluateLoad,
  evaluateMotor,
  prepareLoad,
  solveOperatingPoint,
  syncRpm,
  toleranceAnalysis,
  type FanLoad,
  type OperatingPoint,
  type PreparedLoad,
  type Supply,
} from '../../shared/engineering'
import { generateDemoCatalogue, ratedPerformanceOf, type DemoCatalogue } from './demo-catalogue'
import { DEMO_FANS, type DemoFanSeed } from './demo-fans'

let catalogue: DemoCatalogue
beforeAll(() => {
  catalogue = generateDemoCatalogue()
})

const typeOf = (partNumber: string): string | undefined => {
  const v = catalogue.variants.find((x) => x.partNumber === partNumber)
  return catalogue.families.find((f) => f.code === v?.familyCode)?.type
}
const near = (actual: number, expected: number, rel: number): boolean => Math.abs(actual - expected) <= rel * Math.abs(expected) + 1e-9

function fanOnDutySystem(fan: DemoFanSeed): FanLoad {
  const d = fan.suggestedDuty
  // The study's system curve runs through the duty point: p = k Q^2 (no offset).
  return { kind: 'fan', fan: { refRpm: fan.refRpm, refDensity: fan.refDensity, points: fan.points }, system: { k: d.staticPa / (d.flowM3s * d.flowM3s) } }
}
const demoFan = (code: string): DemoFanSeed => {
  const fan = DEMO_FANS.find((f) => f.code === code)
  if (!fan) throw new Error(`demo fan ${code} missing`)
  return fan
}

type Verdict = 'meets' | 'short-at-low-line' | 'fails' | 'crawl' | 'no-start'
const reaches = (p: OperatingPoint, flow: number): boolean => p.status === 'running' && !p.crawl && (p.flowM3s ?? 0) >= flow

/** Every performance row on `supply` solved at nominal and low line (-10 %, NEMA MG 1 / IEC 60034-1 zone B). */
function study(fan: DemoFanSeed, supply: Supply) {
  const load: PreparedLoad = prepareLoad(fanOnDutySystem(fan))
  const flow = fan.suggestedDuty.flowM3s
  return catalogue.performance
    .filter((p) => p.volts === supply.volts && p.hz === supply.hz)
    .map((p) => {
      const t = toleranceAnalysis(p.motor, load, supply)
      const verdict: Verdict =
        t.nominal.status === 'no-start'
          ? 'no-start'
          : t.nominal.crawl
            ? 'crawl'
            : reaches(t.nominal, flow)
              ? reaches(t.lowLine, flow)
                ? 'meets'
                : 'short-at-low-line'
              : 'fails'
      return { partNumber: p.partNumber, tap: p.tap, type: typeOf(p.partNumber), poles: p.motor.poles, verdict, nominal: t.nominal, lowLine: t.lowLine }
    })
}

function tally(rows: ReturnType<typeof study>): Record<string, number> {
  const out: Record<string, number> = {}
  for (const r of rows) out[`${r.type} ${r.verdict}`] = (out[`${r.type} ${r.verdict}`] ?? 0) + 1
  return out
}

describe('generateDemoCatalogue', () => {
  it('gives records that all pass their zod schemas unchanged', () => {
    for (const f of catalogue.families) expect(familySpecSchema.parse(f)).toEqual(f)
    for (const v of catalogue.variants) expect(variantSpecSchema.parse(v)).toEqual(v)
    for (const p of catalogue.performance) expect(performanceSpecSchema.parse(p)).toEqual(p)
  })

  it('is deterministic: two calls give equal data', () => {
    expect(generateDemoCatalogue()).toEqual(catalogue)
  })

  it('has at least 40 families and 250 variants with unique codes and part numbers that refer to each other', () => {
    expect(catalogue.families.length).toBeGreaterThanOrEqual(40)
    expect(catalogue.variants.length).toBeGreaterThanOrEqual(250)
    expect(new Set(catalogue.families.map((f) => f.code)).size).toBe(catalogue.families.length)
    expect(new Set(catalogue.variants.map((v) => v.partNumber)).size).toBe(catalogue.variants.length)
    const codes = new Set(catalogue.families.map((f) => f.code))
    for (const v of catalogue.variants) expect(codes.has(v.familyCode)).toBe(true)
    const parts = new Set(catalogue.variants.map((v) => v.partNumber))
    for (const p of catalogue.performance) expect(parts.has(p.partNumber)).toBe(true)
  })

  it('covers 2, 4 and 6 poles, the four supplies and outputs from about 2 W to 250 W', () => {
    const vs = catalogue.variants
    for (const poles of [2, 4, 6]) expect(vs.some((v) => v.poles === poles)).toBe(true)
    for (const [volts, hz] of [[120, 60], [230, 50], [230, 60]]) expect(vs.some((v) => v.ratedVolts === volts && v.ratedHz === hz)).toBe(true)
    const dual = vs.filter((v) => v.ratedVolts === 100)
    expect(dual.length).toBeGreaterThan(5)
    for (const v of dual) {
      expect(v.dualFrequency).toBe(true)
      const rows = catalogue.performance.filter((p) => p.partNumber === v.partNumber)
      for (const tap of v.speedTaps) for (const hz of [50, 60]) expect(rows.some((p) => p.tap === tap && p.hz === hz && p.volts === 100)).toBe(true)
    }
    const outputs = vs.map((v) => v.ratedOutputW)
    expect(Math.min(...outputs)).toBeLessThanOrEqual(2.5)
    expect(Math.min(...outputs)).toBeGreaterThanOrEqual(1.5)
    expect(Math.max(...outputs)).toBeGreaterThanOrEqual(200)
    expect(Math.max(...outputs)).toBeLessThanOrEqual(300)
  })

  // Typical full-load efficiency: shaded-pole about 5-35 %, PSC about 50-70 % (common practice; the
  // same ranges as TYPICAL_EFFICIENCY in shared/engineering/motor-types.ts). Frames: common practice
  // for fractional-horsepower fan motors, not a standard's frame table.
  it('keeps shaded-pole variants small and inefficient and PSC variants larger, more efficient, with capacitors and taps', () => {
    for (const v of catalogue.variants) {
      const type = typeOf(v.partNumber)
      const efficiency = v.ratedOutputW / v.ratedInputW
      if (type === 'shaded-pole') {
        expect(v.ratedOutputW).toBeLessThanOrEqual(40)
        expect(v.frameDiameterMm).toBeGreaterThanOrEqual(60)
        expect(v.frameDiameterMm).toBeLessThanOrEqual(100)
        expect(efficiency).toBeGreaterThanOrEqual(0.08)
        expect(efficiency).toBeLessThanOrEqual(0.35)
        expect(v.capacitorUf).toBeNull()
        expect(v.speedTaps).toHaveLength(1)
      } else {
        expect(v.ratedOutputW).toBeGreaterThanOrEqual(10)
        expect(v.frameDiameterMm).toBeGreaterThanOrEqual(100)
        expect(v.frameDiameterMm).toBeLessThanOrEqual(150)
        expect(efficiency).toBeGreaterThanOrEqual(0.44)
        expect(efficiency).toBeLessThanOrEqual(0.72)
        expect(v.capacitorUf).toBeGreaterThanOrEqual(2)
        expect(v.capacitorUf).toBeLessThanOrEqual(15)
        expect([370, 440]).toContain(v.capacitorVac)
        expect(v.speedTaps.length).toBeGreaterThanOrEqual(2)
        expect(v.speedTaps.length).toBeLessThanOrEqual(4)
        expect(v.protection === 'auto-reset' || v.protection === 'manual-reset').toBe(true)
      }
      expect(v.maxAmbientC).toBeGreaterThanOrEqual(40)
      expect(v.maxAmbientC).toBeLessThanOrEqual(65)
      expect(v.copperMassG).toBeGreaterThan(0)
      expect(v.weightG).toBeGreaterThan(v.copperMassG)
    }
    const lifecycles = new Set(catalogue.variants.map((v) => v.lifecycle))
    expect([...lifecycles].sort()).toEqual(['active', 'discontinued', 'not-for-new-designs'])
    expect(catalogue.variants.filter((v) => v.lifecycle === 'active').length).toBeGreaterThan(catalogue.variants.length * 0.75)
    expect(catalogue.variants.some((v) => v.insulationClass === 'H')).toBe(true)
    expect(catalogue.variants.some((v) => v.enclosure === 'air-over')).toBe(true)
    expect(catalogue.variants.some((v) => v.protection === 'impedance')).toBe(true)
  })

  it('stores PSC data per tap and supply, as circuits with an aux winding and, for some variants, as measured curves', () => {
    let circuits = 0
    let curves = 0
    for (const v of catalogue.variants.filter((x) => typeOf(x.partNumber) === 'psc')) {
      const rows = catalogue.performance.filter((p) => p.partNumber === v.partNumber)
      expect(rows.length).toBe(v.speedTaps.length * (v.dualFrequency ? 2 : 1))
      for (const p of rows) {
        if (p.motor.model === 'circuit') {
          expect(p.motor.aux?.capacitorUf).toBe(v.capacitorUf)
          circuits++
        } else curves++
      }
      // A lower tap is a main winding with more turns: every impedance of the top tap's circuit grows.
      const atRated = rows.filter((p) => p.hz === v.ratedHz)
      for (let i = 1; i < atRated.length; i++) {
        const hi = atRated[i - 1]?.motor
        const lo = atRated[i]?.motor
        if (hi?.model === 'circuit' && lo?.model === 'circuit') {
          expect(lo.r1).toBeGreaterThan(hi.r1)
          expect(lo.xm).toBeGreaterThan(hi.xm)
          expect(lo.aux?.turnsRatio ?? 0).toBeLessThan(hi.aux?.turnsRatio ?? 0)
        }
      }
    }
    expect(circuits).toBeGreaterThan(200)
    expect(curves).toBeGreaterThan(30)
  })

  it('takes every rated figure from the top-tap data at the rated supply through the engineering core', () => {
    for (const v of catalogue.variants) {
      const row = ratedPerformanceOf(catalogue, v)
      expect(row, v.partNumber).toBeDefined()
      if (!row) continue
      expect(row.tap).toBe(v.speedTaps[0])
      const supply = { volts: v.ratedVolts, hz: v.ratedHz }
      const at = evaluateMotor(row.motor, supply, v.ratedRpm)
      // ratedRpm is rounded to 1 r/min, the other figures to 3 significant figures.
      expect(near(at.outputW ?? 0, v.ratedOutputW, 0.02), `${v.partNumber} output`).toBe(true)
      expect(near(at.currentA ?? 0, v.ratedCurrentA, 0.01), `${v.partNumber} current`).toBe(true)
      expect(near(at.inputW ?? 0, v.ratedInputW, 0.01), `${v.partNumber} input`).toBe(true)
      expect(near(evaluateMotor(row.motor, supply, 0).shaftTorqueNm, v.lockedRotorTorqueNm, 0.005)).toBe(true)
      const bd = breakdownTorque(row.motor, supply)
      expect(near(bd.torqueNm, v.breakdownTorqueNm, 0.005)).toBe(true)
      // On the stable branch: above breakdown speed, output falling as speed rises.
      expect(v.ratedRpm).toBeGreaterThan(bd.rpm)
      expect(v.breakdownTorqueNm).toBeGreaterThan(at.shaftTorqueNm)
      expect(evaluateMotor(row.motor, supply, v.ratedRpm + 0.01 * syncRpm(v.poles, v.ratedHz)).outputW ?? 0).toBeLessThan(at.outputW ?? 0)
    }
  })

  it('publishes curves of 8-20 points from standstill to synchronous speed, torque about zero there', () => {
    for (const p of catalogue.performance) {
      if (p.motor.model !== 'curve') continue
      const pts = p.motor.points
      const ns = syncRpm(p.motor.poles, p.motor.ratedHz)
      expect(pts.length).toBeGreaterThanOrEqual(8)
      expect(pts.length).toBeLessThanOrEqual(20)
      expect(pts[0]?.rpm).toBe(0)
      for (let i = 1; i < pts.length; i++) expect(pts[i]?.rpm ?? 0).toBeGreaterThan(pts[i - 1]?.rpm ?? Infinity)
      const last = pts[pts.length - 1]
      expect(last?.rpm).toBe(ns)
      const peak = Math.max(...pts.map((x) => x.torqueNm))
      expect(last?.torqueNm ?? 1).toBeLessThanOrEqual(0)
      expect(last?.torqueNm ?? -1).toBeGreaterThan(-0.1 * peak)
      for (const x of pts) {
        expect(x.currentA).toBeGreaterThan(0)
        expect(x.inputW).toBeGreaterThan(0)
      }
    }
  })

  // Shaded-pole shape (common practice): high slip, breakdown near 70-80 % of synchronous speed,
  // on many motors a torque saddle near a third of synchronous speed (third space harmonic).
  it('gives shaded-pole curves their usual shape', () => {
    let saddles = 0
    for (const p of catalogue.performance) {
      if (typeOf(p.partNumber) !== 'shaded-pole' || p.motor.model !== 'curve') continue
      const supply = { volts: p.volts, hz: p.hz }
      const ns = syncRpm(p.motor.poles, p.hz)
      const bd = breakdownTorque(p.motor, supply)
      expect(bd.rpm / ns).toBeGreaterThan(0.65)
      expect(bd.rpm / ns).toBeLessThan(0.85)
      expect(bd.torqueNm).toBeGreaterThan(evaluateMotor(p.motor, supply, 0).shaftTorqueNm)
      const third = evaluateMotor(p.motor, supply, ns / 3).shaftTorqueNm
      const before = evaluateMotor(p.motor, supply, ns / 6).shaftTorqueNm
      const after = evaluateMotor(p.motor, supply, ns / 2).shaftTorqueNm
      if (third < before && third < after) saddles++
    }
    expect(saddles).toBeGreaterThan(40)
  })

  it('runs each lower PSC tap slower than the one above it on a fan', () => {
    const load = prepareLoad(fanOnDutySystem(demoFan('RH-BLOWER-A')))
    for (const v of catalogue.variants.filter((x) => typeOf(x.partNumber) === 'psc')) {
      const supply = { volts: v.ratedVolts, hz: v.ratedHz }
      const speeds = v.speedTaps.map((tap) => {
        const row = catalogue.performance.find((p) => p.partNumber === v.partNumber && p.tap === tap && p.hz === v.ratedHz)
        if (!row) throw new Error(`${v.partNumber} ${tap} missing`)
        return solveOperatingPoint(row.motor, load, supply).rpm
      })
      for (let i = 1; i < speeds.length; i++) expect(speeds[i] ?? Infinity, v.partNumber).toBeLessThan(speeds[i - 1] ?? 0)
    }
  })
})

describe('DEMO_FANS', () => {
  it('has at least four fans with valid curves from shut-off to free delivery at 1.2 kg/m3', () => {
    expect(DEMO_FANS.length).toBeGreaterThanOrEqual(4)
    expect(new Set(DEMO_FANS.map((f) => f.code)).size).toBe(DEMO_FANS.length)
    for (const f of DEMO_FANS) {
      expect(fanCurveInputSchema.safeParse({ source: 'curve', refRpm: f.refRpm, refDensity: f.refDensity, points: f.points }).success).toBe(true)
      expect(f.refDensity).toBe(1.2)
      expect(f.points.length).toBeGreaterThanOrEqual(7)
      expect(f.points.length).toBeLessThanOrEqual(12)
      expect(f.points[0]?.flowM3s).toBe(0)
      expect(f.points[f.points.length - 1]?.staticPa).toBe(0)
    }
  })

  it('puts each suggested duty on the fan curve at the fan\'s duty speed (fan laws)', () => {
    for (const f of DEMO_FANS) {
      const at = evaluateLoad(fanOnDutySystem(f), f.dutyRpm)
      expect(near(at.flowM3s ?? 0, f.suggestedDuty.flowM3s, 1e-3), f.code).toBe(true)
      expect(near(at.staticPa ?? 0, f.suggestedDuty.staticPa, 2e-3), f.code).toBe(true)
      expect(at.fanStall).toBe(false)
    }
  })

  it('shapes the range-hood blower, bath fan and evaporator fan as their kinds of fan', () => {
    const peakOf = (f: DemoFanSeed) => Math.max(...f.points.map((p) => p.staticPa))
    const freeDelivery = (f: DemoFanSeed) => f.points[f.points.length - 1]?.flowM3s ?? 0
    const maxShaft = (f: DemoFanSeed) => Math.max(...f.points.map((p) => p.shaftW))
    const rh = demoFan('RH-BLOWER-A')
    expect(rh.refRpm).toBeGreaterThanOrEqual(1400)
    expect(rh.refRpm).toBeLessThanOrEqual(1600)
    expect(freeDelivery(rh)).toBeGreaterThanOrEqual(0.17)
    expect(freeDelivery(rh)).toBeLessThanOrEqual(0.2)
    expect(rh.points[0]?.staticPa).toBeGreaterThanOrEqual(250)
    expect(rh.points[0]?.staticPa).toBeLessThanOrEqual(350)
    expect(maxShaft(rh)).toBeGreaterThanOrEqual(40)
    expect(maxShaft(rh)).toBeLessThanOrEqual(90)
    // Forward-curved blower: a stall dip (local pressure minimum) left of the pressure peak.
    const p = rh.points.map((x) => x.staticPa)
    const dip = p.findIndex((v, i) => i > 0 && i < p.length - 1 && v < (p[i - 1] ?? 0) && v < (p[i + 1] ?? 0))
    expect(dip).toBeGreaterThan(0)
    expect(Math.max(...p.slice(dip))).toBeGreaterThan(p[dip] ?? Infinity)
    const bath = demoFan('BATH-CF-A')
    expect(freeDelivery(bath)).toBeGreaterThanOrEqual(0.03)
    expect(freeDelivery(bath)).toBeLessThanOrEqual(0.05)
    expect(peakOf(bath)).toBeGreaterThanOrEqual(100)
    expect(peakOf(bath)).toBeLessThanOrEqual(200)
    expect(maxShaft(bath)).toBeGreaterThanOrEqual(5)
    expect(maxShaft(bath)).toBeLessThanOrEqual(15)
    const evap = demoFan('EVAP-AX-200')
    expect(evap.refRpm).toBeGreaterThanOrEqual(1300)
    expect(evap.refRpm).toBeLessThanOrEqual(1550)
    expect(freeDelivery(evap)).toBeGreaterThanOrEqual(0.09)
    expect(freeDelivery(evap)).toBeLessThanOrEqual(0.15)
    expect(evap.points[0]?.staticPa).toBeGreaterThanOrEqual(40)
    expect(evap.points[0]?.staticPa).toBeLessThanOrEqual(60)
    expect(maxShaft(evap)).toBeGreaterThanOrEqual(5)
    expect(maxShaft(evap)).toBeLessThanOrEqual(10)
    expect(DEMO_FANS.some((f) => f.code === 'COND-AX-250')).toBe(true)
  })
})

describe('demo scenario', () => {
  it('range-hood blower on 120 V 60 Hz: PSC candidates that meet it, fall short at low line or fail; shaded-pole motors cannot drive it', () => {
    const fan = demoFan('RH-BLOWER-A')
    const rows = study(fan, { volts: 120, hz: 60 })
    const t = tally(rows)
    const meets = rows.filter((r) => r.verdict === 'meets')
    console.info(`RH-BLOWER-A at ${fan.suggestedDuty.flowM3s} m3/s, ${fan.suggestedDuty.staticPa} Pa on 120 V 60 Hz (rows = variant x tap):`, t)
    console.info(
      '  e.g. meets:',
      meets
        .slice(0, 6)
        .map((r) => `${r.partNumber}/${r.tap} ${r.nominal.rpm.toFixed(0)}->${r.lowLine.rpm.toFixed(0)} r/min`)
        .join(', '),
    )
    expect(meets.some((r) => r.type === 'psc' && r.poles === 4)).toBe(true)
    expect(meets.some((r) => r.type === 'psc' && r.poles === 6)).toBe(true)
    expect(meets.some((r) => r.tap !== 'HI')).toBe(true)
    expect(t['psc short-at-low-line'] ?? 0).toBeGreaterThanOrEqual(3)
    expect(t['psc fails'] ?? 0).toBeGreaterThanOrEqual(3)
    const sp = rows.filter((r) => r.type === 'shaded-pole')
    expect(sp.length).toBeGreaterThanOrEqual(10)
    for (const r of sp) expect(r.verdict === 'meets' || r.verdict === 'short-at-low-line', r.partNumber).toBe(false)
    // Most are dragged down to a crawl near their torque saddle, far below breakdown speed.
    const crawling = sp.filter((r) => r.nominal.rpm / r.nominal.syncRpm < 0.5)
    console.info(`  shaded-pole: ${sp.length} rows, none reaches the duty; ${crawling.length} held below half synchronous speed`)
    expect(crawling.length).toBeGreaterThan(sp.length / 2)
  })

  it('bath fan: shaded-pole candidates meet it on 120 V 60 Hz and on 230 V 50 Hz', () => {
    const fan = demoFan('BATH-CF-A')
    for (const supply of [{ volts: 120, hz: 60 }, { volts: 230, hz: 50 }]) {
      const t = tally(study(fan, supply))
      console.info(`BATH-CF-A on ${supply.volts} V ${supply.hz} Hz:`, t)
      expect(t['shaded-pole meets'] ?? 0).toBeGreaterThanOrEqual(3)
      expect(t['shaded-pole fails'] ?? 0).toBeGreaterThanOrEqual(1)
    }
  })
})
