import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { evaluateMotor, prepareMotor, syncRpm, EngineeringInputError, FIXED_LOSS_KNEE } from './index'
import type { CircuitMotor } from './types'
import { errorField } from './spec-helpers'

// Fitzgerald, Kingsley & Umans, Electric Machinery, chapter on single-phase motors: worked example
// of a 1/4 hp, 110 V, 60 Hz, 4-pole capacitor-start motor running on its main winding.
const fitzgerald: CircuitMotor = {
  model: 'circuit', poles: 4, ratedHz: 60, r1: 2.02, x1: 2.79, r2: 4.12, x2: 2.12, xm: 66.8, coreLossW: 24, frictionW: 13,
}

describe('single-phase motor on its main winding (double-revolving-field theory)', () => {
  it('reproduces the Fitzgerald worked example at slip 0.05', () => {
    // Book answers recalled from memory: 3.6 A, PF 0.62, 147 W output, 0.82 N m, efficiency 60 %;
    // tolerances are a few per cent because the recollection is rounded.
    const e = evaluateMotor(fitzgerald, { volts: 110, hz: 60 }, 1800 * 0.95)
    expect(e.currentA).toBeCloseTo(3.6, 1)
    expect(e.powerFactor).toBeCloseTo(0.62, 2)
    expect(e.outputW ?? 0).toBeGreaterThan(145)
    expect(e.outputW ?? 0).toBeLessThan(150)
    expect(e.shaftTorqueNm).toBeCloseTo(0.82, 2)
    expect(e.efficiency).toBeCloseTo(0.6, 1)
  })

  it('reproduces the Chapman split-phase problem (120 V, 1/4 hp, 4 poles, rotational loss 51 W, s = 0.05)', () => {
    // Chapman, Electric Machinery Fundamentals, single-phase motor problems. Reference values worked
    // out apart from this code (Python complex arithmetic, following Chapman's steps: Z_F, Z_B,
    // I = V / Z_in, P_AG = I^2 (R_F - R_B), tau_ind = P_AG / w_sync, P_conv = (1 - s) P_AG,
    // P_out = P_conv - P_rot): I = 4.86 A at -46.2 deg, PF 0.692, P_in 403 W, P_AG 325 W,
    // P_out 258 W, tau_ind 1.72 N m, tau_load 1.44 N m, efficiency 64 %. The current agrees with the
    // book's solution as recalled from memory; tolerance 2 % for the rounding.
    const chapman: CircuitMotor = { model: 'circuit', poles: 4, ratedHz: 60, r1: 2.0, x1: 2.56, xm: 60.5, r2: 2.8, x2: 2.56, frictionW: 51 }
    const e = evaluateMotor(chapman, { volts: 120, hz: 60 }, 1800 * 0.95)
    const close = (v: number | undefined, ref: number) => expect(Math.abs((v ?? NaN) - ref) / ref).toBeLessThan(0.02)
    close(e.currentA, 4.86)
    close(e.powerFactor, 0.692)
    close(e.inputW, 403)
    close((e.forwardAirGapW ?? 0) - (e.backwardAirGapW ?? 0), 325)
    close(e.outputW, 258)
    close(e.airGapTorqueNm, 1.72)
    close(e.shaftTorqueNm, 1.44)
    close(e.efficiency, 0.64)
  })

  it('has no starting torque on the main winding alone (Fitzgerald: forward and backward torques cancel at standstill)', () => {
    const e = evaluateMotor(fitzgerald, { volts: 110, hz: 60 }, 0)
    expect(Math.abs(e.shaftTorqueNm)).toBeLessThan(1e-12)
    expect(e.currentA ?? 0).toBeGreaterThan(10)
  })
})

/** A PSC motor invented for the tests (Ashcombe-style 4-pole fan motor, not a real product). */
const psc: CircuitMotor = {
  model: 'circuit', poles: 4, ratedHz: 50, r1: 28, x1: 22, r2: 42, x2: 20, xm: 420, coreLossW: 4, frictionW: 2,
  aux: { r: 55, x: 30, turnsRatio: 1.35, capacitorUf: 3 },
}

const arbitraryPsc = fc.record({
  r1: fc.double({ min: 0.5, max: 80, noNaN: true }),
  x1: fc.double({ min: 0.5, max: 80, noNaN: true }),
  r2: fc.double({ min: 0.5, max: 120, noNaN: true }),
  x2: fc.double({ min: 0.5, max: 80, noNaN: true }),
  xm: fc.double({ min: 20, max: 1000, noNaN: true }),
  ar: fc.double({ min: 0.5, max: 200, noNaN: true }),
  ax: fc.double({ min: 0, max: 100, noNaN: true }),
  a: fc.double({ min: 0.5, max: 2.5, noNaN: true }),
  c: fc.double({ min: 0.5, max: 30, noNaN: true }),
  s: fc.double({ min: -0.2, max: 1, noNaN: true }),
})

