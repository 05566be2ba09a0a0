/**
 * Fan on a system, by the fan laws (affinity laws) as ASHRAE Handbook - HVAC Systems and Equipment,
 * chapter Fans, and AMCA 201 Fans and Systems state them: with speed ratio r = n / n_ref and
 * density ratio d = rho / rho_ref, a fan point (Q, p, P) maps to (r Q, r^2 d p, r^3 d P).
 * The system curve p = offsetPa + k Q^2 is at the operating density.
 *
 * Normalised intersection: write Q = r q (q on the reference curve). Then fan meets system where
 *   g(q) = d p_ref(q) - k q^2 = offsetPa / r^2.
 * g does not depend on speed, so its PCHIP pieces are cubics prepared once. With no offset the
 * right side is 0 and q is a constant: flow is proportional to speed and the load torque is
 * K r^2, a single multiply per evaluation. With an offset, q falls as speed falls; once
 * offsetPa / r^2 exceeds the largest g the fan cannot overcome the offset, delivers no air and
 * takes its shut-off power. Where g has several crossings (a stall dip), the operating point is
 * the rightmost one (highest flow), as fan selection practice takes it; a point left of the
 * pressure peak (the local peak that heads the falling, stable branch) is flagged as in the stall
 * region. Load torque = shaft power / angular speed.
 */
import { EngineeringInputError, requireArray, requireFinite, requireNonNegative, requireObject, requirePositive } from './errors'
import { Pchip } from './pchip'
import type { FanLoad, FanPoint, LoadEvaluation } from './types'

const SEEDS_PER_INTERVAL = 16

export function validateFanLoad(input: unknown, field = 'load'): FanLoad {
  const l = requireObject(input, field)
  const f = requireObject(l.fan, `${field}.fan`)
  const refRpm = requirePositive(f.refRpm, `${field}.fan.refRpm`)
  const refDensity = requirePositive(f.refDensity, `${field}.fan.refDensity`)
  const raw = requireArray(f.points, `${field}.fan.points`, 2)
  const points: FanPoint[] = []
  raw.forEach((p, i) => {
    const pf = `${field}.fan.points[${i}]`
    const o = requireObject(p, pf)
    const flowM3s = requireNonNegative(o.flowM3s, `${pf}.flowM3s`)
    if (i === 0 && flowM3s !== 0) throw new EngineeringInputError(`${pf}.flowM3s`, 'the first point must be at shut-off (flow 0)')
    const prev = points[i - 1]
    if (prev && flowM3s <= prev.flowM3s) throw new EngineeringInputError(`${pf}.flowM3s`, 'flows must be strictly increasing')
    points.push({
      flowM3s,
      staticPa: requireFinite(o.staticPa, `${pf}.staticPa`),
      shaftW: requireNonNegative(o.shaftW, `${pf}.shaftW`),
    })
  })
  const s = requireObject(l.system, `${field}.system`)
  const load: FanLoad = {
    kind: 'fan',
    fan: { refRpm, refDensity, points },
    system: { k: requireNonNegative(s.k, `${field}.system.k`) },
  }
  if (s.offsetPa !== undefined) load.system.offsetPa = requireNonNegative(s.offsetPa, `${field}.system.offsetPa`)
  if (l.density !== undefined) load.density = requirePositive(l.density, `${field}.density`)
  return load
}

export class PreparedFanLoad {
  readonly prepared = 'load'
  readonly source: FanLoad
  /** Above this speed the system curve would meet the fan beyond its last tabulated flow. */
  readonly maxRpm: number
  /**
   * Speeds where the load torque jumps: with an offset and a pressure hump, the fan breaks through
   * from no flow to a flow right of the hump at one speed. The solver visits each from both sides.
   */
  readonly jumpRpms: readonly number[]
  /** Flow on the reference curve at the pressure peak; less flow than this is the stall region. */
  readonly peakFlow: number
  private readonly field: string
  private readonly pressure: Pchip
  private readonly power: Pchip
  private readonly q: Float64Array
  private readonly g: Float64Array[]
  private readonly argMaxU: Float64Array
  /**
   * Per interval, g sampled at SEEDS_PER_INTERVAL + 1 even steps from its maximum to the interval's
   * end, where the rightmost crossing lies: a linear look-up there starts Newton's method so close
   * that one or two steps finish it (with an offset, every load evaluation solves g(q) = c).
   */
  private readonly seeds: Float64Array[]
  private readonly suffixMax: Float64Array
  private readonly d: number
  private readonly k: number
  private readonly offset: number
  /** Reference flow at the operating point when offsetPa = 0. */
  private readonly q0: number
  /** Torque factor: T = torqueFactor r^2 (no-offset case). */
  private readonly torqueFactor: number
  private readonly omegaRef: number

