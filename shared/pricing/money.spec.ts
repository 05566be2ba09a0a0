import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import {
  applyBasisPoints,
  assertMinorUnits,
  CURRENCY_CODES,
  divideRounded,
  formatBasisPoints,
  formatMoney,
  minorUnitExponent,
  multiplyMinor,
  sumMinor,
  toDecimalString,
} from './money'

describe('divideRounded (half away from zero)', () => {
  it.each([
    [-3n, 2n, -2n], // -1.5 -> -2
    [-5n, 2n, -3n], // -2.5 -> -3
    [3n, 2n, 2n], // 1.5 -> 2 (banker's would also give 2)
    [5n, 2n, 3n], // 2.5 -> 3 (banker's would give 2)
    [1n, 2n, 1n], // 0.5 -> 1 (banker's would give 0)
    [-1n, 2n, -1n],
    [1n, 3n, 0n],
    [2n, 3n, 1n],
    [7n, 4n, 2n], // 1.75
    [-7n, 4n, -2n],
    [4999n, 10_000n, 0n], // 0.4999 stays down
    [5000n, 10_000n, 1n], // 0.5000 goes up
    [0n, 7n, 0n],
    [5n, -2n, -3n],
  ])('%d / %d rounds to %d', (n, d, expected) => {
    expect(divideRounded(n, d)).toBe(expected)
  })

  it('is within half a unit of the exact quotient and ties go away from zero (property)', () => {
    fc.assert(
      fc.property(fc.bigInt({ min: -(10n ** 20n), max: 10n ** 20n }), fc.bigInt({ min: 1n, max: 10n ** 9n }), (n, d) => {
        const q = divideRounded(n, d)
        const error2 = 2n * (q * d - n) // twice the error, times d
        expect(error2 <= d && error2 >= -d).toBe(true)
        if (error2 === d || error2 === -d) expect(q < 0n ? q * d < n : q * d > n).toBe(true)
        expect(divideRounded(-n, d)).toBe(-q)
      }),
    )
  })

  it('refuses division by zero', () => {
    expect(() => divideRounded(1n, 0n)).toThrow(/division by zero/)
  })
})

describe('applyBasisPoints', () => {
  it('takes 8 % of USD 10.45 as 84 cents (83.6 rounded)', () => {
    expect(applyBasisPoints(1045, 800)).toBe(84)
  })
  it('takes 5 % of 12.50 as 63 cents: 62.5 is a tie and goes up', () => {
    expect(applyBasisPoints(1250, 500)).toBe(63)
  })
  it('refuses a fractional amount', () => {
    expect(() => applyBasisPoints(10.5, 100)).toThrow(/safe integer/)
  })
})

describe('safe-integer arithmetic', () => {
  it('multiplies a large quantity exactly when the product is safe', () => {
    expect(multiplyMinor(3390, 2_000_000_000)).toBe(6_780_000_000_000)
  })
  it('throws when a product leaves the safe-integer range', () => {
    expect(() => multiplyMinor(1000, Number.MAX_SAFE_INTEGER)).toThrow(/safe-integer/)
  })
  it('sums exactly and rejects unsafe sums', () => {
    expect(sumMinor([1, 2, 3])).toBe(6)
    expect(() => sumMinor([Number.MAX_SAFE_INTEGER, 1])).toThrow(/safe-integer/)
  })
  it('assertMinorUnits rejects fractions, NaN and Infinity', () => {
    for (const v of [0.1, Number.NaN, Number.POSITIVE_INFINITY, 2 ** 53]) expect(() => assertMinorUnits(v)).toThrow()
    expect(assertMinorUnits(-42)).toBe(-42)
  })
})

describe('currencies', () => {
  // Source: ISO 4217 minor-unit column (from memory); cross-checked against the runtime's CLDR data.
  it.each([
    ['USD', 2],
    ['EUR', 2],
    ['GBP', 2],
    ['JPY', 0],
    ['KRW', 0],
    ['KWD', 3],
  ] as const)('%s has %d decimals', (code, exponent) => {
    expect(minorUnitExponent(code)).toBe(exponent)
  })

  it('agrees with Intl (CLDR) on the fraction digits of every listed currency', () => {
    for (const code of CURRENCY_CODES) {
      const digits = new Intl.NumberFormat('en', { style: 'currency', currency: code }).resolvedOptions().maximumFractionDigits
      expect(digits, code).toBe(minorUnitExponent(code))
    }
  })
})

describe('display helpers', () => {
  it.each([
    [2_084_000, 'USD', '20840.00'],
    [5, 'USD', '0.05'],
    [-50, 'GBP', '-0.50'],
    [1_158_000, 'JPY', '1158000'],
    [1234, 'KWD', '1.234'],
    [Number.MAX_SAFE_INTEGER, 'USD', '90071992547409.91'],
  ] as const)('toDecimalString(%d, %s) is %s', (minor, code, text) => {
    expect(toDecimalString(minor, code)).toBe(text)
  })

  it('round-trips every safe amount through its decimal string without loss (property)', () => {
    fc.assert(
      fc.property(fc.maxSafeInteger(), fc.constantFrom(...CURRENCY_CODES), (minor, code) => {
        expect(BigInt(toDecimalString(minor, code).replace('.', ''))).toBe(BigInt(minor))
      }),
    )
  })

  it('formats with the currency symbol and its own decimals', () => {
    expect(formatMoney(2_084_000, 'USD', 'en-US')).toBe('$20,840.00')
    expect(formatMoney(1_158_000, 'JPY', 'en-US')).toBe('¥1,158,000')
    expect(formatMoney(-50, 'GBP', 'en-GB')).toBe('-£0.50')
    expect(formatMoney(123_450, 'EUR', 'de-DE').replace(/\s/g, ' ')).toBe('1.234,50 €')
  })

  it('keeps cents exact for amounts a float would blur', () => {
    expect(formatMoney(900_719_925_474_099, 'USD', 'en-US')).toBe('$9,007,199,254,740.99')
  })

  it('formats basis points as a percentage', () => {
    expect(formatBasisPoints(1250, 'en-GB')).toBe('12.5%')
    expect(formatBasisPoints(800, 'en-GB')).toBe('8%')
  })
})
