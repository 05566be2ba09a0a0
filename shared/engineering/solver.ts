/**
 * Operating point of a motor driving a load: the first stable intersection of motor shaft torque
 * and load torque met while accelerating from standstill.
 *
 * Method. f(n) = T_motor(n) - T_load(n). If f(start) <= 0 the motor cannot start the load. Else a
 * scan climbs a fixed grid in slip (denser near synchronous speed, where running points lie) plus,
 * for measured curves, every knot at a local torque minimum (PCHIP puts its extrema on knots, so a
 * dip's bottom is always visited), and stops at the first sign change. f changes from + to - there,
 * i.e. dT_motor/dn < dT_load/dn: the intersection is stable by construction and an unstable one is
 * never reported. The bracket is closed by Brent's method (R. P. Brent, Algorithms for
 * Minimization without Derivatives, 1973: inverse quadratic interpolation and secant steps
 * safeguarded by bisection). The grid points above the root are then checked: if the motor could
 * out-pull the load again at a higher speed, it is trapped in a torque dip and the point is
 * flagged as a crawl.
 */
import { EngineeringInputError, requireFinite, requireObject, requirePositive } from './errors'
import { isPreparedLoad, prepareLoad, type PreparedLoad } from './load'
import { isPreparedMotor, prepareMotor, type BoundMotor, type PreparedMotor } from './motor'
import type { ScanTable } from './curve-motor'
import { validateSupply } from './speed'
import type { Load, MotorModel, OperatingPoint, SolveOptions, Supply } from './types'

/** Slips of the scan grid (after the start speed). */
const SLIP_GRID = [0.8, 0.6, 0.45, 0.33, 0.24, 0.17, 0.11, 0.07, 0.04, 0.015, 0]

export function validateSolveOptions(input: unknown, field = 'options'): SolveOptions {
  if (input === undefined) return {}
  const o = requireObject(input, field)
  const out: SolveOptions = {}
  if (o.startRpm !== undefined) {
    const v = requireFinite(o.startRpm, `${field}.startRpm`)
    if (v < 0) throw new EngineeringInputError(`${field}.startRpm`, 'speed must not be negative')
    out.startRpm = v
  }
  if (o.tolRpm !== undefined) out.tolRpm = requirePositive(o.tolRpm, `${field}.tolRpm`)
  return out
}

/** Net accelerating torque T_motor - T_load, counting motor evaluations. */
class NetTorque {
  evaluations = 0
  constructor(
    readonly motor: BoundMotor,
    readonly load: PreparedLoad,
  ) {}

  at(n: number): number {
    this.evaluations++
    return this.motor.torque(n) - this.load.torque(n)
  }

  motorAt(n: number): number {
    this.evaluations++
    return this.motor.torque(n)
  }
}

/**
 * Solve the steady operating point. Accepts raw inputs (validated here, errors name the field) or
 * the results of prepareMotor / prepareLoad (validated once; the fast path for repeated solves).
 */
export function solveOperatingPoint(
  motor: MotorModel | PreparedMotor,
  load: Load | PreparedLoad,
  supply: Supply,
  options?: SolveOptions,
): OperatingPoint {
  const pm = isPreparedMotor(motor) ? motor : prepareMotor(motor, 'motor')
  const pl = isPreparedLoad(load) ? load : prepareLoad(load, 'load')
  const sup = validateSupply(supply)
  const opts = options === undefined ? undefined : validateSolveOptions(options)
  const bm = pm.bind(sup)
  const n0 = opts?.startRpm ?? 0
  if (n0 >= bm.syncRpm) throw new EngineeringInputError('options.startRpm', `must be below synchronous speed ${bm.syncRpm} r/min`)
  return solveBound(bm, pl, n0, opts?.tolRpm)
}

/**
 * solveOperatingPoint() for a motor already bound to its supply and a prepared load, from `n0`
 * (below synchronous speed): the hot path of a selection over thousands of motors, which binds
 * each motor to the study's supplies once and reads the bound motors straight from its plan.
 */
