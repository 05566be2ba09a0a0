/**
 * PSC run-capacitor studies on the symmetrical-component model of machine.ts (Fitzgerald,
 * unsymmetrical two-phase motors):
 * - a sweep of starting torque and operating point against capacitor value;
 * - the capacitor that balances the windings at a duty speed: the value that minimises the
 *   backward-to-forward current ratio |I_b| / |I_f| (zero when the aux winding's turns ratio and
 *   resistance also suit, the classic balanced condition a = X/R, Xc = X |Z|^2 / R^2 for an aux
 *   winding of the main winding's copper). Found by a log-spaced scan and golden-section search.
 * - `balancedAtDuty`: the duty point moves with the capacitor, so the balancing value is re-found
 *   at each new duty speed until speed and value settle.
 */
import { EngineeringInputError, requireArray, requirePositive } from './errors'
import { prepareLoad, type PreparedLoad } from './load'
import { validateMotor } from './motor'
import { PreparedCircuitMotor } from './machine'
import { solveOperatingPoint } from './solver'
import { requireSpeed, validateSupply } from './speed'
import type { CircuitMotor, Load, MotorModel, OperatingPoint, SolveOptions, Supply } from './types'

export interface CapacitorRow {
  capacitorUf: number
  startingTorqueNm: number
  /** Line current at standstill. */
  lockedCurrentA: number
  point: OperatingPoint
  /** Backward/forward current ratio at the operating point. */
  unbalance: number
}

export interface BalancingResult {
  capacitorUf: number
  rpm: number
  /** |I_b| / |I_f| with that capacitor at that speed: 0 is perfectly balanced. */
  unbalance: number
}

function requirePsc(motor: MotorModel, field = 'motor'): CircuitMotor & { aux: NonNullable<CircuitMotor['aux']> } {
  const m = validateMotor(motor, field)
  if (m.model !== 'circuit' || !m.aux) {
    throw new EngineeringInputError(field, 'capacitor studies need a circuit motor with an auxiliary winding (PSC)')
  }
  return { ...m, aux: m.aux }
}

const withCapacitor = (m: CircuitMotor & { aux: NonNullable<CircuitMotor['aux']> }, capacitorUf: number): CircuitMotor => ({
  ...m,
  aux: { ...m.aux, capacitorUf },
})

/** Starting torque and operating point for each capacitor value (uF). */
export function capacitorSweep(
  motor: MotorModel,
  load: Load | PreparedLoad,
  supply: Supply,
  capacitorsUf: number[],
  options?: SolveOptions,
): CapacitorRow[] {
  const m = requirePsc(motor)
  const pl = prepareLoad(load, 'load')
  const s = validateSupply(supply)
  const values = requireArray(capacitorsUf, 'capacitorsUf', 1).map((c, i) => requirePositive(c, `capacitorsUf[${i}]`))
  return values.map((capacitorUf) => {
    const pm = new PreparedCircuitMotor(withCapacitor(m, capacitorUf))
    const bound = pm.bind(s)
    const start = bound.evaluate(0)
    const point = solveOperatingPoint(pm, pl, s, options)
    return {
      capacitorUf,
      startingTorqueNm: start.shaftTorqueNm,
      lockedCurrentA: start.currentA ?? 0,
      point,
      unbalance: bound.evaluate(point.rpm).unbalance ?? 0,
    }
  })
}

/** The run capacitor (uF, within [minUf, maxUf]) that best balances the windings at `rpm`. */
export function balancingCapacitor(motor: MotorModel, supply: Supply, rpm: number, minUf = 0.05, maxUf = 500): BalancingResult {
  const m = requirePsc(motor)
  const s = validateSupply(supply)
  const n = requireSpeed(rpm, 'rpm')
  const unbalanceAt = (logC: number): number => new PreparedCircuitMotor(withCapacitor(m, Math.exp(logC))).bind(s).evaluate(n).unbalance ?? 0
  const lo = Math.log(requirePositive(minUf, 'minUf'))
  const hi = Math.log(requirePositive(maxUf, 'maxUf'))
  const steps = 120
  let best = lo
  let bestU = Infinity
  for (let i = 0; i <= steps; i++) {
    const x = lo + ((hi - lo) * i) / steps
    const u = unbalanceAt(x)
    if (u < bestU) {
      bestU = u
      best = x
    }
  }
  // Golden-section search on the bracket around the best grid point.
  const step = (hi - lo) / steps
  let a = Math.max(lo, best - step)
  let b = Math.min(hi, best + step)
  const g = (Math.sqrt(5) - 1) / 2
  let c = b - g * (b - a)
  let d = a + g * (b - a)
  let fc = unbalanceAt(c)
  let fd = unbalanceAt(d)
  for (let i = 0; i < 80 && b - a > 1e-12; i++) {
    if (fc < fd) {
      b = d
      d = c
      fd = fc
      c = b - g * (b - a)
      fc = unbalanceAt(c)
    } else {
      a = c
      c = d
      fc = fd
      d = a + g * (b - a)
      fd = unbalanceAt(d)
    }
  }
  const x = 0.5 * (a + b)
  return { capacitorUf: Math.exp(x), rpm: n, unbalance: unbalanceAt(x) }
}

/** Balancing capacitor at the duty point it produces (fixed-point iteration on the duty speed). */
export function balancedAtDuty(motor: MotorModel, load: Load | PreparedLoad, supply: Supply, options?: SolveOptions): BalancingResult & { point: OperatingPoint } {
  const m = requirePsc(motor)
  const pl = prepareLoad(load, 'load')
  const s = validateSupply(supply)
  let point = solveOperatingPoint(new PreparedCircuitMotor(m), pl, s, options)
  let result = balancingCapacitor(m, s, point.rpm)
  for (let i = 0; i < 20; i++) {
    point = solveOperatingPoint(new PreparedCircuitMotor(withCapacitor(m, result.capacitorUf)), pl, s, options)
    const next = balancingCapacitor(m, s, point.rpm)
    const settled = Math.abs(next.capacitorUf - result.capacitorUf) <= 1e-6 * result.capacitorUf
    result = next
    if (settled) break
  }
  return { ...result, point }
}