describe('PSC motor by symmetrical components (Fitzgerald, unsymmetrical two-phase motors)', () => {
  it('balances power: input = stator copper + forward + backward air-gap power (property)', () => {
    fc.assert(
      fc.property(arbitraryPsc, (p) => {
        const m: CircuitMotor = {
          model: 'circuit', poles: 4, ratedHz: 50, r1: p.r1, x1: p.x1, r2: p.r2, x2: p.x2, xm: p.xm,
          aux: { r: p.ar, x: p.ax, turnsRatio: p.a, capacitorUf: p.c },
        }
        const e = evaluateMotor(m, { volts: 230, hz: 50 }, 1500 * (1 - p.s))
        const balance = (e.statorCopperW ?? 0) + (e.forwardAirGapW ?? 0) + (e.backwardAirGapW ?? 0)
        expect(Math.abs((e.inputW ?? NaN) - balance)).toBeLessThan(1e-9 * Math.max(1, Math.abs(balance)))
        // And the air-gap powers split into rotor copper and mechanical power.
        const mech = (1 - e.slip) * ((e.forwardAirGapW ?? 0) - (e.backwardAirGapW ?? 0))
        expect((e.rotorCopperW ?? 0) + mech).toBeCloseTo((e.forwardAirGapW ?? 0) + (e.backwardAirGapW ?? 0), 6)
      }),
    )
  })

  it('kills the backward field when the windings are balanced', () => {
    // Classic balanced-PSC conditions, derived from the symmetrical-component equations above for an
    // auxiliary winding of the same copper as the main (Z_aux = a^2 Z_1main): with the main
    // winding's input impedance R + jX at the duty slip (I_b = 0, so Z = R1 + jX1 + jXm || (R2/s + jX2)),
    // balance needs a = X / R and a capacitor reactance Xc = X |Z|^2 / R^2.
    const base = { r1: 20, x1: 18, r2: 30, x2: 15, xm: 350 }
    const s = 0.08
    const zr = { re: base.r2 / s, im: base.x2 }
    const den = { re: zr.re, im: zr.im + base.xm }
    const num = { re: -base.xm * zr.im, im: base.xm * zr.re }
    const dd = den.re * den.re + den.im * den.im
    const R = base.r1 + (num.re * den.re + num.im * den.im) / dd
    const X = base.x1 + (num.im * den.re - num.re * den.im) / dd
    const a = X / R
    const xc = (X * (R * R + X * X)) / (R * R)
    const capacitorUf = 1e6 / (2 * Math.PI * 50 * xc)
    const m: CircuitMotor = {
      model: 'circuit', poles: 4, ratedHz: 50, ...base,
      aux: { r: a * a * base.r1, x: a * a * base.x1, turnsRatio: a, capacitorUf },
    }
    const e = evaluateMotor(m, { volts: 230, hz: 50 }, 1500 * (1 - s))
    expect(e.unbalance ?? 1).toBeLessThan(1e-9)
    expect(e.backwardAirGapW ?? 1).toBeLessThan(1e-9 * (e.forwardAirGapW ?? 0))
    // Balanced two-phase: aux current is a times smaller and leads the main current by 90 degrees.
    expect((e.auxCurrentA ?? 0) * a).toBeCloseTo(e.mainCurrentA ?? 0, 9)
  })

  it('starts forwards: positive starting torque in the direction the capacitor winding drives', () => {
    const e = evaluateMotor(psc, { volts: 230, hz: 50 }, 0)
    expect(e.shaftTorqueNm).toBeGreaterThan(0.05)
  })

  it('scales torque at fixed slip by 0.81 at 90 % voltage (linear model: T ~ V^2; Fitzgerald)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1500, noNaN: true }), (rpm) => {
        const nominal = evaluateMotor(psc, { volts: 230, hz: 50 }, rpm)
        const low = evaluateMotor(psc, { volts: 207, hz: 50 }, rpm)
        expect(low.airGapTorqueNm ?? NaN).toBeCloseTo(0.81 * (nominal.airGapTorqueNm ?? NaN), 10)
      }),
    )
  })

  it('scales reactances with frequency: synchronous speed follows 120 f / p', () => {
    const p = prepareMotor(psc)
    expect(p.bind({ volts: 230, hz: 60 }).syncRpm).toBe(1800)
    const e = evaluateMotor(psc, { volts: 230, hz: 50 }, 1500)
    expect(e.slip).toBe(0)
    expect(e.shaftTorqueNm).toBeLessThan(0) // at synchronous speed only losses and the backward field remain
  })
})

describe('fixed losses near standstill (our documented choice)', () => {
  it('follows the textbook constant-loss rule above the knee and adds no drag at standstill', () => {
    const supply = { volts: 230, hz: 50 }
    const ns = 1500
    for (const rpm of [FIXED_LOSS_KNEE * ns, 0.8 * ns, 0.97 * ns]) {
      const e = evaluateMotor(psc, supply, rpm)
      const textbook = (1 - e.slip) * ((e.forwardAirGapW ?? 0) - (e.backwardAirGapW ?? 0)) - 6
      expect(e.outputW ?? NaN).toBeCloseTo(textbook, 9)
    }
    const start = evaluateMotor(psc, supply, 0)
    expect(start.shaftTorqueNm).toBeCloseTo(start.airGapTorqueNm ?? NaN, 12)
  })
})

describe('synchronous speed (common practice)', () => {
  it('is 1800 r/min for four poles at 60 Hz and 1500 r/min at 50 Hz', () => {
    expect(syncRpm(4, 60)).toBe(1800)
    expect(syncRpm(4, 50)).toBe(1500)
    expect(syncRpm(2, 60)).toBe(3600)
  })

  it('refuses an odd pole count, naming the field', () => {
    expect(() => syncRpm(3, 50)).toThrow(EngineeringInputError)
    expect(errorField(() => evaluateMotor({ ...psc, poles: 5 }, { volts: 230, hz: 50 }, 100))).toBe('motor.poles')
    expect(errorField(() => evaluateMotor(psc, { volts: 230, hz: 50 }, -1))).toBe('rpm')
    expect(errorField(() => evaluateMotor({ ...psc, aux: { r: 1, x: 1, turnsRatio: 1, capacitorUf: Number.NaN } }, { volts: 230, hz: 50 }, 1))).toBe('motor.aux.capacitorUf')
  })
})