export function solveBound(bm: BoundMotor, pl: PreparedLoad, n0 = 0, tolRpm?: number): OperatingPoint {
  const ns = bm.syncRpm
  const tol = tolRpm ?? 1e-6 * ns
  const net = new NetTorque(bm, pl)

  // From standstill with a load that has no torque jumps and no end below synchronous speed the
  // scan speeds depend on the motor and supply alone: the motor's torques there are tabulated
  // on the bound motor when it is solved a second time and read back on every later solve (same
  // numbers, fewer evaluations; a study solves thousands of motors at the same two or three
  // supplies, run after run, while a sweep over supplies binds each supply once).
  const table = n0 === 0 && pl.jumpRpms.length === 0 && pl.maxRpm >= ns ? scanTableOf(bm, net) : undefined
  const grid = table ? table.speeds : scanGrid(ns, n0, bm.dipRpms, pl.maxRpm, pl.jumpRpms)
  const tm0 = table ? table.startTorque : bm.torque(n0)
  const tl0 = pl.torque(n0)
  if (!table) net.evaluations++
  if (!(tm0 > tl0)) return finish(net, 'no-start', n0, false, tm0, tl0)

  let lo = n0
  let flo = tm0 - tl0
  let hi = -1
  let fhi = 0
  let next = grid.length
  for (let i = 0; i < grid.length; i++) {
    const n = grid[i] ?? ns
    const fn = (table ? (table.torques[i] ?? 0) : net.motorAt(n)) - pl.torque(n)
    if (fn <= 0) {
      hi = n
      fhi = fn
      next = i + 1
      break
    }
    lo = n
    flo = fn
  }
  if (hi < 0) {
    if (pl.maxRpm < ns) {
      // evaluate() raises the field-named error for a fan run off the end of its curve.
      pl.evaluate(pl.maxRpm * (1 + 1e-9))
    }
    throw new Error('solveOperatingPoint: motor torque exceeds load torque up to synchronous speed')
  }
  const root = fhi === 0 ? hi : brent(net, lo, hi, flo, fhi, tol)
  const onJump = pl.jumpRpms.some((n) => lo >= n * (1 - 2e-9) && hi <= n * (1 + 2e-9))

  let crawl = false
  for (let i = next; i < grid.length; i++) {
    const n = grid[i] ?? ns
    if (n <= root) continue
    if ((table ? (table.torques[i] ?? 0) : net.motorAt(n)) - pl.torque(n) > 0) {
      crawl = true
      break
    }
  }
  return finish(net, 'running', root, crawl, tm0, tl0, onJump)
}

function scanTableOf(bm: BoundMotor, net: NetTorque): ScanTable | undefined {
  if (bm.scanTable) return bm.scanTable
  if (!bm.solvedOnce) {
    bm.solvedOnce = true
    return undefined
  }
  return buildScanTable(bm, net)
}

/**
 * Tabulates a bound motor's scan from standstill now, rather than on its second solve: a
 * selection plan does it for every motor it binds, so no run pays a first, untabulated solve.
 */
export function tabulateScan(bm: BoundMotor): void {
  bm.scanTable ??= buildScanTable(bm)
}

/** The motor's scan speeds from standstill on its supply and its shaft torque at each (evaluations counted). */
function buildScanTable(bm: BoundMotor, net?: NetTorque): ScanTable {
  const speeds = bm.dipRpms.length === 0 ? plainGrid(bm.syncRpm) : scanGrid(bm.syncRpm, 0, bm.dipRpms, Infinity, [])
  const torques: number[] = []
  for (let i = 0; i < speeds.length; i++) torques.push(bm.torque(speeds[i] ?? 0))
  const table: ScanTable = { speeds, torques, startTorque: bm.torque(0) }
  if (net) net.evaluations += speeds.length + 1
  bm.scanTable = table
  return table
}

function finish(net: NetTorque, status: OperatingPoint['status'], rpm: number, crawl: boolean, tm0: number, tl0: number, onJump = false): OperatingPoint {
  const me = net.motor.evaluate(rpm)
  net.evaluations++
  const le = net.load.evaluate(rpm)
  const running = status === 'running'
  // One literal with every field (absent ones undefined, so JSON and `??` read them as missing):
  // adding the optional fields one by one grew a properties store per point on the hot path.
  const point: OperatingPoint = {
    status,
    rpm,
    slip: me.slip,
    syncRpm: net.motor.syncRpm,
    shaftTorqueNm: me.shaftTorqueNm,
    loadTorqueNm: le.torqueNm,
    airGapTorqueNm: me.airGapTorqueNm,
    currentA: me.currentA,
    powerFactor: me.powerFactor,
    inputW: me.inputW,
    outputW: running ? (me.outputW ?? 0) : 0,
    efficiency: me.efficiency === undefined ? undefined : running ? me.efficiency : 0,
    flowM3s: le.flowM3s,
    staticPa: le.staticPa,
    fanShaftW: le.flowM3s === undefined ? undefined : le.shaftW,
    fanStall: le.fanStall,
    fanNoFlow: le.fanNoFlow,
    crawl,
    loadJump: onJump ? true : undefined,
    extrapolated: Boolean(me.extrapolated || le.extrapolated),
    startingTorqueNm: tm0,
    loadStartingTorqueNm: tl0,
    evaluations: net.evaluations,
  }
  assertFinite(point)
  return point
}

