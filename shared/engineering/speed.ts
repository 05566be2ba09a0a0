/**
 * Synchronous speed and slip of an induction machine: n_s = 120 f / p (r/min), s = (n_s - n) / n_s.
 */
import { EngineeringInputError, requirePoles, requirePositive, requireFinite, requireObject } from './errors'
import type { Supply } from './types'

/** Synchronous speed in r/min for `poles` poles on `hz` hertz. */
export function syncRpm(poles: number, hz: number): number {
  return (120 * requirePositive(hz, 'hz')) / requirePoles(poles, 'poles')
}

export function slipOf(rpm: number, synchronousRpm: number): number {
  return (synchronousRpm - rpm) / synchronousRpm
}

/** Mechanical angular speed in rad/s of a speed in r/min. */
export function radPerSecond(rpm: number): number {
  return (rpm * 2 * Math.PI) / 60
}

export function validateSupply(supply: unknown, field = 'supply'): Supply {
  const s = requireObject(supply, field)
  const { volts, hz } = s
  // The solver validates its supply on every call: the usual case builds no field names.
  if (typeof volts === 'number' && typeof hz === 'number' && volts > 0 && hz > 0 && volts < Infinity && hz < Infinity) return { volts, hz }
  return { volts: requirePositive(s.volts, `${field}.volts`), hz: requirePositive(s.hz, `${field}.hz`) }
}

export function requireSpeed(rpm: unknown, field = 'rpm'): number {
  const v = requireFinite(rpm, field)
  if (v < 0) throw new EngineeringInputError(field, 'speed must not be negative')
  return v
}