  constructor(load: FanLoad, field = 'load') {
    this.source = load
    this.field = field
    const pts = load.fan.points
    const qs = pts.map((p) => p.flowM3s)
    this.q = Float64Array.from(qs)
    this.pressure = new Pchip(qs, pts.map((p) => p.staticPa))
    this.power = new Pchip(qs, pts.map((p) => p.shaftW))
    this.d = (load.density ?? load.fan.refDensity) / load.fan.refDensity
    this.k = load.system.k
    this.offset = load.system.offsetPa ?? 0
    this.omegaRef = (load.fan.refRpm * 2 * Math.PI) / 60

    // The stable branch runs from free delivery back up to the first local pressure peak met;
    // flows left of that peak are the stall region (none when pressure only falls with flow).
    let peakIndex = pts.length - 1
    while (peakIndex > 0 && (pts[peakIndex - 1]?.staticPa ?? 0) > (pts[peakIndex]?.staticPa ?? 0)) peakIndex--
    this.peakFlow = pts[peakIndex]?.flowM3s ?? 0

    const n = pts.length - 1
    this.g = []
    this.argMaxU = new Float64Array(n)
    const intervalMax = new Float64Array(n)
    for (let i = 0; i < n; i++) {
      const [c0, c1, c2, c3] = this.pressure.coefficients(i)
      const qi = qs[i] ?? 0
      const h = (qs[i + 1] ?? 0) - qi
      const gc = Float64Array.of(this.d * c0 - this.k * qi * qi, this.d * c1 - 2 * this.k * qi, this.d * c2 - this.k, this.d * c3)
      this.g.push(gc)
      // Candidates for the maximum on [0, h]: ends and the roots of g'.
      const cands = [0, h, ...quadraticRoots(3 * (gc[3] ?? 0), 2 * (gc[2] ?? 0), gc[1] ?? 0).filter((u) => u > 0 && u < h)]
      let bestU = 0
      let best = -Infinity
      for (const u of cands) {
        const v = cubic(gc, u)
        if (v > best || (v === best && u > bestU)) {
          best = v
          bestU = u
        }
      }
      intervalMax[i] = best
      this.argMaxU[i] = bestU
    }
    this.seeds = []
    for (let i = 0; i < n; i++) {
      const gc = this.g[i] as Float64Array
      const a = this.argMaxU[i] ?? 0
      const h = (qs[i + 1] ?? 0) - (qs[i] ?? 0)
      const table = new Float64Array(SEEDS_PER_INTERVAL + 1)
      for (let k = 0; k <= SEEDS_PER_INTERVAL; k++) table[k] = cubic(gc, a + ((h - a) * k) / SEEDS_PER_INTERVAL)
      this.seeds.push(table)
    }
    this.suffixMax = new Float64Array(n)
    let run = -Infinity
    for (let i = n - 1; i >= 0; i--) {
      run = Math.max(run, intervalMax[i] ?? -Infinity)
      this.suffixMax[i] = run
    }
    const gEnd = this.gAt(n - 1, (qs[n] ?? 0) - (qs[n - 1] ?? 0))
    if (this.offset === 0) {
      if (gEnd > 1e-12 * Math.max(1, Math.abs(this.d * (pts[0]?.staticPa ?? 0)))) {
        throw new EngineeringInputError(
          `${field}.system.k`,
          'the system curve never meets the fan curve: at its last tabulated flow the fan still gives more pressure than the system needs (extend the fan curve to free delivery)',
        )
      }
      this.maxRpm = Infinity
      this.q0 = Math.max(0, this.referenceFlow(0))
    } else {
      this.maxRpm = gEnd > 0 ? Math.sqrt(this.offset / gEnd) * load.fan.refRpm : Infinity
      this.q0 = 0
    }
    this.torqueFactor = (this.d * this.power.value(this.q0)) / this.omegaRef
    const gMax = this.suffixMax[0] ?? 0
    const breakFlow = this.offset > 0 && gMax > 0 ? this.referenceFlow(gMax) : 0
    this.jumpRpms = breakFlow > 0 ? [Math.sqrt(this.offset / gMax) * load.fan.refRpm] : []
  }

  private gAt(i: number, u: number): number {
    const gc = this.g[i]
    return gc ? cubic(gc, u) : 0
  }

