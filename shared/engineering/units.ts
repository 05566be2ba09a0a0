/**
 * Unit conversion at the edges of the engineering core (inside everything is SI).
 *
 * Factors from NIST Special Publication 811 (2008 edition), Appendix B.8/B.9, derived here from
 * the exact definitions so no rounding creeps in:
 * - foot = 0.3048 m, inch = 0.0254 m (exact), standard gravity g_n = 9.80665 m/s^2 (exact),
 *   pound-force = 0.45359237 kg x g_n = 4.4482216152605 N (exact).
 * - inch of water: the CONVENTIONAL inch of water, 0.0254 m x 1000 kg/m^3 x g_n = 249.0889 Pa
 *   (SP 811 lists 2.490 889 E+02). SP 811 also gives 249.082 Pa at 39.2 F and 248.84 Pa at 60 F;
 *   fan trade data normally means the conventional one. mmH2O conventional = 9.80665 Pa.
 * - horsepower is the mechanical horsepower, 550 ft lbf/s = 745.699 87 W.
 */

const FOOT = 0.3048
const INCH = 0.0254
const G_N = 9.80665
const LBF = 0.45359237 * G_N

export const FLOW_FACTORS = {
  'm3/s': 1,
  CFM: (FOOT * FOOT * FOOT) / 60,
  'm3/h': 1 / 3600,
  'L/s': 1e-3,
} as const

export const PRESSURE_FACTORS = {
  Pa: 1,
  inH2O: INCH * 1000 * G_N,
  mmH2O: 1e-3 * 1000 * G_N,
} as const

export const TORQUE_FACTORS = {
  'N m': 1,
  'oz-in': (LBF / 16) * INCH,
  'lb-in': LBF * INCH,
} as const

export const POWER_FACTORS = {
  W: 1,
  hp: 550 * FOOT * LBF,
} as const

export type FlowUnit = keyof typeof FLOW_FACTORS
export type PressureUnit = keyof typeof PRESSURE_FACTORS
export type TorqueUnit = keyof typeof TORQUE_FACTORS
export type PowerUnit = keyof typeof POWER_FACTORS
export type EngineeringUnit = FlowUnit | PressureUnit | TorqueUnit | PowerUnit

export type Quantity = 'flow' | 'pressure' | 'torque' | 'power'

const TABLES: Record<Quantity, Readonly<Record<string, number>>> = {
  flow: FLOW_FACTORS,
  pressure: PRESSURE_FACTORS,
  torque: TORQUE_FACTORS,
  power: POWER_FACTORS,
}

/** Which quantity a unit measures, or undefined for an unknown unit name. */
export function quantityOf(unit: string): Quantity | undefined {
  if (Object.hasOwn(FLOW_FACTORS, unit)) return 'flow'
  if (Object.hasOwn(PRESSURE_FACTORS, unit)) return 'pressure'
  if (Object.hasOwn(TORQUE_FACTORS, unit)) return 'torque'
  if (Object.hasOwn(POWER_FACTORS, unit)) return 'power'
  return undefined
}

function factor(unit: string): number {
  const q = quantityOf(unit)
  const f = q === undefined ? undefined : TABLES[q][unit]
  if (f === undefined) throw new RangeError(`unknown unit "${unit}"`)
  return f
}

/** Value in `unit` to SI (m3/s, Pa, N m, W). */
export function toSI(value: number, unit: EngineeringUnit): number {
  return value * factor(unit)
}

/** SI value (m3/s, Pa, N m, W) to `unit`. */
export function fromSI(value: number, unit: EngineeringUnit): number {
  return value / factor(unit)
}

/** Convert between two units of the same quantity; throws RangeError across quantities. */
export function convert(value: number, from: EngineeringUnit, to: EngineeringUnit): number {
  if (quantityOf(from) !== quantityOf(to)) {
    throw new RangeError(`cannot convert ${from} to ${to}: different quantities`)
  }
  return (value * factor(from)) / factor(to)
}
