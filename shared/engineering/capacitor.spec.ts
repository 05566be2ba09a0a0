import { describe, expect, it } from 'vitest'
import { balancedAtDuty, balancingCapacitor, capacitorSweep, evaluateMotor } from './index'
import { blowerFan, pscCircuit, shadedPoleCurve } from './examples'
import { errorField } from './spec-helpers'
import type { CircuitMotor } from './types'

const mains = { volts: 230, hz: 50 }

describe('PSC capacitor studies (symmetrical components, Fitzgerald)', () => {
  it('finds the classic balancing capacitor Xc = X |Z|^2 / R^2 for an aux winding of the main copper with a = X / R', () => {
    // Derived from the symmetrical-component equations (see machine.spec.ts): at slip s, with the
    // main winding's input impedance R + jX, the balanced capacitor reactance is X (R^2 + X^2) / R^2.
    const base = { r1: 20, x1: 18, r2: 30, x2: 15, xm: 350 }
    const s = 0.08
    const zr = { re: base.r2 / s, im: base.x2 }
    const den = { re: zr.re, im: zr.im + base.xm }
    const num = { re: -base.xm * zr.im, im: base.xm * zr.re }
    const dd = den.re * den.re + den.im * den.im
    const R = base.r1 + (num.re * den.re + num.im * den.im) / dd
    const X = base.x1 + (num.im * den.re - num.re * den.im) / dd
    const a = X / R
    const expectedUf = 1e6 / (2 * Math.PI * 50 * ((X * (R * R + X * X)) / (R * R)))
    const m: CircuitMotor = { model: 'circuit', poles: 4, ratedHz: 50, ...base, aux: { r: a * a * base.r1, x: a * a * base.x1, turnsRatio: a, capacitorUf: 1 } }
    const b = balancingCapacitor(m, mains, 1500 * (1 - s))
    expect(b.capacitorUf).toBeCloseTo(expectedUf, 4)
    expect(b.unbalance).toBeLessThan(1e-5)
  })

  it('sweeps starting torque and duty point against capacitor value', () => {
    const rows = capacitorSweep(pscCircuit, blowerFan, mains, [1, 2, 3, 4, 6])
    expect(rows).toHaveLength(5)
    // More capacitance brings the aux current closer to quadrature at standstill: starting torque
    // rises across this small range (common practice for PSC motors; checked on the model).
    for (let i = 1; i < rows.length; i++) expect(rows[i]?.startingTorqueNm ?? 0).toBeGreaterThan(rows[i - 1]?.startingTorqueNm ?? Infinity)
    for (const r of rows) expect(r.point.status).toBe('running')
  })

  it('settles the balancing capacitor at the duty point it produces, with less unbalance than the fitted one', () => {
    const b = balancedAtDuty(pscCircuit, blowerFan, mains)
    const withIt = evaluateMotor({ ...pscCircuit, aux: { r: 55, x: 30, turnsRatio: 1.35, capacitorUf: b.capacitorUf } }, mains, b.point.rpm)
    const fitted = evaluateMotor(pscCircuit, mains, b.point.rpm)
    expect(withIt.unbalance ?? 1).toBeLessThanOrEqual(fitted.unbalance ?? 0)
    expect(Math.abs(b.point.rpm - b.rpm)).toBeLessThan(1)
  })

  it('refuses a motor without an auxiliary winding', () => {
    expect(errorField(() => capacitorSweep(shadedPoleCurve, blowerFan, mains, [2]))).toBe('motor')
    expect(errorField(() => capacitorSweep(pscCircuit, blowerFan, mains, [2, -1]))).toBe('capacitorsUf[1]')
  })
})
