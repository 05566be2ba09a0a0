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
import { BoundCache, type BoundMotor, type PreparedMotorBase, type ScanTable } from './curve-motor'
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

export class PreparedCircuitMotor implements PreparedMotorBase {
  readonly prepared = 'motor'
  readonly poles: number
  readonly source: CircuitMotor

  constructor(motor: CircuitMotor) {
    this.source = motor
    this.poles = motor.poles
  }

  private readonly bound = new BoundCache()

  bind(supply: Supply): BoundMotor {
    return this.bound.get(supply) ?? this.bound.put(supply, new BoundCircuitMotor(this.source, supply))
  }
}

/** The circuit on one supply: reactances scaled, constants ready, a scratch solution kept. */
class BoundCircuitMotor implements BoundMotor {
  scanTable?: ScanTable
  solvedOnce = false
  readonly syncRpm: number
  readonly dipRpms: readonly number[] = []
  private readonly ws: number
  private readonly wk: number
  private readonly V: number
  private readonly R1: number
  private readonly X1: number
  private readonly R2: number
  private readonly X2: number
  private readonly Xm: number
  private readonly pFixed: number
  private readonly hasAux: boolean
  private readonly a: number
  private readonly Ra: number
  /** Aux winding reactance less the capacitor's. */
  private readonly Xa: number
  // Solution at the last slip: winding currents and air-gap powers.
  private imr = 0
  private imi = 0
  private iar = 0
  private iai = 0
  private pgf = 0
  private pgb = 0

  constructor(m: CircuitMotor, supply: Supply) {
    this.syncRpm = syncRpm(m.poles, supply.hz)
    this.ws = (this.syncRpm * 2 * Math.PI) / 60
    this.wk = FIXED_LOSS_KNEE * this.ws
    const fr = supply.hz / m.ratedHz
    this.V = supply.volts
    this.R1 = m.r1
    this.X1 = m.x1 * fr
    this.R2 = m.r2
    this.X2 = m.x2 * fr
    this.Xm = m.xm * fr
    this.pFixed = (m.coreLossW ?? 0) + (m.frictionW ?? 0)
    const aux = m.aux
    this.hasAux = aux !== undefined
    this.a = aux?.turnsRatio ?? 0
    this.Ra = aux?.r ?? 0
    this.Xa = aux ? aux.x * fr - 1e6 / (2 * Math.PI * supply.hz * aux.capacitorUf) : 0
  }

  /** Solves the circuit at slip s into the scratch fields. */
  private solve(s: number): void {
    const { Xm, X2, R2, V } = this
    // Half of jXm || (R2/s + jX2), written as jXm (R2 + j s X2) / (R2 + j s (X2 + Xm)) so s = 0 is fine.
    let nr = -Xm * s * X2
    const ni = Xm * R2
    const dr = R2
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
    const ar = this.R1 + rf + rb
    const ai = this.X1 + xf + xb
    if (!this.hasAux) {
      const den = ar * ar + ai * ai
      this.imr = (V * ar) / den
      this.imi = (-V * ai) / den
      this.iar = 0
      this.iai = 0
      const i2 = (V * V) / den
      this.pgf = i2 * rf
      this.pgb = i2 * rb
      return
    }
    const a = this.a
    // B = -j a (Z_f - Z_b); D = Z_a + a^2 (Z_f + Z_b)
    const br = a * (xf - xb)
    const bi = -a * (rf - rb)
    const a2 = a * a
    const Dr = this.Ra + a2 * (rf + rb)
    const Di = this.Xa + a2 * (xf + xb)
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
    this.imr = imr
    this.imi = imi
    this.iar = iar
    this.iai = iai
    // I_f = (I_m - j a I_a)/2, I_b = (I_m + j a I_a)/2
    const ifr = 0.5 * (imr + a * iai)
    const ifi = 0.5 * (imi - a * iar)
    const ibr = 0.5 * (imr - a * iai)
    const ibi = 0.5 * (imi + a * iar)
    this.pgf = 4 * (ifr * ifr + ifi * ifi) * rf
    this.pgb = 4 * (ibr * ibr + ibi * ibi) * rb
  }

  private lossTorque(w: number): number {
    const p = this.pFixed
    if (p === 0) return 0
    return w >= this.wk ? p / w : (p * w) / (this.wk * this.wk)
  }

  torque(rpm: number): number {
    this.solve((this.syncRpm - rpm) / this.syncRpm)
    return (this.pgf - this.pgb) / this.ws - this.lossTorque((rpm * 2 * Math.PI) / 60)
  }

  evaluate(rpm: number): MotorEvaluation {
    const ns = this.syncRpm
    const s = (ns - rpm) / ns
    this.solve(s)
    const { V, pgf, pgb, imr, imi, iar, iai, a } = this
    const w = (rpm * 2 * Math.PI) / 60
    const airGapTorqueNm = (pgf - pgb) / this.ws
    const shaftTorqueNm = airGapTorqueNm - this.lossTorque(w)
    const lr = imr + iar
    const li = imi + iai
    const currentA = norm(lr, li)
    const inputW = V * lr
    const outputW = shaftTorqueNm * w
    const mainCurrentA = norm(imr, imi)
    const auxCurrentA = norm(iar, iai)
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
      statorCopperW: this.R1 * mainCurrentA * mainCurrentA + this.Ra * auxCurrentA * auxCurrentA,
      rotorCopperW: s * pgf + (2 - s) * pgb,
      mainCurrentA,
    }
    if (this.hasAux) {
      result.auxCurrentA = auxCurrentA
      const fm = norm(0.5 * (imr + a * iai), 0.5 * (imi - a * iar))
      const bm = norm(0.5 * (imr - a * iai), 0.5 * (imi + a * iar))
      result.unbalance = fm > 0 ? bm / fm : 0
    } else {
      result.unbalance = 1
    }
    return result
  }
}

/** |x + iy|. Math.hypot guards against overflow these magnitudes never reach, and allocated in V8's builtin on this hot path. */
function norm(x: number, y: number): number {
  return Math.sqrt(x * x + y * y)
}
