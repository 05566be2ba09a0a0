/**
 * Monotone piecewise cubic Hermite interpolation (PCHIP) after Fritsch & Carlson (SIAM J. Numer.
 * Anal. 17, 1980) with the derivative choice of Fritsch & Butland (1984), exactly as SciPy's
 * `scipy.interpolate.PchipInterpolator` computes it:
 * - interior knots: weighted harmonic mean of the neighbouring secant slopes,
 *   w1 = 2 h_k + h_(k-1), w2 = h_k + 2 h_(k-1), d = (w1 + w2) / (w1 / m_(k-1) + w2 / m_k),
 *   and d = 0 where the slopes change sign or either is zero (local extremum or flat data);
 * - end knots: SciPy's non-centred three-point rule d = ((2 h0 + h1) m0 - h0 m1) / (h0 + h1),
 *   set to 0 if its sign differs from m0, and limited to 3 m0 when m0 and m1 differ in sign;
 * - two points: the straight line through them.
 * Between knots the interpolant is monotone wherever the data are, so its local extrema sit on
 * knots: the solver relies on that. Outside the data the end cubics continue (SciPy's default
 * `extrapolate=True`); callers in this package handle out-of-range speeds themselves.
 */
/** Values stored per knot in Pchip's packed array: x, y, d, c2, c3 (the last knot's c2, c3 unused). */
const STRIDE = 5

export class Pchip {
  /**
   * Every knot's x, y, derivative and its interval's c2, c3, side by side in one array: an
   * evaluation reads one short run of memory, where five arrays (each its own object and store)
   * cost a catalogue-sized selection a cache miss apiece.
   */
  private readonly k: Float64Array
  private readonly last: number

  /** `x` strictly increasing and finite (validated by the caller), at least two points. */
  constructor(x: ArrayLike<number>, y: ArrayLike<number>) {
    const n = x.length
    if (n < 2 || y.length !== n) throw new RangeError('Pchip needs two or more (x, y) pairs')
    this.last = n - 1
    // The one typed array is the result; the working arrays are plain ones (a catalogue prepares
    // tens of thousands of curves, and each typed array is a store of its own for the collector).
    const k = new Float64Array(STRIDE * n)
    for (let i = 0; i < n; i++) {
      k[STRIDE * i] = x[i] as number
      k[STRIDE * i + 1] = y[i] as number
    }
    const h: number[] = []
    const m: number[] = []
    for (let i = 0; i < n - 1; i++) {
      const hi = at(k, STRIDE * (i + 1)) - at(k, STRIDE * i)
      if (!(hi > 0)) throw new RangeError('Pchip x must be strictly increasing')
      h.push(hi)
      m.push((at(k, STRIDE * (i + 1) + 1) - at(k, STRIDE * i + 1)) / hi)
    }
    const d: number[] = new Array<number>(n).fill(0)
    if (n === 2) {
      d[0] = item(m, 0)
      d[1] = item(m, 0)
    } else {
      for (let j = 1; j < n - 1; j++) {
        const m0 = item(m, j - 1)
        const m1 = item(m, j)
        if (m0 === 0 || m1 === 0 || Math.sign(m0) !== Math.sign(m1)) {
          d[j] = 0
        } else {
          const w1 = 2 * item(h, j) + item(h, j - 1)
          const w2 = item(h, j) + 2 * item(h, j - 1)
          d[j] = (w1 + w2) / (w1 / m0 + w2 / m1)
        }
      }
      d[0] = edgeDerivative(item(h, 0), item(h, 1), item(m, 0), item(m, 1))
      d[n - 1] = edgeDerivative(item(h, n - 2), item(h, n - 3), item(m, n - 2), item(m, n - 3))
    }
    for (let i = 0; i < n; i++) {
      const o = STRIDE * i
      k[o + 2] = item(d, i)
      if (i === n - 1) continue
      const hi = item(h, i)
      const mi = item(m, i)
      const d0 = item(d, i)
      const d1 = item(d, i + 1)
      k[o + 3] = (3 * mi - 2 * d0 - d1) / hi
      k[o + 4] = (d0 + d1 - 2 * mi) / (hi * hi)
    }
    this.k = k
  }

  /** The knots' x. */
  get x(): Float64Array {
    return this.column(0)
  }

  /** The knots' y. */
  get y(): Float64Array {
    return this.column(1)
  }

  /** Derivative at each knot. */
  get d(): Float64Array {
    return this.column(2)
  }

  private column(offset: number): Float64Array {
    return Float64Array.from({ length: this.last + 1 }, (_, i) => at(this.k, STRIDE * i + offset))
  }

  /** Index of the interval holding x (end intervals for points outside). */
  interval(xv: number): number {
    const k = this.k
    let lo = 0
    let hi = this.last - 1
    if (xv >= at(k, STRIDE * hi)) return hi
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1
      if (at(k, STRIDE * mid) <= xv) lo = mid
      else hi = mid - 1
    }
    return lo
  }

  value(xv: number): number {
    const i = this.interval(xv)
    return this.valueIn(i, xv)
  }

  /** Value using the polynomial of interval i (no search). */
  valueIn(i: number, xv: number): number {
    const k = this.k
    const o = STRIDE * i
    const u = xv - at(k, o)
    return at(k, o + 1) + u * (at(k, o + 2) + u * (at(k, o + 3) + u * at(k, o + 4)))
  }

  derivative(xv: number): number {
    const i = this.interval(xv)
    return this.derivativeIn(i, xv)
  }

  derivativeIn(i: number, xv: number): number {
    const k = this.k
    const o = STRIDE * i
    const u = xv - at(k, o)
    return at(k, o + 2) + u * (2 * at(k, o + 3) + 3 * u * at(k, o + 4))
  }

  /** Coefficients [c0, c1, c2, c3] of interval i in u = x - x_i. */
  coefficients(i: number): [number, number, number, number] {
    const o = STRIDE * i
    return [at(this.k, o + 1), at(this.k, o + 2), at(this.k, o + 3), at(this.k, o + 4)]
  }

  get size(): number {
    return this.last + 1
  }
}

function edgeDerivative(h0: number, h1: number, m0: number, m1: number): number {
  const d = ((2 * h0 + h1) * m0 - h0 * m1) / (h0 + h1)
  if (Math.sign(d) !== Math.sign(m0)) return 0
  if (Math.sign(m0) !== Math.sign(m1) && Math.abs(d) > Math.abs(3 * m0)) return 3 * m0
  return d
}

/** Typed-array read that satisfies noUncheckedIndexedAccess; indices are in range by construction. */
function at(a: Float64Array, i: number): number {
  return a[i] ?? 0
}

/** The same for the constructor's working arrays. */
function item(a: readonly number[], i: number): number {
  return a[i] ?? 0
}
