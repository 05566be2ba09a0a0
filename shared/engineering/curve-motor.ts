/**
 * Motor known by a measured speed-torque curve (shaft torque, optionally line current and input
 * power) at rated volts and Hz, interpolated by PCHIP (see pchip.ts).
 *
 * Voltage scaling, the usual small-signal rule for an induction motor whose magnetic circuit is
 * not saturated (Fitzgerald, Electric Machinery, torque proportional to V^2 at fixed slip):
 * at supply V and fixed slip, torque and input power scale with (V / V_rated)^2, current with
 * V / V_rated. At another frequency the curve is mapped by slip (speeds scale with synchronous
 * speed) and the voltage rules kept: a measured curve says nothing about frequency, so use a
 * circuit model for frequency studies.
 *
 * Beyond the last measured speed the torque runs linearly to zero at synchronous speed (the
 * near-linear torque-slip law of an induction motor at small slip) and on past it; current and
 * input power are held at their last values. Such points are flagged `extrapolated`.
 */
import { EngineeringInputError, requireArray, requireFinite, requireObject, requirePoles, requirePositive } from './errors'
import { Pchip } from './pchip'
import { radPerSecond, syncRpm } from './speed'
import type { CurveMotor, CurvePoint, MotorEvaluation, Supply } from './types'

export interface BoundMotor {
  readonly syncRpm: number
  /** Shaft torque in N m at `rpm` (the solver's hot path). */
  torque(rpm: number): number
  evaluate(rpm: number): MotorEvaluation
  /** Speeds (at this supply) where the torque curve may have a local minimum: the scan visits them. */
  readonly dipRpms: readonly number[]
  /**
   * Measured curves: every data point's speed at this supply. PCHIP is monotone between knots, so
   * the torque's maxima are among these and the ends of the speed range (breakdownTorque()).
   * Absent for circuit models.
   */
  readonly knotRpms?: readonly number[]
  /** The solver's scan from standstill on this supply, filled when it is solved again (solver.ts). */
  scanTable?: ScanTable
  solvedOnce: boolean
}

export interface ScanTable {
  speeds: readonly number[]
  torques: readonly number[]
  startTorque: number
}

export interface PreparedMotorBase {
  readonly prepared: 'motor'
  readonly poles: number
  bind(supply: Supply): BoundMotor
}

/**
 * The last few supplies a prepared motor was bound to, with their bound motors. A study solves
 * every candidate at the same two or three supplies, run after run; binding once per supply saves
 * the allocation. Bound motors keep scratch state but the engine is synchronous, so sharing is safe.
 */
export class BoundCache {
  private static readonly SIZE = 4
  private readonly volts: number[] = []
  private readonly hz: number[] = []
  private readonly motors: BoundMotor[] = []
  private next = 0

  get(supply: Supply): BoundMotor | undefined {
    for (let i = 0; i < this.motors.length; i++) {
      if (this.volts[i] === supply.volts && this.hz[i] === supply.hz) return this.motors[i]
    }
    return undefined
  }

  put(supply: Supply, motor: BoundMotor): BoundMotor {
    const slot = this.next
    this.next = (slot + 1) % BoundCache.SIZE
    this.volts[slot] = supply.volts
    this.hz[slot] = supply.hz
    this.motors[slot] = motor
    return motor
  }
}

export function validateCurveMotor(input: unknown, field = 'motor'): CurveMotor {
  const m = requireObject(input, field)
  const poles = requirePoles(m.poles, `${field}.poles`)
  const ratedVolts = requirePositive(m.ratedVolts, `${field}.ratedVolts`)
  const ratedHz = requirePositive(m.ratedHz, `${field}.ratedHz`)
  const ns = syncRpm(poles, ratedHz)
  const raw = requireArray(m.points, `${field}.points`, 2)
  const points: CurvePoint[] = []
  let withCurrent = 0
  let withInput = 0
  raw.forEach((p, i) => {
    const f = `${field}.points[${i}]`
    const o = requireObject(p, f)
    const rpm = requireFinite(o.rpm, `${f}.rpm`)
    if (rpm < 0) throw new EngineeringInputError(`${f}.rpm`, 'speed must not be negative')
    if (i === 0 && rpm !== 0) throw new EngineeringInputError(`${f}.rpm`, 'the first point must be at standstill (rpm 0)')
    const prev = points[i - 1]
    if (prev && rpm <= prev.rpm) throw new EngineeringInputError(`${f}.rpm`, 'speeds must be strictly increasing')
    if (rpm > ns) throw new EngineeringInputError(`${f}.rpm`, `above synchronous speed ${ns} r/min at rated Hz`)
    const torqueNm = requireFinite(o.torqueNm, `${f}.torqueNm`)
    if (rpm === ns && torqueNm > 0) {
      throw new EngineeringInputError(`${f}.torqueNm`, 'torque at synchronous speed must be 0 or below')
    }
    const point: CurvePoint = { rpm, torqueNm }
    if (o.currentA !== undefined) {
      const c = requireFinite(o.currentA, `${f}.currentA`)
      if (c < 0) throw new EngineeringInputError(`${f}.currentA`, 'must not be negative')
      point.currentA = c
      withCurrent++
    }
    if (o.inputW !== undefined) {
      const w = requireFinite(o.inputW, `${f}.inputW`)
      if (w < 0) throw new EngineeringInputError(`${f}.inputW`, 'must not be negative')
      point.inputW = w
      withInput++
    }
    points.push(point)
  })
  if (withCurrent !== 0 && withCurrent !== points.length) {
    throw new EngineeringInputError(`${field}.points`, 'give currentA on every point or on none')
  }
  if (withInput !== 0 && withInput !== points.length) {
    throw new EngineeringInputError(`${field}.points`, 'give inputW on every point or on none')
  }
  return { model: 'curve', poles, ratedVolts, ratedHz, points }
}