/** Scan speeds from standstill for motors without dips, one shared array per synchronous speed. */
const plainGrids = new Map<number, readonly number[]>()

function plainGrid(ns: number): readonly number[] {
  let grid = plainGrids.get(ns)
  if (!grid) {
    grid = scanGrid(ns, 0, [], Infinity, [])
    if (plainGrids.size < 64) plainGrids.set(ns, grid)
  }
  return grid
}

/** Scan speeds above n0: the slip grid merged with the dip knots, ending at min(n_s, maxRpm). */
function scanGrid(ns: number, n0: number, motorDips: readonly number[], maxRpm: number, jumps: readonly number[]): number[] {
  const top = maxRpm < ns ? maxRpm : ns
  let dips = motorDips
  if (jumps.length > 0) {
    // Both sides of a jump in load torque, so a point on the jump is bracketed tightly.
    const merged = [...motorDips]
    for (const n of jumps) merged.push(n * (1 - 1e-9), n * (1 + 1e-9))
    dips = merged.sort((a, b) => a - b)
  }
  const pts: number[] = []
  let j = 0
  for (let k = 0; k <= SLIP_GRID.length; k++) {
    const slip = SLIP_GRID[k]
    const g = slip === undefined ? Infinity : ns * (1 - slip)
    // Merge the (sorted) dip knots below this grid speed, then the grid speed itself.
    for (;;) {
      const d = j < dips.length ? (dips[j] ?? Infinity) : Infinity
      const n = d <= g ? d : g
      if (n === Infinity) break
      if (d <= g) j++
      if (n > n0 && n < top && n !== pts[pts.length - 1]) pts.push(n)
      if (n === g) break
    }
  }
  pts.push(top)
  return pts
}

/** Brent's root finder on [a, b] with f(a) > 0 > f(b) (signs may be either way round). */
export function brent(f: { at(x: number): number }, a0: number, b0: number, fa0: number, fb0: number, tol: number): number {
  let a = a0
  let b = b0
  let fa = fa0
  let fb = fb0
  let c = a
  let fc = fa
  let d = b - a
  let e = d
  for (let iter = 0; iter < 100; iter++) {
    if ((fb > 0 && fc > 0) || (fb < 0 && fc < 0)) {
      c = a
      fc = fa
      d = b - a
      e = d
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b
      b = c
      c = a
      fa = fb
      fb = fc
      fc = fa
    }
    const tol1 = 2 * Number.EPSILON * Math.abs(b) + 0.5 * tol
    const xm = 0.5 * (c - b)
    if (Math.abs(xm) <= tol1 || fb === 0) return b
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa
      let p: number
      let q: number
      if (a === c) {
        p = 2 * xm * s
        q = 1 - s
      } else {
        const qq = fa / fc
        const r = fb / fc
        p = s * (2 * xm * qq * (qq - r) - (b - a) * (r - 1))
        q = (qq - 1) * (r - 1) * (s - 1)
      }
      if (p > 0) q = -q
      p = Math.abs(p)
      const min1 = 3 * xm * q - Math.abs(tol1 * q)
      const min2 = Math.abs(e * q)
      if (2 * p < Math.min(min1, min2)) {
        e = d
        d = p / q
      } else {
        d = xm
        e = d
      }
    } else {
      d = xm
      e = d
    }
    a = b
    fa = fb
    b += Math.abs(d) > tol1 ? d : xm >= 0 ? tol1 : -tol1
    fb = f.at(b)
  }
  return b
}

function assertFinite(p: OperatingPoint): void {
  const finite =
    Number.isFinite(p.rpm) && Number.isFinite(p.slip) && Number.isFinite(p.shaftTorqueNm) && Number.isFinite(p.loadTorqueNm) && Number.isFinite(p.outputW) &&
    Number.isFinite(p.startingTorqueNm) && Number.isFinite(p.loadStartingTorqueNm) && finiteOrAbsent(p.airGapTorqueNm) && finiteOrAbsent(p.currentA) &&
    finiteOrAbsent(p.powerFactor) && finiteOrAbsent(p.inputW) && finiteOrAbsent(p.efficiency) && finiteOrAbsent(p.flowM3s) && finiteOrAbsent(p.staticPa) &&
    finiteOrAbsent(p.fanShaftW)
  if (!finite) throw new Error(`solveOperatingPoint produced a non-finite figure (${JSON.stringify(p)}); please report the case`)
}

function finiteOrAbsent(v: number | undefined): boolean {
  return v === undefined || Number.isFinite(v)
}
