/** zod schemas for money on the wire: integer minor units, ISO 4217 codes we price in, basis points. */
import { z } from 'zod'
import { CURRENCY_CODES, isCurrencyCode, type CurrencyCode } from '../pricing/money'

/** A safe integer count of minor units (may be negative for credits). */
export const minorUnitsSchema = z.number().refine(Number.isSafeInteger, { error: 'must be a whole number of minor units' })

/** A non-negative safe integer count of minor units (prices, charges). */
export const nonNegativeMinorUnitsSchema = minorUnitsSchema.refine((v) => v >= 0, { error: 'must not be negative' })

export const currencyCodeSchema = z
  .string()
  .refine((code): code is CurrencyCode => isCurrencyCode(code), { error: `must be one of ${CURRENCY_CODES.join(', ')}` })

/** Whole basis points 0 ... 10 000 (0 % ... 100 %). */
export const basisPointsSchema = z.number().int().min(0).max(10_000)

export const moneySchema = z.strictObject({ amount: minorUnitsSchema, currency: currencyCodeSchema })
export type MoneyDto = z.infer<typeof moneySchema>
