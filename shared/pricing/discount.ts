/**
 * Customer discounts: a tier discount from the price list, per-account overrides that replace it,
 * and a sales engineer's extra discount bounded by their limit. All in basis points (1 bp = 0.01 %).
 */
import { pricingError, type PricingError, type PricingResult } from './errors'
import type { CustomerTier, PriceList } from './price-list'

/**
 * An account's negotiated discount. With `variantId` it applies to that variant only; without,
 * to the whole account. It replaces the tier discount; it is not added to it.
 */
export interface DiscountOverride {
  variantId?: string
  discountBp: number
}

export interface CustomerTerms {
  accountId: string
  tier: CustomerTier
  overrides: DiscountOverride[]
}

export type DiscountSource = 'variant_override' | 'account_override' | 'tier'

export interface CustomerDiscount {
  discountBp: number
  source: DiscountSource
}

/** Precedence: a variant override, else a whole-account override, else the tier discount. */
export function customerDiscountFor(terms: CustomerTerms, priceList: PriceList, variantId: string): CustomerDiscount {
  const variantOverride = terms.overrides.find((o) => o.variantId === variantId)
  if (variantOverride) return { discountBp: variantOverride.discountBp, source: 'variant_override' }
  const accountOverride = terms.overrides.find((o) => o.variantId === undefined)
  if (accountOverride) return { discountBp: accountOverride.discountBp, source: 'account_override' }
  return { discountBp: priceList.tierDiscountBp[terms.tier], source: 'tier' }
}

/**
 * Checks a sales engineer's extra discount against their limit. An extra discount above the limit
 * is refused with `discount_limit_exceeded` (a manager with a higher limit must give it).
 */
export function checkSalesDiscount(extraDiscountBp: number, limitBp: number, field = 'extraDiscountBp'): PricingResult<number> {
  const errors: PricingError[] = []
  if (!Number.isSafeInteger(extraDiscountBp)) errors.push(pricingError('not_integer', field, 'the extra discount must be whole basis points'))
  else if (extraDiscountBp < 0) errors.push(pricingError('negative_amount', field, 'the extra discount must not be negative'))
  else if (extraDiscountBp > limitBp) {
    errors.push(pricingError('discount_limit_exceeded', field, `extra discount ${extraDiscountBp} bp exceeds the sales limit of ${limitBp} bp`))
  }
  return errors.length > 0 ? { ok: false, errors } : { ok: true, value: extraDiscountBp }
}
