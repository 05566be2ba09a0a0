import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { evaluateMotor, prepareMotor, Pchip } from './index'
import { shadedPoleCurve } from './examples'
import { errorField } from './spec-helpers'

const rated = { volts: 230, hz: 50 }

describe('measured motor curve', () => {
  it('interpolates the measured torque by PCHIP (same values as pchip.ts, which matches SciPy)', () => {
    const p = new Pchip(shadedPoleCurve.points.map((q) => q.rpm), shadedPoleCurve.points.map((q) => q.torqueNm))
    for (const rpm of [0, 75, 450, 1075, 1400]) expect(evaluateMotor(shadedPoleCurve, rated, rpm).shaftTorqueNm).toBeCloseTo(p.value(rpm), 14)
  })

  it('scales torque and input power by (V/Vr)^2 and current by V/Vr at fixed slip (DESIGN rule; T ~ V^2, Fitzgerald)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1500, noNaN: true }), (rpm) => {
        const n = evaluateMotor(shadedPoleCurve, rated, rpm)
        const low = evaluateMotor(shadedPoleCurve, { volts: 207, hz: 50 }, rpm)
        expect(low.shaftTorqueNm).toBeCloseTo(0.81 * n.shaftTorqueNm, 12)
        expect(low.inputW ?? NaN).toBeCloseTo(0.81 * (n.inputW ?? NaN), 10)
        expect(low.currentA ?? NaN).toBeCloseTo(0.9 * (n.currentA ?? NaN), 12)
      }),
    )
  })

  it('derives output, efficiency and power factor from the measured columns', () => {
    const e = evaluateMotor(shadedPoleCurve, rated, 1250)
    expect(e.outputW).toBeCloseTo(0.07 * (1250 * 2 * Math.PI) / 60, 12)
    expect(e.efficiency).toBeCloseTo((e.outputW ?? 0) / 32.2, 12)
    expect(e.powerFactor).toBeCloseTo(32.2 / (230 * 0.257), 12)
  })

  it('maps the curve by slip at another frequency', () => {
    // 1250 r/min of 1500 at 50 Hz is slip 1/6; at 60 Hz the same slip is 1500 r/min of 1800.
    const e = evaluateMotor(shadedPoleCurve, { volts: 230, hz: 60 }, 1500)
    expect(e.slip).toBeCloseTo(1 / 6, 12)
    expect(e.shaftTorqueNm).toBeCloseTo(0.07, 12)
  })

  it('refuses bad curves, naming the field', () => {
    const pts = shadedPoleCurve.points
    const swap = [...pts]
    swap[3] = { rpm: 100, torqueNm: 0.04 }
    expect(errorField(() => prepareMotor({ ...shadedPoleCurve, points: swap }))).toBe('motor.points[3].rpm')
    expect(errorField(() => prepareMotor({ ...shadedPoleCurve, points: pts.slice(1) }))).toBe('motor.points[0].rpm')
    expect(errorField(() => prepareMotor({ ...shadedPoleCurve, points: [{ rpm: 0, torqueNm: Number.NaN }, { rpm: 10, torqueNm: 1 }] }))).toBe('motor.points[0].torqueNm')
    expect(errorField(() => prepareMotor({ ...shadedPoleCurve, points: [{ rpm: 0, torqueNm: 1 }, { rpm: 1600, torqueNm: 0 }] }))).toBe('motor.points[1].rpm')
    expect(errorField(() => prepareMotor({ ...shadedPoleCurve, points: [{ rpm: 0, torqueNm: 1, currentA: 1 }, { rpm: 10, torqueNm: 1 }] }))).toBe('motor.points')
    expect(errorField(() => prepareMotor({ ...shadedPoleCurve, ratedVolts: 0 }))).toBe('motor.ratedVolts')
    expect(errorField(() => evaluateMotor(shadedPoleCurve, { volts: 230, hz: Number.NaN }, 0))).toBe('supply.hz')
  })

  it('extends the torque linearly to zero at synchronous speed beyond the last point, flagged', () => {
    const cut = { ...shadedPoleCurve, points: shadedPoleCurve.points.slice(0, 10) } // last point 1350 r/min, 0.045 N m
    const e = evaluateMotor(cut, rated, 1425)
    expect(e.shaftTorqueNm).toBeCloseTo(0.0225, 12)
    expect(e.extrapolated).toBe(true)
    expect(e.currentA).toBeCloseTo(0.25, 12)
  })
})
