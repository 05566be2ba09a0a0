/**
 * Loads of either kind: torque tables (PCHIP over speed) and fans on systems (fan.ts).
 */
import { EngineeringInputError, requireArray, requireFinite, requireObject } from './errors'
import { PreparedFanLoad, validateFanLoad } from './fan'
import { Pchip } from './pchip'
import { requireSpeed } from './speed'
import type { Load, LoadEvaluation, TorqueLoad, TorquePoint } from './types'

export function validateTorqueLoad(input: unknown, field = 'load'): TorqueLoad {
  const l = requireObject(input, field)
  const raw = requireArray(l.points, `${field}.points`, 2)
  const points: TorquePoint[] = []
  raw.forEach((p, i) => {
    const f = `${field}.points[${i}]`
    const o = requireObject(p, f)
    const rpm = requireFinite(o.rpm, `${f}.rpm`)
    if (rpm < 0) throw new EngineeringInputError(`${f}.rpm`, 'speed must not be negative')
    if (i === 0 && rpm !== 0) throw new EngineeringInputError(`${f}.rpm`, 'the first point must be at standstill (rpm 0)')
    const prev = points[i - 1]
    if (prev && rpm <= prev.rpm) throw new EngineeringInputError(`${f}.rpm`, 'speeds must be strictly increasing')
    const torqueNm = requireFinite(o.torqueNm, `${f}.torqueNm`)
    if (torqueNm < 0) throw new EngineeringInputError(`${f}.torqueNm`, 'load torque must not be negative')
    points.push({ rpm, torqueNm })
  })
  return { kind: 'torque', points }
}

/** A torque table; beyond its last speed the torque is held at the last value. */
export class PreparedTorqueLoad {
  readonly prepared = 'load'
  readonly source: TorqueLoad
  readonly maxRpm = Infinity
  readonly jumpRpms: readonly number[] = []
  private readonly curve: Pchip
  private readonly lastRpm: number
  private readonly lastTorque: number

  constructor(load: TorqueLoad) {
    this.source = load
    this.curve = new Pchip(load.points.map((p) => p.rpm), load.points.map((p) => p.torqueNm))
    const last = load.points[load.points.length - 1]
    this.lastRpm = last?.rpm ?? 0
    this.lastTorque = last?.torqueNm ?? 0
  }

  torque(rpm: number): number {
    return rpm >= this.lastRpm ? this.lastTorque : Math.max(0, this.curve.value(rpm))
  }

  evaluate(rpm: number): LoadEvaluation {
    const torqueNm = this.torque(rpm)
    const result: LoadEvaluation = { rpm, torqueNm, shaftW: (torqueNm * rpm * 2 * Math.PI) / 60 }
    if (rpm > this.lastRpm) result.extrapolated = true
    return result
  }
}

export type PreparedLoad = PreparedTorqueLoad | PreparedFanLoad

export function validateLoad(input: unknown, field = 'load'): Load {
  const l = requireObject(input, field)
  if (l.kind === 'torque') return validateTorqueLoad(input, field)
  if (l.kind === 'fan') return validateFanLoad(input, field)
  throw new EngineeringInputError(`${field}.kind`, "must be 'torque' or 'fan'")
}

export function isPreparedLoad(value: unknown): value is PreparedLoad {
  return value instanceof PreparedTorqueLoad || value instanceof PreparedFanLoad
}

/** Validate once and pre-build interpolants and the fan/system intersection. */
export function prepareLoad(load: Load | PreparedLoad, field = 'load'): PreparedLoad {
  if (isPreparedLoad(load)) return load
  const valid = validateLoad(load, field)
  return valid.kind === 'torque' ? new PreparedTorqueLoad(valid) : new PreparedFanLoad(valid, field)
}

/** What the load takes at `rpm`: torque, shaft power and, for a fan, flow, pressure and flags. */
export function evaluateLoad(load: Load | PreparedLoad, rpm: number): LoadEvaluation {
  return prepareLoad(load).evaluate(requireSpeed(rpm, 'rpm'))
}
