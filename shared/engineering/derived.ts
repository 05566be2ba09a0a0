/**
 * Figures derived from an operating point:
 * - air power P_air = Q p_s (static air power; ASHRAE Handbook, Fans) and system efficiency
 *   P_air / P_electrical in;
 * - breakdown (pull-out) torque: the largest shaft torque from standstill to synchronous speed, and
 *   the speed and torque margins of the duty point to it;
 * - winding temperature by the resistance method (IEC 60034-1, IEEE 112):
 *   T_hot = (R_hot / R_cold)(k + T_cold) - k, rise = T_hot - T_ambient, k = 234.5 for copper;
 * - energy and total cost of ownership: kWh a year = input W x hours / 1000, times a tariff, over
 *   the product life. Costs are plain numbers in the tariff's currency, unrounded.
 */
import { EngineeringInputError, requireFinite, requireNonNegative, requirePositive } from './errors'
import { prepareMotor, type BoundMotor, type PreparedMotor } from './motor'
import { validateSupply } from './speed'
import { COPPER_CONSTANT } from './tolerance'
import type { MotorModel, OperatingPoint, Supply } from './types'

export function airPowerW(flowM3s: number, staticPa: number): number {
  return requireNonNegative(flowM3s, 'flowM3s') * requireFinite(staticPa, 'staticPa')
}

/** Static air power over electrical input, 0 where either is unknown or zero. */
export function systemEfficiency(point: OperatingPoint): number {
  if (point.flowM3s === undefined || point.staticPa === undefined || !point.inputW || point.inputW <= 0) return 0
  return (point.flowM3s * point.staticPa) / point.inputW
}

export interface Breakdown {
  rpm: number
  torqueNm: number
}

/**
 * Breakdown torque on this supply: the largest shaft torque between standstill and synchronous
 * speed (0 r/min if the locked-rotor torque is the largest). Measured curves: on a knot, exactly;
 * circuit models: a scan plus golden-section refinement.
 */
export function breakdownTorque(motor: MotorModel | PreparedMotor, supply: Supply): Breakdown {
  const bound = prepareMotor(motor).bind(validateSupply(supply))
  const ns = bound.syncRpm
  if (bound.knotRpms) return peakOnKnots(bound, bound.knotRpms)
  const steps = 300
  let best = 0
  let bestT = bound.torque(0)
  for (let i = 1; i <= steps; i++) {
    const n = (ns * i) / steps
    const t = bound.torque(n)
    if (t > bestT) {
      bestT = t
      best = n
    }
  }
  let a = Math.max(0, best - ns / steps)
  let b = Math.min(ns, best + ns / steps)
  const g = (Math.sqrt(5) - 1) / 2
  for (let i = 0; i < 60; i++) {
    const c = b - g * (b - a)
    const d = a + g * (b - a)
    if (bound.torque(c) > bound.torque(d)) b = d
    else a = c
  }
  const mid = 0.5 * (a + b)
  const tm = bound.torque(mid)
  return tm > bestT ? { rpm: mid, torqueNm: tm } : { rpm: best, torqueNm: bestT }
}

/**
 * A measured curve's peak, exactly: PCHIP has its extrema on knots (and the line beyond the last
 * point falls to synchronous speed), so the largest torque is at a knot or an end of the range.
 */
function peakOnKnots(bound: BoundMotor, knots: readonly number[]): Breakdown {
  const ns = bound.syncRpm
  let best = 0
  let bestT = bound.torque(0)
  for (const n of [...knots, ns]) {
    if (!(n > 0 && n <= ns)) continue
    const t = bound.torque(n)
    if (t > bestT) {
      bestT = t
      best = n
    }
  }
  return { rpm: best, torqueNm: bestT }
}

export interface BreakdownMargin extends Breakdown {
  /** Duty speed minus breakdown speed, r/min (positive: on the stable side of the peak). */
  speedMarginRpm: number
  /** Breakdown torque over duty torque (how far the load could rise before the motor stalls). */
  torqueRatio: number
}

