import { describe, expect, it } from 'vitest'
import { hotResistance, hotMotor, toleranceAnalysis } from './index'
import { blowerFan, pscCircuit, shadedPoleCurve, axialFan } from './examples'
import { errorField } from './spec-helpers'

describe('hot winding resistance (copper constant 234.5, IEEE 112)', () => {
  it('raises copper resistance by (234.5 + T_hot) / (234.5 + T_ref)', () => {
    // 10 ohm at 20 C is 12.947 ohm at 95 C: 10 x 329.5 / 254.5, worked by hand.
    expect(hotResistance(10, 20, 95)).toBeCloseTo(12.9470, 4)
    // Copper's temperature coefficient at 20 C is about 0.00393 /K (1 / 254.5; handbook value from memory).
    expect(hotResistance(1, 20, 21) - 1).toBeCloseTo(0.00393, 5)
    expect(hotResistance(1, 20, 95, 225)).toBeCloseTo(320 / 245, 12) // aluminium constant 225
  })

  it('scales r1, r2 and the aux resistance of a circuit motor, and nothing else', () => {
    const hot = hotMotor(pscCircuit, { referenceC: 20, hotC: 110, rotorConstant: 225 })
    expect(hot.r1).toBeCloseTo(28 * (234.5 + 110) / 254.5, 12)
    expect(hot.r2).toBeCloseTo(42 * (225 + 110) / 245, 12)
    expect(hot.aux?.r).toBeCloseTo(55 * (234.5 + 110) / 254.5, 12)
    expect(hot.x1).toBe(pscCircuit.x1)
    expect(hot.aux?.capacitorUf).toBe(pscCircuit.aux?.capacitorUf)
  })
})

describe('tolerance analysis (NEMA MG 1 and IEC 60034-1 zone B: +/-10 % voltage)', () => {
  it('runs slower at low line, faster at high line and slower with a hot winding', () => {
    const t = toleranceAnalysis(pscCircuit, blowerFan, { volts: 230, hz: 50 }, { frequencyTolerance: 0.02, hotWinding: { referenceC: 20, hotC: 100 } })
    expect(t.cases.map((c) => c.name)).toEqual(['nominal', 'low-line', 'high-line', 'low-frequency', 'high-frequency', 'hot', 'hot-low-line'])
    expect(t.lowLine.rpm).toBeLessThan(t.nominal.rpm)
    expect(t.highLine.rpm).toBeGreaterThan(t.nominal.rpm)
    const hot = t.cases.find((c) => c.name === 'hot')
    expect(hot?.point.rpm ?? Infinity).toBeLessThan(t.nominal.rpm)
    const hotLow = t.cases.find((c) => c.name === 'hot-low-line')
    expect(hotLow?.point.rpm ?? Infinity).toBeLessThan(t.lowLine.rpm)
    expect(t.slowest.point.rpm).toBe(Math.min(...t.cases.map((c) => c.point.rpm)))
    // 2 % low frequency lowers synchronous speed by 2 %, more than the 10 % voltage drop costs this motor.
    expect(t.slowest.name).toBe('low-frequency')
    expect(t.cases[1]?.supply.volts).toBeCloseTo(207, 12)
    expect(t.anyNoStart).toBe(false)
  })

  it('notes that a measured curve has no hot-winding case', () => {
    const t = toleranceAnalysis(shadedPoleCurve, axialFan, { volts: 230, hz: 50 }, { hotWinding: { referenceC: 20, hotC: 100 } })
    expect(t.cases).toHaveLength(3)
    expect(t.notes[0]).toMatch(/hot winding/)
  })

  it('refuses a tolerance of 100 % or more', () => {
    expect(errorField(() => toleranceAnalysis(pscCircuit, blowerFan, { volts: 230, hz: 50 }, { voltageTolerance: 1.5 }))).toBe('options.voltageTolerance')
  })
})
