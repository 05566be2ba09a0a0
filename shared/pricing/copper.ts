/**
 * Copper surcharge per unit = copper mass (kg) x (stamped index - price list base index), with the
 * index in minor units of the quote currency per kg. Common practice for wound products (motors,
 * transformers, cable): list prices are set at a base copper price and adjusted by the index.
 *
 * Rules chosen here:
 * - The mass is taken to the nearest gram (1 g of copper moves a price by far less than a minor
 *   unit at any sane index), so the arithmetic is exact in integers: grams x index / 1000.
 * - The result is rounded once per unit (half away from zero, see money.ts) and then multiplied
 *   by the quantity, so a buyer can check "per unit x quantity" on the PDF.
 * - Below the base index the adjustment is zero unless the price list says
 *   `copperCreditBelowBase`, in which case it is a credit (negative amount). Default off: a
 *   price-protected list where the maker carries the downside is the more usual practice.
 */
import { divideRounded, toSafeNumber } from './money'

export interface CopperSurcharge {
  copperMassKg: number
  /** The mass actually used, in whole grams. */
  copperMassGrams: number
  indexPerKg: number
  baseIndexPerKg: number
  /** index - base, per kg (may be negative). */
  deltaPerKg: number
  /** Minor units per unit; negative only when a credit is allowed. */
  perUnit: number
  /** True when the index was below base but the list gives no credit, so the surcharge was held at 0. */
  floored: boolean
}

export function copperMassGrams(copperMassKg: number): number {
  return Math.round(copperMassKg * 1000)
}

export function copperSurchargePerUnit(input: {
  copperMassKg: number
  indexPerKg: number
  baseIndexPerKg: number
  creditBelowBase: boolean
}): CopperSurcharge {
  const grams = copperMassGrams(input.copperMassKg)
  const delta = input.indexPerKg - input.baseIndexPerKg
  const raw = toSafeNumber(divideRounded(BigInt(grams) * BigInt(delta), 1000n), 'copper surcharge')
  const floored = raw < 0 && !input.creditBelowBase
  return {
    copperMassKg: input.copperMassKg,
    copperMassGrams: grams,
    indexPerKg: input.indexPerKg,
    baseIndexPerKg: input.baseIndexPerKg,
    deltaPerKg: delta,
    perUnit: floored ? 0 : raw,
    floored,
  }
}
