/**
 * Air density of the study's ambient air and the fan built from a study's inputs.
 *
 * Density: ideal gas rho = p / (R T) with R = 287.055 J/(kg K) for dry air, and the pressure at
 * altitude from the standard-atmosphere relation p = 101.325 kPa x (1 - 2.25577e-5 Z)^5.2559
 * (ASHRAE Handbook Fundamentals, chapter 1, equation 3; coefficients from memory). Humidity is
 * neglected, which overstates density by under 1 % at room conditions (common practice for fans).
 */
import type { FanCurve, FanLoad } from '../engineering'
import type { StudyInput } from '../contracts/study.contract'

export const DRY_AIR_R = 287.055
export const SEA_LEVEL_PA = 101_325

export function atmosphericPressurePa(altitudeM: number): number {
  return SEA_LEVEL_PA * Math.pow(1 - 2.25577e-5 * altitudeM, 5.2559)
}

export function airDensity(temperatureC: number, altitudeM = 0): number {
  return atmosphericPressurePa(altitudeM) / (DRY_AIR_R * (temperatureC + 273.15))
}

export function studyDensity(input: StudyInput): number {
  return input.ambient.densityKgM3 ?? airDensity(input.ambient.temperatureC, input.ambient.altitudeM)
}

/**
 * Generic forward-curved blower shape through the duty point, for studies that know only the
 * duty and the fan's speed there: pressure ratio against flow ratio (no stall dip, monotone), and
 * shaft power rising with flow, equal to Q p / efficiency at the duty. An approximation for early
 * sizing only; a measured fan curve should replace it.
 */
const GENERIC_SHAPE: readonly (readonly [number, number])[] = [
  [0, 1.42],
  [0.25, 1.36],
  [0.5, 1.27],
  [0.75, 1.15],
  [1, 1],
  [1.25, 0.79],
  [1.5, 0.52],
  [1.75, 0.2],
  [1.9, 0],
]

export class StudyInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`)
  }
}

export function studyFanCurve(input: StudyInput, density: number): FanCurve {
  const fan = input.fan
  if (fan.source === 'curve') return { refRpm: fan.refRpm, refDensity: fan.refDensity, points: fan.points }
  const { flowM3s, staticPa } = input.duty
  const dutyShaftW = (flowM3s * staticPa) / fan.efficiency
  return {
    refRpm: fan.rpmAtDuty,
    // The duty was stated at the operating air, so the generic curve is built at that density.
    refDensity: density,
    points: GENERIC_SHAPE.map(([q, p]) => ({
      flowM3s: q * flowM3s,
      staticPa: p * staticPa,
      shaftW: dutyShaftW * (0.35 + 0.65 * q),
    })),
  }
}

/** The system curve through the duty point, p = offset + k Q^2. */
export function systemK(input: StudyInput): number {
  const { flowM3s, staticPa } = input.duty
  const offset = input.system.offsetPa
  if (offset >= staticPa) throw new StudyInputError('system.offsetPa', 'the offset must be below the duty static pressure')
  return (staticPa - offset) / (flowM3s * flowM3s)
}

export function studyLoad(input: StudyInput): FanLoad {
  const density = studyDensity(input)
  return {
    kind: 'fan',
    fan: studyFanCurve(input, density),
    system: { k: systemK(input), offsetPa: input.system.offsetPa },
    density,
  }
}
