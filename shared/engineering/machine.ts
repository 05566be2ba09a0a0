/**
 * Single-phase induction motor by its equivalent circuit.
 *
 * Main winding alone: double-revolving-field theory (Fitzgerald, Kingsley & Umans, Electric
 * Machinery, chapter on single-phase motors): the pulsating field is split into forward and
 * backward fields, each seen through half the rotor-plus-magnetising branch,
 *   Z_f = 0.5 jXm || (R2/s + jX2),   Z_b = 0.5 jXm || (R2/(2-s) + jX2),
 *   I = V / (R1 + jX1 + Z_f + Z_b),  P_gf = |I|^2 Re Z_f,  P_gb = |I|^2 Re Z_b.
 *
 * PSC motor: the main and auxiliary windings in space quadrature analysed by symmetrical
 * components (Fitzgerald, "unsymmetrical two-phase motors"). With a = N_aux / N_main, the aux
 * winding impedance Z_a = r + jx - jXc (run capacitor in series) and both windings on V:
 *   V = (R1 + jX1 + Z_f + Z_b) I_m - j a (Z_f - Z_b) I_a
 *   V = j a (Z_f - Z_b) I_m + (Z_a + a^2 (Z_f + Z_b)) I_a
 * The forward and backward current components are I_f = (I_m - j a I_a) / 2 and
 * I_b = (I_m + j a I_a) / 2, and the air-gap powers P_gf = 4 |I_f|^2 Re Z_f, P_gb = 4 |I_b|^2 Re Z_b
 * (two phases, halved branches). Forward is the sequence in which the aux current leads the main
 * current, i.e. the direction the capacitor winding drives, so a PSC motor starts forwards.
 *
 * Torque and power at slip s (synchronous angular speed w_s):
 *   T_airgap = (P_gf - P_gb) / w_s,  P_mech = (1 - s)(P_gf - P_gb),
 *   P_out = P_mech - coreLossW - frictionW  (the textbooks' constant rotational losses).
 * Fixed losses near standstill (our choice): the constant-power rule would give an infinite drag
 * torque at zero speed, so below half synchronous speed the fixed losses act as a drag torque
 * proportional to speed, P_fixed w / w_k^2 with w_k = 0.5 w_s. It meets the textbook rule at
 * w_k, leaves every point above half synchronous speed exactly as the textbooks give it, and
 * makes no drag at standstill (the starting torque is the air-gap torque).
 *
 * Reactances are given at ratedHz and scaled with the supply frequency; the capacitor's
 * reactance is 1 / (2 pi f C). Resistances are taken as given (see tolerance.ts for a hot winding).
 * The model is linear (no saturation), so torque at fixed slip goes with V^2.
 *
 * Complex arithmetic is written out on plain numbers: this runs in the solver's inner loop.
 */
import { requireFinite, requireNonNegative, requireObject, requirePoles, requirePositive } from './errors'
import type { BoundMotor, PreparedMotorBase } from './curve-motor'
import { syncRpm } from './speed'
import type { AuxWinding, CircuitMotor, MotorEvaluation, Supply } from './types'

/** Below this fraction of synchronous speed the fixed losses fade out (see the file comment). */
export const FIXED_LOSS_KNEE = 0.5

export function validateCircuitMotor(input: unknown, field = 'motor'): CircuitMotor {
  const m = requireObject(input, field)
  const poles = requirePoles(m.poles, `${field}.poles`)
  const motor: CircuitMotor = {
    model: 'circuit',
    poles,
    ratedHz: requirePositive(m.ratedHz, `${field}.ratedHz`),
    r1: requireNonNegative(m.r1, `${field}.r1`),
    x1: requireNonNegative(m.x1, `${field}.x1`),
    r2: requirePositive(m.r2, `${field}.r2`),
    x2: requireNonNegative(m.x2, `${field}.x2`),
    xm: requirePositive(m.xm, `${field}.xm`),
  }
  if (m.coreLossW !== undefined) motor.coreLossW = requireNonNegative(m.coreLossW, `${field}.coreLossW`)
  if (m.frictionW !== undefined) motor.frictionW = requireNonNegative(m.frictionW, `${field}.frictionW`)
  if (m.aux !== undefined) {
    const a = requireObject(m.aux, `${field}.aux`)
    const aux: AuxWinding = {
      r: requireNonNegative(a.r, `${field}.aux.r`),
      x: requireNonNegative(a.x, `${field}.aux.x`),
      turnsRatio: requirePositive(a.turnsRatio, `${field}.aux.turnsRatio`),
      capacitorUf: requirePositive(a.capacitorUf, `${field}.aux.capacitorUf`),
    }
    requireFinite(aux.capacitorUf, `${field}.aux.capacitorUf`)
    motor.aux = aux
  }
  return motor
}

/** Indices into the scratch array the circuit solve writes. */
const IM_RE = 0
const IM_IM = 1
const IA_RE = 2
const IA_IM = 3
const PGF = 4
const PGB = 5

export class PreparedCircuitMotor implements PreparedMotorBase {
  readonly prepared = 'motor'
  readonly poles: number
  readonly source: CircuitMotor

  constructor(motor: CircuitMotor) {
    this.source = motor
    this.poles = motor.poles
  }

