/** Price lists: per-variant list prices with quantity breaks, MOQ, lead time and option adders. */
import { checkNonNegativeInteger, pricingError, type PricingError } from './errors'
import { isIsoDate, compareIsoDates, type IsoDate } from './iso-date'
import { isCurrencyCode, type CurrencyCode } from './money'

/** Customer tiers that carry a list discount. */
export const CUSTOMER_TIERS = ['oem_contract', 'distributor'] as const
export type CustomerTier = (typeof CUSTOMER_TIERS)[number]

/**
 * From `minQuantity` units upwards the whole quantity is priced at `unitPrice` (not only the units
 * above the threshold): 1 000 pieces at a 1 000 break are all at the break price.
 */
export interface QuantityBreak {
  minQuantity: number
  /** Minor units per unit. */
  unitPrice: number
}

export interface PriceListEntry {
  variantId: string
  /** List price per unit (minor units) for any quantity below the first break. */
  unitPrice: number
  /** Thresholds strictly ascending, each price at most the one before it. */
  breaks: QuantityBreak[]
  /** Minimum order quantity (units); at least 1. */
  moq: number
  /** Lead time to ship a first lot, in calendar days. */
  leadTimeDays: number
}

export const OPTION_CATEGORIES = ['rotation', 'lead_length', 'connector', 'capacitor', 'bracket'] as const
export type OptionCategory = (typeof OPTION_CATEGORIES)[number]

/** Option adders are net amounts per unit: tier and sales discounts do not apply to them. */
export type OptionAdder = {
  code: string
  category: OptionCategory
  label: string
  /** Variants the option is offered on; absent means every variant of the list. */
  variantIds?: string[]
} & (
  | { pricing: 'fixed'; amountPerUnit: number }
  | {
      /**
       * Lead length: every started 100 mm beyond the standard length adds `amountPer100mm` per
       * unit (350 mm over a 300 mm standard = 1 step; 401 mm = 2 steps).
       */
      pricing: 'per_100mm'
      amountPer100mm: number
      standardLengthMm: number
    }
)

export interface PriceList {
  id: string
  currency: CurrencyCode
  validFrom: IsoDate
  /** Last day the list applies (inclusive); null for open-ended. */
  validTo: IsoDate | null
  /** Copper index the list prices were set at, in minor units of `currency` per kg. */
  baseCopperIndexPerKg: number
  /**
   * false (default practice here): the copper adjustment is a surcharge only, never below zero.
   * true: a falling index gives the buyer a credit (negative surcharge) too.
   */
  copperCreditBelowBase: boolean
  tierDiscountBp: Record<CustomerTier, number>
  entries: PriceListEntry[]
  options: OptionAdder[]
}

/** Unit price for `quantity`: the price of the highest break at or below it, else the list price. */
export function unitPriceForQuantity(entry: PriceListEntry, quantity: number): { unitPrice: number; appliedBreak: QuantityBreak | null } {
  let applied: QuantityBreak | null = null
  for (const b of entry.breaks) {
    if (quantity >= b.minQuantity && (applied === null || b.minQuantity > applied.minQuantity)) applied = b
  }
  return { unitPrice: applied?.unitPrice ?? entry.unitPrice, appliedBreak: applied }
}

export function findEntry(list: PriceList, variantId: string): PriceListEntry | undefined {
  return list.entries.find((e) => e.variantId === variantId)
}

export function findOption(list: PriceList, code: string): OptionAdder | undefined {
  return list.options.find((o) => o.code === code)
}

/** Checks a price list's own consistency (for admin import and before pricing). Empty when fine. */
export function validatePriceList(list: PriceList, field = 'priceList'): PricingError[] {
  const errors: PricingError[] = []
  if (!isCurrencyCode(list.currency)) errors.push(pricingError('unknown_currency', `${field}.currency`, `unknown currency ${String(list.currency)}`))
  if (!isIsoDate(list.validFrom)) errors.push(pricingError('invalid_date', `${field}.validFrom`, `validFrom must be YYYY-MM-DD, got ${list.validFrom}`))
  if (list.validTo !== null && !isIsoDate(list.validTo)) errors.push(pricingError('invalid_date', `${field}.validTo`, `validTo must be YYYY-MM-DD, got ${list.validTo}`))
  if (list.validTo !== null && isIsoDate(list.validFrom) && isIsoDate(list.validTo) && compareIsoDates(list.validTo, list.validFrom) < 0) {
    errors.push(pricingError('invalid_date', `${field}.validTo`, 'validTo is before validFrom'))
  }
  checkNonNegativeInteger(list.baseCopperIndexPerKg, `${field}.baseCopperIndexPerKg`, errors)
  for (const tier of CUSTOMER_TIERS) checkBasisPoints(list.tierDiscountBp[tier], `${field}.tierDiscountBp.${tier}`, errors)

  const seenVariants = new Set<string>()
  list.entries.forEach((entry, i) => {
    const f = `${field}.entries[${i}]`
    if (seenVariants.has(entry.variantId)) errors.push(pricingError('duplicate_variant', `${f}.variantId`, `variant ${entry.variantId} is listed twice`))
    seenVariants.add(entry.variantId)
    checkNonNegativeInteger(entry.unitPrice, `${f}.unitPrice`, errors)
    checkNonNegativeInteger(entry.leadTimeDays, `${f}.leadTimeDays`, errors)
    if (checkNonNegativeInteger(entry.moq, `${f}.moq`, errors) && entry.moq < 1) {
      errors.push(pricingError('not_positive', `${f}.moq`, 'MOQ must be at least 1'))
    }
    let previous: QuantityBreak = { minQuantity: 1, unitPrice: entry.unitPrice }
    entry.breaks.forEach((b, j) => {
      const bf = `${f}.breaks[${j}]`
      const okQty = checkNonNegativeInteger(b.minQuantity, `${bf}.minQuantity`, errors)
      const okPrice = checkNonNegativeInteger(b.unitPrice, `${bf}.unitPrice`, errors)
      if (okQty && b.minQuantity <= previous.minQuantity) {
        errors.push(pricingError('breaks_not_ascending', `${bf}.minQuantity`, `break thresholds must rise strictly above ${previous.minQuantity}`))
      }
      if (okPrice && b.unitPrice > previous.unitPrice) {
        errors.push(pricingError('break_raises_price', `${bf}.unitPrice`, 'a quantity break must not raise the unit price'))
      }
      previous = b
    })
  })

  const seenOptions = new Set<string>()
  list.options.forEach((option, i) => {
    const f = `${field}.options[${i}]`
    if (seenOptions.has(option.code)) errors.push(pricingError('duplicate_option_code', `${f}.code`, `option ${option.code} is listed twice`))
    seenOptions.add(option.code)
    if (option.pricing === 'fixed') checkNonNegativeInteger(option.amountPerUnit, `${f}.amountPerUnit`, errors)
    else {
      checkNonNegativeInteger(option.amountPer100mm, `${f}.amountPer100mm`, errors)
      checkNonNegativeInteger(option.standardLengthMm, `${f}.standardLengthMm`, errors)
    }
  })
  return errors
}

/** Basis points must be an integer 0 ... 10 000. */
export function checkBasisPoints(value: number, field: string, errors: PricingError[]): boolean {
  if (!checkNonNegativeInteger(value, field, errors)) return false
  if (value > 10_000) {
    errors.push(pricingError('discount_over_100_percent', field, `${field} is more than 100 % (${value} bp)`))
    return false
  }
  return true
}
