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
export class Pchip {
  readonly x: Float64Array
  readonly y: Float64Array
  /** Derivative at each knot. */
  readonly d: Float64Array
  /** Per interval: y = y_i + d_i u + c2_i u^2 + c3_i u^3 with u = x - x_i. */
  private readonly c2: Float64Array
  private readonly c3: Float64Array
  private readonly last: number

  /** `x` strictly increasing and finite (validated by the caller), at least two points. */
  constructor(x: ArrayLike<number>, y: ArrayLike<number>) {
    const n = x.length
    if (n < 2 || y.length !== n) throw new RangeError('Pchip needs two or more (x, y) pairs')
    this.x = Float64Array.from(x)
    this.y = Float64Array.from(y)
    this.last = n - 1
    const h = new Float64Array(n - 1)
    const m = new Float64Array(n - 1)
    for (let i = 0; i < n - 1; i++) {
      const hi = at(this.x, i + 1) - at(this.x, i)
      if (!(hi > 0)) throw new RangeError('Pchip x must be strictly increasing')
      h[i] = hi
      m[i] = (at(this.y, i + 1) - at(this.y, i)) / hi
    }
    const d = new Float64Array(n)
    if (n === 2) {
      d[0] = at(m, 0)
      d[1] = at(m, 0)
    } else {
      for (let k = 1; k < n - 1; k++) {
        const m0 = at(m, k - 1)
        const m1 = at(m, k)
        if (m0 === 0 || m1 === 0 || Math.sign(m0) !== Math.sign(m1)) {
          d[k] = 0
        } else {
          const w1 = 2 * at(h, k) + at(h, k - 1)
          const w2 = at(h, k) + 2 * at(h, k - 1)
          d[k] = (w1 + w2) / (w1 / m0 + w2 / m1)
        }
      }
      d[0] = edgeDerivative(at(h, 0), at(h, 1), at(m, 0), at(m, 1))
      d[n - 1] = edgeDerivative(at(h, n - 2), at(h, n - 3), at(m, n - 2), at(m, n - 3))
    }
    this.d = d
    this.c2 = new Float64Array(n - 1)
    this.c3 = new Float64Array(n - 1)
    for (let i = 0; i < n - 1; i++) {
      const hi = at(h, i)
      const mi = at(m, i)
      const d0 = at(d, i)
      const d1 = at(d, i + 1)
      this.c2[i] = (3 * mi - 2 * d0 - d1) / hi
      this.c3[i] = (d0 + d1 - 2 * mi) / (hi * hi)
    }
  }

  /** Index of the interval holding x (end intervals for points outside). */
  interval(xv: number): number {
    const xs = this.x
    let lo = 0
    let hi = this.last - 1
    if (xv >= at(xs, hi)) return hi
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1
      if (at(xs, mid) <= xv) lo = mid
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
    const u = xv - at(this.x, i)
    return at(this.y, i) + u * (at(this.d, i) + u * (at(this.c2, i) + u * at(this.c3, i)))
  }

  derivative(xv: number): number {
    const i = this.interval(xv)
    return this.derivativeIn(i, xv)
  }

  derivativeIn(i: number, xv: number): number {
    const u = xv - at(this.x, i)
    return at(this.d, i) + u * (2 * at(this.c2, i) + 3 * u * at(this.c3, i))
  }

  /** Coefficients [c0, c1, c2, c3] of interval i in u = x - x_i. */
  coefficients(i: number): [number, number, number, number] {
    return [at(this.y, i), at(this.d, i), at(this.c2, i), at(this.c3, i)]
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
