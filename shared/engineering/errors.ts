/**
 * Input errors of the engineering core. Every refusal names the offending field with a path in
 * the caller's input ("motor.points[3].rpm", "load.system.k") so forms and imports can point at it.
 */
export class EngineeringInputError extends Error {
  /** Path of the bad field inside the input, e.g. "motor.points[3].rpm". */
  readonly field: string

  constructor(field: string, message: string) {
    super(`${field}: ${message}`)
    this.name = 'EngineeringInputError'
    this.field = field
  }
}

/** Refuse anything that is not a finite number. */
export function requireFinite(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new EngineeringInputError(field, 'must be a finite number')
  }
  return value
}

export function requirePositive(value: unknown, field: string): number {
  const v = requireFinite(value, field)
  if (v <= 0) throw new EngineeringInputError(field, 'must be greater than zero')
  return v
}

export function requireNonNegative(value: unknown, field: string): number {
  const v = requireFinite(value, field)
  if (v < 0) throw new EngineeringInputError(field, 'must not be negative')
  return v
}

export function optionalNonNegative(value: unknown, field: string, fallback: number): number {
  return value === undefined ? fallback : requireNonNegative(value, field)
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value)
}

export function requireObject(value: unknown, field: string): Record<string, unknown> {
  if (!isRecord(value)) throw new EngineeringInputError(field, 'must be an object')
  return value
}

export function requireArray(value: unknown, field: string, minLength: number): unknown[] {
  if (!Array.isArray(value)) throw new EngineeringInputError(field, 'must be an array')
  if (value.length < minLength) {
    throw new EngineeringInputError(field, `needs at least ${minLength} points, got ${value.length}`)
  }
  return value
}

/** Poles of an AC machine: a positive even integer. */
export function requirePoles(value: unknown, field: string): number {
  const v = requireFinite(value, field)
  if (!Number.isInteger(v) || v < 2 || v % 2 !== 0) {
    throw new EngineeringInputError(field, 'must be an even whole number of poles (2, 4, 6 ...)')
  }
  return v
}