export function breakdownMargin(motor: MotorModel | PreparedMotor, supply: Supply, point: OperatingPoint): BreakdownMargin {
  const bd = breakdownTorque(motor, supply)
  return {
    ...bd,
    speedMarginRpm: point.rpm - bd.rpm,
    torqueRatio: point.shaftTorqueNm > 0 ? bd.torqueNm / point.shaftTorqueNm : 0,
  }
}

export interface ResistanceRise {
  /** Average winding temperature, degC. */
  windingC: number
  /** Rise over the coolant (ambient) temperature, K. */
  riseK: number
}

/** Winding temperature and rise by the resistance method (IEC 60034-1 / IEEE 112). */
export function temperatureRiseByResistance(input: {
  coldOhm: number
  hotOhm: number
  coldC: number
  ambientC: number
  constant?: number
}): ResistanceRise {
  const r1 = requirePositive(input.coldOhm, 'coldOhm')
  const r2 = requirePositive(input.hotOhm, 'hotOhm')
  const t1 = requireFinite(input.coldC, 'coldC')
  const ta = requireFinite(input.ambientC, 'ambientC')
  const k = input.constant === undefined ? COPPER_CONSTANT : requirePositive(input.constant, 'constant')
  const windingC = (r2 / r1) * (k + t1) - k
  return { windingC, riseK: windingC - ta }
}

export interface EnergyInput {
  inputW: number
  hoursPerYear: number
  /** Price of 1 kWh in the currency of the result. */
  tariffPerKWh: number
  years: number
  /** Purchase price of the motor, same currency; default 0. */
  purchasePrice?: number
}

export interface EnergyCost {
  kWhPerYear: number
  costPerYear: number
  lifeKWh: number
  lifeEnergyCost: number
  totalCostOfOwnership: number
}

export function energyCost(e: EnergyInput): EnergyCost {
  const w = requireNonNegative(e.inputW, 'inputW')
  const h = requireNonNegative(e.hoursPerYear, 'hoursPerYear')
  if (h > 8784) throw new EngineeringInputError('hoursPerYear', 'a year has at most 8784 hours')
  const tariff = requireNonNegative(e.tariffPerKWh, 'tariffPerKWh')
  const years = requireNonNegative(e.years, 'years')
  const price = e.purchasePrice === undefined ? 0 : requireNonNegative(e.purchasePrice, 'purchasePrice')
  const kWhPerYear = (w * h) / 1000
  const costPerYear = kWhPerYear * tariff
  return {
    kWhPerYear,
    costPerYear,
    lifeKWh: kWhPerYear * years,
    lifeEnergyCost: costPerYear * years,
    totalCostOfOwnership: price + costPerYear * years,
  }
}

export interface DutyFigures {
  airPowerW?: number
  systemEfficiency?: number
  motorEfficiency?: number
  powerFactor?: number
  breakdown: BreakdownMargin
  energy?: EnergyCost
}

/** The derived figures for a duty point in one call. */
export function dutyFigures(
  motor: MotorModel | PreparedMotor,
  supply: Supply,
  point: OperatingPoint,
  energy?: Omit<EnergyInput, 'inputW'>,
): DutyFigures {
  const out: DutyFigures = { breakdown: breakdownMargin(motor, supply, point) }
  if (point.flowM3s !== undefined && point.staticPa !== undefined) {
    out.airPowerW = point.flowM3s * point.staticPa
    out.systemEfficiency = systemEfficiency(point)
  }
  if (point.efficiency !== undefined) out.motorEfficiency = point.efficiency
  if (point.powerFactor !== undefined) out.powerFactor = point.powerFactor
  if (energy && point.inputW !== undefined) out.energy = energyCost({ ...energy, inputW: point.inputW })
  return out
}
