/**
 * Money as integer minor units (cents, pence, yen ...) and the one rounding rule of Spinwright.
 *
 * Every amount in pricing is a JavaScript number that is a safe integer count of the currency's
 * minor unit. Fractions of a minor unit only exist inside {@link divideRounded}, which does the
 * arithmetic exactly in bigint and rounds once.
 *
 * ROUNDING RULE (the only one): half away from zero.
 *   An exact quotient is rounded to the nearest integer; a tie (exactly .5 of a minor unit) goes
 *   away from zero: 2.5 -> 3, -2.5 -> -3, 2.4999 -> 2.
 * Why this rule and not banker's rounding: quote amounts are rounded once per unit price or per
 * charge and then multiplied, not summed over millions of postings, so the statistical bias that
 * half-even removes does not accumulate here; half away from zero is what a buyer gets from a
 * calculator or a spreadsheet ROUND(), so every figure on the quote PDF can be checked by hand.
 * It is also the rule of the euro conversion regulation (Council Regulation (EC) No 1103/97,
 * art. 5, "rounded up" at the half; from memory).
 */

/** ISO 4217 alphabetic code of a currency Spinwright can price in. */
export type CurrencyCode = keyof typeof CURRENCY_EXPONENTS

/**
 * Minor-unit exponent per currency, from the ISO 4217 list (from memory, cross-checked in the
 * spec against the runtime's CLDR data where CLDR agrees with ISO).
 */
export const CURRENCY_EXPONENTS = {
  USD: 2,
  EUR: 2,
  GBP: 2,
  CHF: 2,
  CAD: 2,
  AUD: 2,
  NZD: 2,
  SEK: 2,
  NOK: 2,
  DKK: 2,
  PLN: 2,
  CZK: 2,
  CNY: 2,
  INR: 2,
  MXN: 2,
  BRL: 2,
  ZAR: 2,
  SGD: 2,
  HKD: 2,
  TRY: 2,
  JPY: 0,
  KRW: 0,
  VND: 0,
  KWD: 3,
  BHD: 3,
  OMR: 3,
  JOD: 3,
  TND: 3,
} as const satisfies Record<string, 0 | 2 | 3>

export function isCurrencyCode(code: string): code is CurrencyCode {
  return Object.hasOwn(CURRENCY_EXPONENTS, code)
}

/** Every supported currency code, in table order. */
export const CURRENCY_CODES: readonly CurrencyCode[] = Object.keys(CURRENCY_EXPONENTS).filter(isCurrencyCode)

/** Number of decimal places of the currency's minor unit (USD 2, JPY 0, KWD 3). */
export function minorUnitExponent(currency: CurrencyCode): number {
  return CURRENCY_EXPONENTS[currency]
}

/** Thrown only for programming errors (an amount that is not a safe integer reached arithmetic). */
export class MoneyArithmeticError extends Error {
  override readonly name = 'MoneyArithmeticError'
}

/** Asserts that `value` is a safe integer count of minor units; returns it for chaining. */
export function assertMinorUnits(value: number, what = 'amount'): number {
  if (!Number.isSafeInteger(value)) {
    throw new MoneyArithmeticError(`${what} must be a safe integer number of minor units, got ${value}`)
  }
  return value
}

/** Converts a bigint result back to a number, refusing anything outside the safe-integer range. */
export function toSafeNumber(value: bigint, what = 'amount'): number {
  if (value > BigInt(Number.MAX_SAFE_INTEGER) || value < BigInt(Number.MIN_SAFE_INTEGER)) {
    throw new MoneyArithmeticError(`${what} ${value} is outside the safe-integer range`)
  }
  return Number(value)
}

/**
 * numerator / denominator rounded by the rule above (half away from zero), exactly, in bigint.
 * This is the only place in pricing where a fraction of a minor unit is rounded.
 */