export class PreparedCurveMotor implements PreparedMotorBase {
  readonly prepared = 'motor'
  readonly poles: number
  readonly source: CurveMotor
  private readonly torqueCurve: Pchip
  private readonly currentCurve: Pchip | undefined
  private readonly inputCurve: Pchip | undefined
  private readonly ratedSync: number
  private readonly lastRpm: number
  private readonly lastTorque: number
  /** Slope of the torque beyond the last point, N m per rated-frequency r/min. */
  private readonly tailSlope: number
  private readonly minimaRpm: number[]

  constructor(motor: CurveMotor) {
    this.source = motor
    this.poles = motor.poles
    this.ratedSync = syncRpm(motor.poles, motor.ratedHz)
    const rpm = motor.points.map((p) => p.rpm)
    this.torqueCurve = new Pchip(rpm, motor.points.map((p) => p.torqueNm))
    const first = motor.points[0]
    this.currentCurve = first?.currentA === undefined ? undefined : new Pchip(rpm, motor.points.map((p) => p.currentA ?? 0))
    this.inputCurve = first?.inputW === undefined ? undefined : new Pchip(rpm, motor.points.map((p) => p.inputW ?? 0))
    const last = motor.points[motor.points.length - 1]
    this.lastRpm = last?.rpm ?? 0
    this.lastTorque = last?.torqueNm ?? 0
    this.tailSlope =
      this.lastRpm < this.ratedSync
        ? -this.lastTorque / (this.ratedSync - this.lastRpm)
        : this.torqueCurve.derivative(this.lastRpm)
    // PCHIP has its local extrema on knots, so a torque dip's bottom is a knot.
    const t = motor.points.map((p) => p.torqueNm)
    this.minimaRpm = []
    for (let i = 1; i < t.length - 1; i++) {
      const here = t[i] ?? 0
      if (here <= (t[i - 1] ?? 0) && here < (t[i + 1] ?? 0)) this.minimaRpm.push(rpm[i] ?? 0)
    }
  }

  /** Torque on the rated curve at a rated-frequency speed. */
  private ratedTorque(n: number): number {
    if (n <= this.lastRpm) return this.torqueCurve.value(n)
    return this.lastTorque + this.tailSlope * (n - this.lastRpm)
  }

  private readonly bound = new BoundCache()

  bind(supply: Supply): BoundMotor {
    return this.bound.get(supply) ?? this.bound.put(supply, new BoundCurveMotor(this, supply))
  }

  /** Torque on the rated curve at a rated-frequency speed. */
  ratedTorqueAt(n: number): number {
    return this.ratedTorque(n)
  }

  get measuredUpToRpm(): number {
    return this.lastRpm
  }

  get ratedSyncRpm(): number {
    return this.ratedSync
  }

  get minima(): readonly number[] {
    return this.minimaRpm
  }

  get current(): Pchip | undefined {
    return this.currentCurve
  }

  get input(): Pchip | undefined {
    return this.inputCurve
  }
}

class BoundCurveMotor implements BoundMotor {
  scanTable?: ScanTable
  solvedOnce = false
  readonly syncRpm: number
  readonly dipRpms: readonly number[]
  readonly knotRpms: readonly number[]
  private readonly toRated: number
  private readonly kv: number
  private readonly kv2: number
  private readonly volts: number

  constructor(
    private readonly m: PreparedCurveMotor,
    supply: Supply,
  ) {
    this.syncRpm = syncRpm(m.poles, supply.hz)
    this.toRated = m.ratedSyncRpm / this.syncRpm
    this.kv = supply.volts / m.source.ratedVolts
    this.kv2 = this.kv * this.kv
    this.volts = supply.volts
    const minima = m.minima
    this.dipRpms = minima.length === 0 ? minima : minima.map((n) => n / this.toRated)
    this.knotRpms = m.source.points.map((point) => point.rpm / this.toRated)
  }

  torque(rpm: number): number {
    return this.kv2 * this.m.ratedTorqueAt(rpm * this.toRated)
  }

  evaluate(rpm: number): MotorEvaluation {
    const ns = this.syncRpm
    const n = rpm * this.toRated
    const lastRpm = this.m.measuredUpToRpm
    const nc = Math.min(n, lastRpm)
    const shaftTorqueNm = this.torque(rpm)
    const outputW = shaftTorqueNm * radPerSecond(rpm)
    const result: MotorEvaluation = { rpm, slip: (ns - rpm) / ns, shaftTorqueNm, outputW }
    const current = this.m.current
    const input = this.m.input
    if (current) result.currentA = Math.max(0, this.kv * current.value(nc))
    if (input) {
      const inputW = Math.max(0, this.kv2 * input.value(nc))
      result.inputW = inputW
      result.efficiency = inputW > 0 && outputW > 0 ? outputW / inputW : 0
      if (result.currentA !== undefined && result.currentA > 0) result.powerFactor = inputW / (this.volts * result.currentA)
    }
    if (n > lastRpm) result.extrapolated = true
    return result
  }
}
