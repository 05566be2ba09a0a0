/**
 * Tolerance analysis: the operating point at nominal, low and high line, optionally at low and
 * high frequency, and with a hot winding.
 *
 * Supply limits: +/-10 % voltage by default, as NEMA MG 1 (12.44) and IEC 60034-1 zone B state
 * for running; IEC 60034-1 zone A is +/-5 % voltage with +/-2 % frequency, zone B +/-10 % with
 * +3/-5 % frequency (from memory of the standard's figure; pass your own tolerances to match a
 * customer's specification).
 *
 * Hot winding (circuit models only): copper resistance rises linearly with temperature,
 * R_hot = R_ref (k + T_hot) / (k + T_ref) with k = 234.5 for copper (IEEE 112; IEC 60034-1 uses
 * 235). A die-cast aluminium cage uses k = 225 (IEC 60034-2-1, from memory): pass `rotorConstant`.
 */
import { EngineeringInputError, requireFinite, requireNonNegative, requireObject } from './errors'
import { prepareLoad, type PreparedLoad } from './load'
import { prepareMotor, validateMotor, type PreparedMotor } from './motor'
import { solveOperatingPoint } from './solver'
import { validateSupply } from './speed'
import type { CircuitMotor, Load, MotorModel, OperatingPoint, SolveOptions, Supply } from './types'

/** The copper constant of the resistance-temperature law, degC (IEEE 112). */
export const COPPER_CONSTANT = 234.5

/** Resistance at `hotC` from `rRef` measured at `refC`: R (k + T_hot) / (k + T_ref). */
export function hotResistance(rRef: number, refC: number, hotC: number, k = COPPER_CONSTANT): number {
  return (rRef * (k + hotC)) / (k + refC)
}

export interface HotWinding {
  /** Temperature at which the circuit's resistances hold, degC (often 20 or 25). */
  referenceC: number
  /** Winding temperature to study, degC. */
  hotC: number
  /** Temperature constant for the stator windings, default 234.5 (copper). */
  constant?: number
  /** Temperature constant for the rotor cage, default the stator's; 225 for aluminium. */
  rotorConstant?: number
}

/** The circuit motor with r1, aux.r (stator constant) and r2 (rotor constant) at a hot winding. */
export function hotMotor(motor: CircuitMotor, hot: HotWinding): CircuitMotor {
  const k = hot.constant ?? COPPER_CONSTANT
  const kr = hot.rotorConstant ?? k
  const out: CircuitMotor = {
    ...motor,
    r1: hotResistance(motor.r1, hot.referenceC, hot.hotC, k),
    r2: hotResistance(motor.r2, hot.referenceC, hot.hotC, kr),
  }
  if (motor.aux) out.aux = { ...motor.aux, r: hotResistance(motor.aux.r, hot.referenceC, hot.hotC, k) }
  return out
}

export interface ToleranceOptions {
  /** Fractional voltage tolerance, default 0.10. */
  voltageTolerance?: number
  /** Fractional frequency tolerance; 0 or absent skips the frequency cases. */
  frequencyTolerance?: number
  /** Add a hot-winding case at nominal and at low line (circuit models only). */
  hotWinding?: HotWinding
  solve?: SolveOptions
}

export type ToleranceCaseName = 'nominal' | 'low-line' | 'high-line' | 'low-frequency' | 'high-frequency' | 'hot' | 'hot-low-line'

export interface ToleranceCase {
  name: ToleranceCaseName
  supply: Supply
  point: OperatingPoint
}

export interface ToleranceResult {
  cases: ToleranceCase[]
  nominal: OperatingPoint
  lowLine: OperatingPoint
  highLine: OperatingPoint
  /** Lowest speed over all cases and the case it came from (the usual worst case for air flow). */
  slowest: ToleranceCase
  /** True if any case fails to start or crawls. */
  anyNoStart: boolean
  anyCrawl: boolean
  /** Things not evaluated, e.g. a hot winding asked of a measured curve. */
  notes: string[]
}

export function toleranceAnalysis(
  motor: MotorModel | PreparedMotor,
  load: Load | PreparedLoad,
  supply: Supply,
  options: ToleranceOptions = {},
): ToleranceResult {
  const pm = prepareMotor(motor, 'motor')
  const pl = prepareLoad(load, 'load')
  const s = validateSupply(supply)
  const o = requireObject(options, 'options')
  const vt = o.voltageTolerance === undefined ? 0.1 : requireNonNegative(o.voltageTolerance, 'options.voltageTolerance')
  const ft = o.frequencyTolerance === undefined ? 0 : requireNonNegative(o.frequencyTolerance, 'options.frequencyTolerance')
  if (vt >= 1) throw new EngineeringInputError('options.voltageTolerance', 'must be below 1 (a fraction, 0.1 for 10 %)')
  if (ft >= 1) throw new EngineeringInputError('options.frequencyTolerance', 'must be below 1 (a fraction)')
  const cases: ToleranceCase[] = []
  const notes: string[] = []
  const run = (name: ToleranceCaseName, m: PreparedMotor, sup: Supply): OperatingPoint => {
    const point = solveOperatingPoint(m, pl, sup, options.solve)
    cases.push({ name, supply: sup, point })
    return point
  }
  const low = { volts: s.volts * (1 - vt), hz: s.hz }
  const nominal = run('nominal', pm, s)
  const lowLine = run('low-line', pm, low)
  const highLine = run('high-line', pm, { volts: s.volts * (1 + vt), hz: s.hz })
  if (ft > 0) {
    run('low-frequency', pm, { volts: s.volts, hz: s.hz * (1 - ft) })
    run('high-frequency', pm, { volts: s.volts, hz: s.hz * (1 + ft) })
  }
  if (options.hotWinding) {
    const h = requireObject(options.hotWinding, 'options.hotWinding')
    const hot: HotWinding = {
      referenceC: requireFinite(h.referenceC, 'options.hotWinding.referenceC'),
      hotC: requireFinite(h.hotC, 'options.hotWinding.hotC'),
    }
    if (h.constant !== undefined) hot.constant = requireFinite(h.constant, 'options.hotWinding.constant')
    if (h.rotorConstant !== undefined) hot.rotorConstant = requireFinite(h.rotorConstant, 'options.hotWinding.rotorConstant')
    const source = validateMotor(pm.source, 'motor')
    if (source.model === 'circuit') {
      const hm = prepareMotor(hotMotor(source, hot))
      run('hot', hm, s)
      run('hot-low-line', hm, low)
    } else {
      notes.push('hot winding not evaluated: a measured curve already holds the winding temperature of its test')
    }
  }
  let slowest = cases[0] ?? { name: 'nominal', supply: s, point: nominal }
  for (const c of cases) if (c.point.rpm < slowest.point.rpm) slowest = c
  return {
    cases,
    nominal,
    lowLine,
    highLine,
    slowest,
    anyNoStart: cases.some((c) => c.point.status === 'no-start'),
    anyCrawl: cases.some((c) => c.point.crawl),
    notes,
  }
}