export function divideRounded(numerator: bigint, denominator: bigint): bigint {
  if (denominator === 0n) throw new MoneyArithmeticError('division by zero')
  const negative = numerator < 0n !== denominator < 0n
  const n = numerator < 0n ? -numerator : numerator
  const d = denominator < 0n ? -denominator : denominator
  const quotient = n / d
  const remainder = n % d
  // Tie or more than half: step away from zero. 2 * r >= d compares without a fraction.
  const magnitude = 2n * remainder >= d ? quotient + 1n : quotient
  return negative ? -magnitude : magnitude
}

/** Basis points: 1 bp = 0.01 %, 10 000 bp = 100 %. */
export const BASIS_POINTS_PER_WHOLE = 10_000

/** amount x bp / 10 000, rounded once (half away from zero). */
export function applyBasisPoints(amount: number, basisPoints: number): number {
  assertMinorUnits(amount)
  if (!Number.isSafeInteger(basisPoints)) throw new MoneyArithmeticError(`basis points must be an integer, got ${basisPoints}`)
  return toSafeNumber(divideRounded(BigInt(amount) * BigInt(basisPoints), BigInt(BASIS_POINTS_PER_WHOLE)))
}

/** amount x quantity, exact; throws when the product leaves the safe-integer range. */
export function multiplyMinor(amount: number, quantity: number): number {
  assertMinorUnits(amount)
  assertMinorUnits(quantity, 'quantity')
  return toSafeNumber(BigInt(amount) * BigInt(quantity), 'extended amount')
}

/** Sum of minor-unit amounts, exact; throws when the sum leaves the safe-integer range. */
export function sumMinor(amounts: readonly number[]): number {
  let total = 0n
  for (const a of amounts) total += BigInt(assertMinorUnits(a))
  return toSafeNumber(total, 'sum')
}

/**
 * Minor units as an exact decimal string in major units ("1234.50" for 123450 USD, "1500" for
 * 1500 JPY). For display and export only: never parse it back into arithmetic.
 */
export function toDecimalString(minor: number, currency: CurrencyCode): string {
  assertMinorUnits(minor)
  const exponent = minorUnitExponent(currency)
  const digits = Math.abs(minor).toString()
  const sign = minor < 0 ? '-' : ''
  if (exponent === 0) return sign + digits
  const padded = digits.padStart(exponent + 1, '0')
  return `${sign}${padded.slice(0, -exponent)}.${padded.slice(-exponent)}`
}

/**
 * Formats minor units for people with Intl.NumberFormat (exact: the decimal string is handed to
 * Intl, never a float). Display only; the result never feeds back into arithmetic.
 */
export function formatMoney(minor: number, currency: CurrencyCode, locale = 'en-GB'): string {
  const exponent = minorUnitExponent(currency)
  const formatter = new Intl.NumberFormat(locale, {
    style: 'currency',
    currency,
    minimumFractionDigits: exponent,
    maximumFractionDigits: exponent,
  })
  const decimal = toDecimalString(minor, currency)
  return formatter.format(asNumericLiteral(decimal))
}

/** Formats basis points as a percentage for display ("12.5 %" style per locale). */
export function formatBasisPoints(basisPoints: number, locale = 'en-GB'): string {
  const formatter = new Intl.NumberFormat(locale, { style: 'percent', minimumFractionDigits: 0, maximumFractionDigits: 2 })
  return formatter.format(asNumericLiteral(toDecimalStringScaled(basisPoints, 4)))
}

function toDecimalStringScaled(value: number, exponent: number): string {
  const digits = Math.abs(value).toString().padStart(exponent + 1, '0')
  return `${value < 0 ? '-' : ''}${digits.slice(0, -exponent)}.${digits.slice(-exponent)}`
}

function isPlainDecimal(text: string): text is `${number}` {
  return /^-?\d+(\.\d+)?$/.test(text)
}

function asNumericLiteral(decimal: string): Intl.StringNumericLiteral {
  if (!isPlainDecimal(decimal)) throw new MoneyArithmeticError(`not a plain decimal: ${decimal}`)
  return decimal
}
