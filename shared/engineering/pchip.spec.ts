import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { Pchip } from './pchip'

// Reference values computed with SciPy 1.17.1 (NumPy 2.4.6), scipy.interpolate.PchipInterpolator,
// default extrapolate=True, and hard-coded here.
describe('Pchip against SciPy 1.17.1 PchipInterpolator', () => {
  const x = [0, 1, 2, 4, 5, 7.5]
  const y = [0, 0.8, 0.9, 0.4, 0.45, 2.0]
  const p = new Pchip(x, y)

  it('gives SciPy knot derivatives, including the three-point end rule', () => {
    const scipy = [1.1500000000000001, 0.17777777777777776, 0.0, 0.0, 0.08250950570342204, 1.0271428571428567]
    scipy.forEach((d, i) => expect(p.d[i]).toBeCloseTo(d, 12))
  })

  it('gives SciPy values inside and outside the data', () => {
    const xs = [-0.5, 0.25, 0.5, 1.5, 3, 4.5, 6, 7.5, 8]
    const scipy = [
      -0.5604166666666668, 0.27838541666666666, 0.5215277777777778, 0.8722222222222222, 0.65, 0.41468631178707227,
      0.7787891363389462, 1.9999999999999998, 2.5386439978272675,
    ]
    xs.forEach((xv, i) => expect(p.value(xv)).toBeCloseTo(scipy[i] ?? NaN, 12))
  })

  it('sets an end derivative to zero when its sign differs from the end slope (SciPy, 3 points)', () => {
    const q = new Pchip([0, 1, 3], [0, 2, 2.5])
    expect(Array.from(q.d)).toEqual([expect.closeTo(2.5833333333333335, 12), expect.closeTo(0.4864864864864865, 12), 0])
    expect(q.value(0.5)).toBeCloseTo(1.262105855855856, 12)
    expect(q.value(2)).toBeCloseTo(2.3716216216216215, 12)
    expect(q.value(2.9)).toBeCloseTo(2.4986858108108105, 12)
  })

  it('limits an end derivative to 3 m0 where the first two slopes differ in sign (SciPy)', () => {
    const q = new Pchip([0, 1, 2, 3], [0, 1, -9, -9.5])
    expect(q.d[0]).toBeCloseTo(3.0, 12)
    expect(q.d[2]).toBeCloseTo(-0.9523809523809523, 12)
    expect(q.d[3]).toBe(0)
    expect(q.value(1.5)).toBeCloseTo(-3.880952380952381, 12)
    expect(q.value(3.5)).toBeCloseTo(-9.357142857142858, 12)
  })

  it('is the straight line through two points (SciPy: [0, 4, 8] at 0, 2, 4 for (1,2),(3,6))', () => {
    const q = new Pchip([1, 3], [2, 6])
    expect(q.value(0)).toBeCloseTo(0, 12)
    expect(q.value(2)).toBeCloseTo(4, 12)
    expect(q.value(4)).toBeCloseTo(8, 12)
  })

  it('preserves monotone data between knots (Fritsch-Carlson property)', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.double({ min: 0.01, max: 10, noNaN: true }), fc.double({ min: 0, max: 10, noNaN: true })), { minLength: 2, maxLength: 12 }), (steps) => {
        const xs: number[] = []
        const ys: number[] = []
        let xv = 0
        let yv = 0
        for (const [dx, dy] of steps) {
          xs.push(xv)
          ys.push(yv)
          xv += dx
          yv += dy
        }
        const q = new Pchip(xs, ys)
        let prev = -Infinity
        const end = xs[xs.length - 1] ?? 0
        for (let i = 0; i <= 200; i++) {
          const v = q.value((end * i) / 200)
          expect(v).toBeGreaterThanOrEqual(prev - 1e-9)
          prev = v
        }
      }),
    )
  })
})
