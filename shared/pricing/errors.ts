/** Typed, field-naming errors of the pricing rules; the server maps them to 422 responses. */

export type PricingErrorCode =
  | 'below_moq'
  | 'unknown_variant'
  | 'unknown_option'
  | 'option_not_available'
  | 'duplicate_option'
  | 'length_required'
  | 'negative_amount'
  | 'not_integer'
  | 'not_positive'
  | 'amount_too_large'
  | 'invalid_date'
  | 'price_list_expired'
  | 'price_list_not_yet_valid'
  | 'currency_mismatch'
  | 'unknown_currency'
  | 'discount_limit_exceeded'
  | 'discount_over_100_percent'
  | 'breaks_not_ascending'
  | 'break_raises_price'
  | 'duplicate_variant'
  | 'duplicate_option_code'
  | 'no_lines'
  | 'place_required'
  | 'unknown_incoterm'

export interface PricingError {
  code: PricingErrorCode
  /** Path of the offending input field, e.g. `lines[2].quantity` or `priceList.validTo`. */
  field: string
  message: string
}

/** Either a value or the complete list of what was wrong with the input. */
export type PricingResult<T> = { ok: true; value: T } | { ok: false; errors: PricingError[] }

export function pricingError(code: PricingErrorCode, field: string, message: string): PricingError {
  return { code, field, message }
}

/** Checks that a count or amount is a non-negative safe integer; pushes an error naming `field` if not. */
export function checkNonNegativeInteger(value: number, field: string, errors: PricingError[]): boolean {
  if (!Number.isFinite(value) || !Number.isInteger(value)) {
    errors.push(pricingError('not_integer', field, `${field} must be a whole number of minor units or items, got ${value}`))
    return false
  }
  if (!Number.isSafeInteger(value)) {
    errors.push(pricingError('amount_too_large', field, `${field} is too large to be counted exactly (${value})`))
    return false
  }
  if (value < 0) {
    errors.push(pricingError('negative_amount', field, `${field} must not be negative, got ${value}`))
    return false
  }
  return true
}
