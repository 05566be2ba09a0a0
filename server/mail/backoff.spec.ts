import { describe, expect, it } from 'vitest'
import { DEFAULT_BACKOFF, retryDelayMs } from './backoff'

const noJitter = { ...DEFAULT_BACKOFF, jitter: 0 }

describe('retryDelayMs', () => {
  it('doubles from 5 s after each failure when there is no jitter', () => {
    expect([1, 2, 3, 4, 5].map((attempt) => retryDelayMs(attempt, noJitter))).toEqual([5_000, 10_000, 20_000, 40_000, 80_000])
  })

  it('never waits longer than the cap, however many failures', () => {
    expect(retryDelayMs(8, noJitter)).toBe(600_000)
    expect(retryDelayMs(200, noJitter)).toBe(600_000)
  })

  it('draws the wait between (1 - jitter) and 1 times the delay', () => {
    expect(retryDelayMs(2, DEFAULT_BACKOFF, () => 0)).toBe(10_000)
    expect(retryDelayMs(2, DEFAULT_BACKOFF, () => 0.999999)).toBe(8_000)
    for (let i = 0; i < 200; i += 1) {
      const delay = retryDelayMs(3, DEFAULT_BACKOFF)
      expect(delay).toBeGreaterThanOrEqual(16_000)
      expect(delay).toBeLessThanOrEqual(20_000)
    }
  })

  it('refuses an attempt count below 1', () => {
    expect(() => retryDelayMs(0)).toThrow(RangeError)
  })
})
