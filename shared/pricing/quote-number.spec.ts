import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import {
  compareQuoteNumbers,
  formatQuoteNumber,
  isSameQuote,
  nextRevision,
  nextRevisionNumber,
  parseQuoteNumber,
  revisionFromIndex,
  revisionIndex,
} from './quote-number'

describe('quote numbers', () => {
  it('formats a yearly sequence padded to five digits with its revision', () => {
    expect(formatQuoteNumber({ year: 2026, sequence: 42, revision: 'A' })).toBe('SW-2026-00042A')
    expect(formatQuoteNumber({ year: 2026, sequence: 99_999, revision: 'AB' })).toBe('SW-2026-99999AB')
  })

  it('refuses sequences outside 1 ... 99 999 and bad revisions', () => {
    expect(() => formatQuoteNumber({ year: 2026, sequence: 0, revision: 'A' })).toThrow(RangeError)
    expect(() => formatQuoteNumber({ year: 2026, sequence: 100_000, revision: 'A' })).toThrow(RangeError)
    expect(() => formatQuoteNumber({ year: 2026, sequence: 1, revision: 'a' })).toThrow(RangeError)
  })

  it('parses what it formats and rejects near misses', () => {
    expect(parseQuoteNumber('SW-2026-00042A')).toEqual({ year: 2026, sequence: 42, revision: 'A' })
    for (const bad of ['SW-2026-0042A', 'SW-2026-00042', 'sw-2026-00042a', 'SW-2026-00000A', 'XX-2026-00042A', 'SW-2026-00042A ']) {
      expect(parseQuoteNumber(bad), bad).toBeNull()
    }
  })

  it('steps revisions A -> B, Z -> AA, AZ -> BA, ZZ -> AAA', () => {
    expect(nextRevision('A')).toBe('B')
    expect(nextRevision('Y')).toBe('Z')
    expect(nextRevision('Z')).toBe('AA')
    expect(nextRevision('AA')).toBe('AB')
    expect(nextRevision('AZ')).toBe('BA')
    expect(nextRevision('ZZ')).toBe('AAA')
    expect(nextRevisionNumber({ year: 2026, sequence: 42, revision: 'Z' })).toEqual({ year: 2026, sequence: 42, revision: 'AA' })
  })

  it('orders by year, then sequence, then revision (B before AA)', () => {
    const sorted = ['SW-2026-00042AA', 'SW-2025-99999A', 'SW-2026-00042B', 'SW-2026-00041C', 'SW-2026-00042A']
      .map((s) => parseQuoteNumber(s))
      .filter((n) => n !== null)
      .sort(compareQuoteNumbers)
      .map(formatQuoteNumber)
    expect(sorted).toEqual(['SW-2025-99999A', 'SW-2026-00041C', 'SW-2026-00042A', 'SW-2026-00042B', 'SW-2026-00042AA'])
    const a = parseQuoteNumber('SW-2026-00042A')
    const b = parseQuoteNumber('SW-2026-00042C')
    expect(a && b && isSameQuote(a, b)).toBe(true)
  })

  it('round-trips revision letters and their indices, each next revision one higher (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 20_000 }), (i) => {
        const letters = revisionFromIndex(i)
        expect(letters).toMatch(/^[A-Z]+$/)
        expect(revisionIndex(letters)).toBe(i)
        expect(revisionIndex(nextRevision(letters))).toBe(i + 1)
      }),
    )
  })

  it('round-trips formatted numbers through parse (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2000, max: 2999 }), fc.integer({ min: 1, max: 99_999 }), fc.integer({ min: 1, max: 800 }), (year, sequence, rev) => {
        const number = { year, sequence, revision: revisionFromIndex(rev) }
        expect(parseQuoteNumber(formatQuoteNumber(number))).toEqual(number)
      }),
    )
  })
})