  /** Reference-curve flow where g(q) = c, rightmost crossing; -1 when g never reaches c. */
  private referenceFlow(c: number): number {
    const S = this.suffixMax
    const n = S.length
    if (!((S[0] ?? -Infinity) >= c)) return -1
    // Largest i with suffixMax[i] >= c (suffixMax is non-increasing).
    let lo = 0
    let hi = n - 1
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1
      if ((S[mid] ?? -Infinity) >= c) lo = mid
      else hi = mid - 1
    }
    const gc = this.g[lo]
    if (!gc) return -1
    const qi = this.q[lo] ?? 0
    const h = (this.q[lo + 1] ?? 0) - qi
    let a = this.argMaxU[lo] ?? 0
    let b = h
    let gb = cubic(gc, b) - c
    if (gb >= 0) return qi + b
    let ga = cubic(gc, a) - c
    // g(a) >= c > g(b) and g decreases on the part of [a, b] that holds the crossing: Newton
    // steps from the seed table's start, kept inside the shrinking bracket, else bisection.
    let u = this.seed(lo, a, b, c)
    if (!(u > a && u < b)) u = ga > 0 ? a + (b - a) * (ga / (ga - gb)) : a
    const eps = 1e-12 * h
    for (let it = 0; it < 50; it++) {
      const v = cubic(gc, u) - c
      if (v === 0) break
      if (v > 0) {
        a = u
        ga = v
      } else {
        b = u
        gb = v
      }
      const dv = (gc[1] ?? 0) + u * (2 * (gc[2] ?? 0) + 3 * u * (gc[3] ?? 0))
      let next = dv < 0 ? u - v / dv : 0.5 * (a + b)
      if (!(next > a && next < b)) next = 0.5 * (a + b)
      const step = next - u
      u = next
      if ((step < 0 ? -step : step) <= eps || b - a <= eps) break
    }
    return qi + u
  }

  /** Start for the crossing g(q) = c on interval i: the last seed at or above c, then linear to the next. */
  private seed(i: number, a: number, b: number, c: number): number {
    const table = this.seeds[i]
    if (!table) return a
    // The last k with table[k] >= c, by bisection (g falls over the table where the crossing lies).
    let k = 0
    let top = SEEDS_PER_INTERVAL
    while (k < top) {
      const mid = (k + top + 1) >> 1
      if ((table[mid] ?? -Infinity) >= c) k = mid
      else top = mid - 1
    }
    if (k >= SEEDS_PER_INTERVAL) return b
    const g0 = table[k] ?? 0
    const g1 = table[k + 1] ?? 0
    const step = (b - a) / SEEDS_PER_INTERVAL
    return a + step * (k + (g0 > g1 ? (g0 - c) / (g0 - g1) : 0.5))
  }

  /** Load torque in N m at `rpm` (hot path). */
  torque(rpm: number): number {
    const r = rpm / this.source.fan.refRpm
    if (this.offset === 0) return this.torqueFactor * r * r
    if (r <= 0) return 0
    const qr = this.referenceFlow(this.offset / (r * r))
    return (this.d * this.power.value(qr < 0 ? 0 : qr) * r * r) / this.omegaRef
  }

  evaluate(rpm: number): LoadEvaluation {
    const r = rpm / this.source.fan.refRpm
    if (rpm > this.maxRpm) {
      throw new EngineeringInputError(
        `${this.field}.fan.points`,
        `at ${rpm.toFixed(0)} r/min the system curve meets the fan curve beyond its last tabulated flow (extend the fan curve to free delivery)`,
      )
    }
    let qr = this.offset === 0 ? this.q0 : r > 0 ? this.referenceFlow(this.offset / (r * r)) : -1
    const noFlow = qr < 0
    if (noFlow) qr = 0
    const flowM3s = r * qr
    const staticPa = noFlow ? r * r * this.d * this.pressure.value(0) : this.offset + this.k * flowM3s * flowM3s
    const shaftW = r * r * r * this.d * this.power.value(qr)
    const w = (rpm * 2 * Math.PI) / 60
    return {
      rpm,
      torqueNm: w > 0 ? shaftW / w : 0,
      shaftW,
      flowM3s,
      staticPa,
      fanStall: noFlow || qr < this.peakFlow,
      fanNoFlow: noFlow,
    }
  }
}

function cubic(c: Float64Array, u: number): number {
  return (c[0] ?? 0) + u * ((c[1] ?? 0) + u * ((c[2] ?? 0) + u * (c[3] ?? 0)))
}

/** Real roots of a x^2 + b x + c = 0 (degenerate cases included). */
function quadraticRoots(a: number, b: number, c: number): number[] {
  if (a === 0) return b === 0 ? [] : [-c / b]
  const disc = b * b - 4 * a * c
  if (disc < 0) return []
  const sq = Math.sqrt(disc)
  const q = -0.5 * (b + (b >= 0 ? sq : -sq))
  const roots = [q / a]
  if (q !== 0) roots.push(c / q)
  return roots
}
