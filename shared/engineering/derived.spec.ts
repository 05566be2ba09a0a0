import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import {
  airPowerW, breakdownMargin, breakdownTorque, dutyFigures, efficiencyWarnings, energyCost, insulationClass,
  insulationMarginK, prepareMotor, shadedPoleRotation, solveOperatingPoint, systemEfficiency, temperatureRiseByResistance,
  type MotorModel,
} from './index'
import { axialFan, blowerFan, pscCircuit, shadedPoleCurve } from './examples'
import { errorField } from './spec-helpers'

const mains = { volts: 230, hz: 50 }

describe('air power and system efficiency (ASHRAE Handbook, Fans: air power = Q x p)', () => {
  it('multiplies flow and static pressure: 1000 CFM at 1 inH2O is about 117.5 W', () => {
    // 1000 ft3/min x 249.0889 Pa (NIST SP 811 factors) = 0.4719474 m3/s x 249.0889 Pa.
    expect(airPowerW(0.4719474, 249.0889)).toBeCloseTo(117.557, 2)
    // Cross-check with the US rule: air hp = CFM x inH2O / 6356 (ASHRAE, from memory): 0.15733 hp.
    expect(airPowerW(0.4719474, 249.0889) / 745.6999).toBeCloseTo(1000 / 6356, 3)
  })

  it('gives system efficiency as air power over electrical input', () => {
    const p = solveOperatingPoint(pscCircuit, blowerFan, mains)
    expect(systemEfficiency(p)).toBeCloseTo(((p.flowM3s ?? 0) * (p.staticPa ?? 0)) / (p.inputW ?? 1), 12)
    expect(systemEfficiency(p)).toBeLessThan(p.efficiency ?? 0)
  })
})

describe('breakdown torque and margins', () => {
  it('finds the shaded-pole curve peak on its knot (PCHIP extrema lie on knots)', () => {
    const b = breakdownTorque(shadedPoleCurve, mains)
    expect(b.rpm).toBeCloseTo(1150, 3)
    expect(b.torqueNm).toBeCloseTo(0.08, 9)
  })

  it('takes a measured curve\'s peak on its knots: no torque sampled densely in between is higher (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0.01, max: 0.2, noNaN: true }), { minLength: 4, maxLength: 12 }), fc.double({ min: 180, max: 250, noNaN: true }), (torques, volts) => {
        const top = 1450
        const points = torques.map((torqueNm, i) => ({ rpm: (top * i) / (torques.length - 1), torqueNm }))
        const motor: MotorModel = { ...shadedPoleCurve, points }
        const supply = { volts, hz: 50 }
        const peak = breakdownTorque(motor, supply)
        const bound = prepareMotor(motor).bind(supply)
        for (let i = 0; i <= 3000; i++) expect(bound.torque((bound.syncRpm * i) / 3000)).toBeLessThanOrEqual(peak.torqueNm * (1 + 1e-12))
        expect(bound.torque(peak.rpm)).toBe(peak.torqueNm)
      }),
      { numRuns: 60 },
    )
  })

  it('reports a duty point on the stable side of the peak with a torque ratio above 1', () => {
    const p = solveOperatingPoint(shadedPoleCurve, axialFan, mains)
    const m = breakdownMargin(shadedPoleCurve, mains, p)
    expect(m.speedMarginRpm).toBeGreaterThan(0)
    expect(m.torqueRatio).toBeCloseTo(0.08 / p.shaftTorqueNm, 6)
    const f = dutyFigures(shadedPoleCurve, mains, p, { hoursPerYear: 4000, tariffPerKWh: 0.3, years: 10, purchasePrice: 12 })
    expect(f.energy?.kWhPerYear).toBeCloseTo(((p.inputW ?? 0) * 4000) / 1000, 9)
  })
})

describe('winding temperature by the resistance method (IEC 60034-1, IEEE 112; copper 234.5)', () => {
  it('computes T_hot = R_hot/R_cold (234.5 + T_cold) - 234.5 and the rise over ambient', () => {
    // Worked by hand: 10.0 ohm cold at 20 C, 12.5 ohm hot, ambient 25 C: 1.25 x 254.5 - 234.5 = 83.625 C.
    const r = temperatureRiseByResistance({ coldOhm: 10, hotOhm: 12.5, coldC: 20, ambientC: 25 })
    expect(r.windingC).toBeCloseTo(83.625, 9)
    expect(r.riseK).toBeCloseTo(58.625, 9)
    // IEC 60034-1 states the constant as 235: the rise then is 83.75 - 25 = 58.75 K.
    expect(temperatureRiseByResistance({ coldOhm: 10, hotOhm: 12.5, coldC: 20, ambientC: 25, constant: 235 }).riseK).toBeCloseTo(58.75, 9)
    expect(errorField(() => temperatureRiseByResistance({ coldOhm: 0, hotOhm: 1, coldC: 20, ambientC: 20 }))).toBe('coldOhm')
  })
})

describe('insulation thermal classes (IEC 60085)', () => {
  it.each([
    ['A', 105],
    ['E', 120],
    ['B', 130],
    ['F', 155],
    ['H', 180],
  ] as const)('class %s is %i C', (letter, c) => {
    expect(insulationClass(letter)?.classC).toBe(c)
    expect(insulationClass(c)?.letter).toBe(letter)
  })

  it('gives the margin of a winding temperature to its class', () => {
    const b = insulationClass('B')
    expect(b && insulationMarginK(115, b, 10)).toBe(5)
    expect(insulationClass('Q')).toBeUndefined()
  })
})

describe('energy and total cost of ownership', () => {
  it('is input W x hours x tariff, over the life', () => {
    // 40 W for 3000 h a year is 120 kWh; at 0.25 a kWh that is 30 a year, 300 over 10 years.
    const e = energyCost({ inputW: 40, hoursPerYear: 3000, tariffPerKWh: 0.25, years: 10, purchasePrice: 18 })
    expect(e.kWhPerYear).toBeCloseTo(120, 12)
    expect(e.costPerYear).toBeCloseTo(30, 12)
    expect(e.lifeEnergyCost).toBeCloseTo(300, 12)
    expect(e.totalCostOfOwnership).toBeCloseTo(318, 12)
    expect(errorField(() => energyCost({ inputW: 40, hoursPerYear: 9000, tariffPerKWh: 0.25, years: 1 }))).toBe('hoursPerYear')
  })
})

describe('motor types (common practice)', () => {
  it('turns a shaded-pole motor toward its shaded pole side, reversed by turning the stator over', () => {
    expect(shadedPoleRotation('clockwise')).toBe('clockwise')
    expect(shadedPoleRotation('clockwise', true)).toBe('counterclockwise')
    expect(shadedPoleRotation('counterclockwise', true)).toBe('clockwise')
  })

  it('warns of an efficiency untypical for the type: shaded-pole motors are low in efficiency', () => {
    expect(efficiencyWarnings('shaded-pole', 0.6)).toHaveLength(1)
    expect(efficiencyWarnings('psc', 0.6)).toHaveLength(0)
    expect(efficiencyWarnings('shaded-pole', 0.22)).toHaveLength(0)
  })
})
