/**
 * Entry points for motors of either kind: validation with field paths, a prepared form that
 * builds interpolants once, and single-speed evaluation.
 */
import { EngineeringInputError, requireObject } from './errors'
import { PreparedCurveMotor, validateCurveMotor, type BoundMotor } from './curve-motor'
import { PreparedCircuitMotor, validateCircuitMotor } from './machine'
import { requireSpeed, validateSupply } from './speed'
import type { MotorEvaluation, MotorModel, Supply } from './types'

export type PreparedMotor = PreparedCurveMotor | PreparedCircuitMotor
export type { BoundMotor }

/** Validate a motor; throws EngineeringInputError naming the field ("motor.points[3].rpm"). */
export function validateMotor(input: unknown, field = 'motor'): MotorModel {
  const m = requireObject(input, field)
  if (m.model === 'curve') return validateCurveMotor(input, field)
  if (m.model === 'circuit') return validateCircuitMotor(input, field)
  throw new EngineeringInputError(`${field}.model`, "must be 'curve' or 'circuit'")
}

export function isPreparedMotor(value: unknown): value is PreparedMotor {
  return value instanceof PreparedCurveMotor || value instanceof PreparedCircuitMotor
}

/** Validate once and pre-build what every evaluation needs (interpolants, constants). */
export function prepareMotor(motor: MotorModel | PreparedMotor, field = 'motor'): PreparedMotor {
  if (isPreparedMotor(motor)) return motor
  const valid = validateMotor(motor, field)
  return valid.model === 'curve' ? new PreparedCurveMotor(valid) : new PreparedCircuitMotor(valid)
}

/** The motor on `supply` at speed `rpm` (r/min, not negative). */
export function evaluateMotor(motor: MotorModel | PreparedMotor, supply: Supply, rpm: number): MotorEvaluation {
  const prepared = prepareMotor(motor)
  const s = validateSupply(supply)
  const n = requireSpeed(rpm, 'rpm')
  return prepared.bind(s).evaluate(n)
}
