import { describe, expect, it } from 'vitest'
import { evaluateLoad, prepareLoad } from './index'
import { axialFan, blowerFan } from './examples'
import { errorField } from './spec-helpers'
import type { FanLoad, FanPoint } from './types'

const p0: FanPoint = { flowM3s: 0, staticPa: 120, shaftW: 20 }
const p1: FanPoint = { flowM3s: 0.1, staticPa: 110, shaftW: 30 }
const p2: FanPoint = { flowM3s: 0.2, staticPa: 70, shaftW: 38 }
const p3: FanPoint = { flowM3s: 0.3, staticPa: 0, shaftW: 40 }
const simpleFan: FanLoad = { kind: 'fan', fan: { refRpm: 1500, refDensity: 1.2, points: [p0, p1, p2, p3] }, system: { k: 2000 } }

describe('fan on a system by the fan laws', () => {
  it('meets the system curve at the reference speed: fan pressure equals k Q^2', () => {
    const e = evaluateLoad(simpleFan, 1500)
    expect(e.staticPa).toBeCloseTo(2000 * (e.flowM3s ?? 0) ** 2, 9)
    // Between the tabulated (0.2, 70) and (0.3, 0): k Q^2 crosses there.
    expect(e.flowM3s ?? 0).toBeGreaterThan(0.18)
    expect(e.flowM3s ?? 0).toBeLessThan(0.2)
  })

  it('scales flow with n, pressure with n^2 and power with n^3 on a system without offset', () => {
    // Fan laws (affinity laws): ASHRAE Handbook - HVAC Systems and Equipment, Fans chapter;
    // AMCA 201 Fans and Systems. A system p = k Q^2 keeps the point on the same fan-curve point.
    const a = evaluateLoad(simpleFan, 1500)
    const b = evaluateLoad(simpleFan, 3000)
    expect(b.flowM3s).toBeCloseTo(2 * (a.flowM3s ?? 0), 12)
    expect(b.staticPa).toBeCloseTo(4 * (a.staticPa ?? 0), 9)
    expect(b.shaftW).toBeCloseTo(8 * a.shaftW, 9)
    expect(b.torqueNm).toBeCloseTo(4 * a.torqueNm, 12)
  })

  it('keeps the flow and scales pressure and power by density for warmer air at the same speed', () => {
    // Stoecker & Jones, Refrigeration and Air Conditioning, fan laws (the principle, from memory):
    // the same fan at the same speed in the same duct moves the same volume of lighter air, with
    // pressure and power in proportion to density. The duct's k scales with density too.
    const ratio = 293.15 / 323.15 // 20 C to 50 C at the same pressure (ideal gas)
    const cold = evaluateLoad(simpleFan, 1400)
    const warm = evaluateLoad({ ...simpleFan, density: 1.2 * ratio, system: { k: 2000 * ratio } }, 1400)
    expect(warm.flowM3s).toBeCloseTo(cold.flowM3s ?? 0, 12)
    expect(warm.staticPa).toBeCloseTo(ratio * (cold.staticPa ?? 0), 9)
    expect(warm.shaftW).toBeCloseTo(ratio * cold.shaftW, 9)
  })

  it('gives no flow and shut-off power below the speed that overcomes the offset pressure', () => {
    // The blower's largest pressure is about 230 Pa at 1500 r/min; with a 20 Pa offset it needs
    // roughly sqrt(20/230) x 1500 = 440 r/min before any air moves (fan laws, p ~ n^2).
    const slow = evaluateLoad(blowerFan, 300)
    expect(slow.fanNoFlow).toBe(true)
    expect(slow.flowM3s).toBe(0)
    expect(slow.shaftW).toBeCloseTo(18 * (300 / 1500) ** 3, 12)
    const fast = evaluateLoad(blowerFan, 1500)
    expect(fast.fanNoFlow).toBe(false)
    expect(fast.staticPa).toBeCloseTo(20 + 6000 * (fast.flowM3s ?? 0) ** 2, 9)
    // With an offset the flow is not proportional to speed.
    const half = evaluateLoad(blowerFan, 750)
    expect((half.flowM3s ?? 0) / (fast.flowM3s ?? 1)).toBeLessThan(0.5)
  })

  it('flags an operating point left of the pressure peak as the stall region', () => {
    const open = evaluateLoad(axialFan, 1500)
    expect(open.fanStall).toBe(false)
    const throttled = evaluateLoad({ ...axialFan, system: { k: 20000 } }, 1500)
    expect(throttled.fanStall).toBe(true)
    expect(throttled.flowM3s ?? 1).toBeLessThan(0.1)
  })

  it('refuses a fan curve that never meets the system curve, naming the field', () => {
    const short: FanLoad = { ...simpleFan, fan: { ...simpleFan.fan, points: simpleFan.fan.points.slice(0, 3) }, system: { k: 100 } }
    expect(errorField(() => prepareLoad(short))).toBe('load.system.k')
    // With an offset it only runs off the curve above some speed.
    const shortOffset: FanLoad = { ...short, system: { k: 100, offsetPa: 50 } }
    const prepared = prepareLoad(shortOffset)
    expect(evaluateLoad(prepared, 1200).fanNoFlow).toBe(false)
    expect(errorField(() => evaluateLoad(prepared, 3000))).toBe('load.fan.points')
  })

  it('refuses bad fan data with the field path', () => {
    const unsorted = { ...simpleFan, fan: { ...simpleFan.fan, points: [p0, p2, p1, p3] } }
    expect(errorField(() => prepareLoad(unsorted))).toBe('load.fan.points[2].flowM3s')
    expect(errorField(() => prepareLoad({ ...simpleFan, fan: { ...simpleFan.fan, points: [p1, p2] } }))).toBe('load.fan.points[0].flowM3s')
    expect(errorField(() => prepareLoad({ ...simpleFan, fan: { ...simpleFan.fan, points: [p0] } }))).toBe('load.fan.points')
    expect(errorField(() => prepareLoad({ ...simpleFan, system: { k: -1 } }))).toBe('load.system.k')
    expect(errorField(() => prepareLoad({ ...simpleFan, density: Number.POSITIVE_INFINITY }))).toBe('load.density')
    expect(errorField(() => evaluateLoad(simpleFan, -5))).toBe('rpm')
  })
})