  bind(supply: Supply): BoundMotor {
    const m = this.source
    const ns = syncRpm(m.poles, supply.hz)
    const ws = (ns * 2 * Math.PI) / 60
    const wk = FIXED_LOSS_KNEE * ws
    const fr = supply.hz / m.ratedHz
    const V = supply.volts
    const R1 = m.r1
    const X1 = m.x1 * fr
    const R2 = m.r2
    const X2 = m.x2 * fr
    const Xm = m.xm * fr
    const pFixed = (m.coreLossW ?? 0) + (m.frictionW ?? 0)
    const aux = m.aux
    const a = aux?.turnsRatio ?? 0
    const Ra = aux?.r ?? 0
    const Xa = aux ? aux.x * fr - 1e6 / (2 * Math.PI * supply.hz * aux.capacitorUf) : 0
    const out = new Float64Array(6)

    /** Fills `out` with the winding currents and air-gap powers at slip s. */
    const solve = (s: number): void => {
      // Half of jXm || (R2/s + jX2), written as jXm (R2 + j s X2) / (R2 + j s (X2 + Xm)) so s = 0 is fine.
      let nr = -Xm * s * X2
      let ni = Xm * R2
      let dr = R2
      let di = s * (X2 + Xm)
      let dd = 2 * (dr * dr + di * di)
      const rf = (nr * dr + ni * di) / dd
      const xf = (ni * dr - nr * di) / dd
      const sb = 2 - s
      nr = -Xm * sb * X2
      di = sb * (X2 + Xm)
      dd = 2 * (dr * dr + di * di)
      const rb = (nr * dr + ni * di) / dd
      const xb = (ni * dr - nr * di) / dd
      const ar = R1 + rf + rb
      const ai = X1 + xf + xb
      if (aux === undefined) {
        const den = ar * ar + ai * ai
        out[IM_RE] = (V * ar) / den
        out[IM_IM] = (-V * ai) / den
        out[IA_RE] = 0
        out[IA_IM] = 0
        const i2 = (V * V) / den
        out[PGF] = i2 * rf
        out[PGB] = i2 * rb
        return
      }
      // B = -j a (Z_f - Z_b); D = Z_a + a^2 (Z_f + Z_b)
      const br = a * (xf - xb)
      const bi = -a * (rf - rb)
      const a2 = a * a
      const Dr = Ra + a2 * (rf + rb)
      const Di = Xa + a2 * (xf + xb)
      // det = A D + B^2
      const detr = ar * Dr - ai * Di + br * br - bi * bi
      const deti = ar * Di + ai * Dr + 2 * br * bi
      const detm = detr * detr + deti * deti
      // I_m = V (D - B) / det, I_a = V (A + B) / det
      const pr = Dr - br
      const pi = Di - bi
      const imr = (V * (pr * detr + pi * deti)) / detm
      const imi = (V * (pi * detr - pr * deti)) / detm
      const qr = ar + br
      const qi = ai + bi
      const iar = (V * (qr * detr + qi * deti)) / detm
      const iai = (V * (qi * detr - qr * deti)) / detm
      out[IM_RE] = imr
      out[IM_IM] = imi
      out[IA_RE] = iar
      out[IA_IM] = iai
      // I_f = (I_m - j a I_a)/2, I_b = (I_m + j a I_a)/2
      const ifr = 0.5 * (imr + a * iai)
      const ifi = 0.5 * (imi - a * iar)
      const ibr = 0.5 * (imr - a * iai)
      const ibi = 0.5 * (imi + a * iar)
      out[PGF] = 4 * (ifr * ifr + ifi * ifi) * rf
      out[PGB] = 4 * (ibr * ibr + ibi * ibi) * rb
    }

    const lossTorque = (w: number): number => (pFixed === 0 ? 0 : w >= wk ? pFixed / w : (pFixed * w) / (wk * wk))

    const torque = (rpm: number): number => {
      solve((ns - rpm) / ns)
      return ((out[PGF] ?? 0) - (out[PGB] ?? 0)) / ws - lossTorque((rpm * 2 * Math.PI) / 60)
    }

    return {
      syncRpm: ns,
      dipRpms: [],
      torque,
      evaluate(rpm: number): MotorEvaluation {
        const s = (ns - rpm) / ns
        solve(s)
        const w = (rpm * 2 * Math.PI) / 60
        const pgf = out[PGF] ?? 0
        const pgb = out[PGB] ?? 0
        const airGapTorqueNm = (pgf - pgb) / ws
        const shaftTorqueNm = airGapTorqueNm - lossTorque(w)
        const imr = out[IM_RE] ?? 0
        const imi = out[IM_IM] ?? 0
        const iar = out[IA_RE] ?? 0
        const iai = out[IA_IM] ?? 0
        const lr = imr + iar
        const li = imi + iai
        const currentA = Math.hypot(lr, li)
        const inputW = V * lr
        const outputW = shaftTorqueNm * w
        const mainCurrentA = Math.hypot(imr, imi)
        const auxCurrentA = Math.hypot(iar, iai)
        const result: MotorEvaluation = {
          rpm,
          slip: s,
          shaftTorqueNm,
          airGapTorqueNm,
          currentA,
          powerFactor: currentA > 0 ? inputW / (V * currentA) : 0,
          inputW,
          outputW,
          efficiency: inputW > 0 && outputW > 0 ? outputW / inputW : 0,
          forwardAirGapW: pgf,
          backwardAirGapW: pgb,
          statorCopperW: R1 * mainCurrentA * mainCurrentA + Ra * auxCurrentA * auxCurrentA,
          rotorCopperW: s * pgf + (2 - s) * pgb,
          mainCurrentA,
        }
        if (aux) {
          result.auxCurrentA = auxCurrentA
          const ifr = 0.5 * (imr + a * iai)
          const ifi = 0.5 * (imi - a * iar)
          const ibr = 0.5 * (imr - a * iai)
          const ibi = 0.5 * (imi + a * iar)
          const fm = Math.hypot(ifr, ifi)
          result.unbalance = fm > 0 ? Math.hypot(ibr, ibi) / fm : 0
        } else {
          result.unbalance = 1
        }
        return result
      },
    }
  }
}
