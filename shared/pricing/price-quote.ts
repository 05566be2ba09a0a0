/**
 * priceQuote: every amount of a quote, computed from the price list, the customer's terms and the
 * stamped copper index. The server calls this; a client never sends a price that is trusted.
 *
 * ORDER OF OPERATIONS (amounts in minor units; "round" is money.ts's half-away-from-zero rule)
 * Per line, per unit:
 *   1. breakUnitPrice      = unit price of the highest quantity break <= quantity, else the list
 *                            unit price (the break prices the whole quantity)
 *   2. discountBp          = customer discount (variant override, else account override, else
 *                            tier) + the line's sales extra discount (within the engineer's limit);
 *                            at most 10 000 bp
 *   3. discountPerUnit     = round(breakUnitPrice x discountBp / 10 000)
 *   4. discountedUnitPrice = breakUnitPrice - discountPerUnit
 *   5. optionsPerUnit      = sum of the chosen option adders (net: not discounted)
 *   6. copperPerUnit       = round(copper grams x (index - base index) / 1000), 0 when below base
 *                            unless the list gives a credit; a credit never takes the unit price
 *                            below zero
 *   7. unitNetPrice        = discountedUnitPrice + optionsPerUnit + copperPerUnit
 * Per line:
 *   8. extendedAmount      = unitNetPrice x quantity (exact, no rounding)
 * Per quote:
 *   9. subtotal            = sum of extendedAmount
 *  10. nreTotal            = sum of the one-off NRE / tooling charges (not discounted)
 *  11. total               = subtotal + nreTotal (net of taxes, which the invoice adds)
 *  12. depositAmount       = round(total x depositBp / 10 000); balanceAmount = total - deposit
 * Each step's value is kept in the result so the screen and the PDF can show the breakdown.
 */
import { copperSurchargePerUnit, type CopperSurcharge } from './copper'
import { customerDiscountFor, checkSalesDiscount, type CustomerTerms, type DiscountSource } from './discount'
import { checkNonNegativeInteger, pricingError, type PricingError, type PricingResult } from './errors'
import { isIsoDate, compareIsoDates, type IsoDate } from './iso-date'
import {
  applyBasisPoints,
  isCurrencyCode,
  MoneyArithmeticError,
  multiplyMinor,
  sumMinor,
  type CurrencyCode,
} from './money'
import {
  checkBasisPoints,
  findEntry,
  findOption,
  unitPriceForQuantity,
  validatePriceList,
  type OptionAdder,
  type OptionCategory,
  type PriceList,
  type QuantityBreak,
} from './price-list'

/** An option chosen on a line; `lengthMm` is required for lead-length (per 100 mm) options. */
export interface OptionSelection {
  code: string
  lengthMm?: number
}

export interface QuoteLineInput {
  variantId: string
  quantity: number
  /** Copper mass of one motor in kg, taken by the server from the catalogue variant. */
  copperMassKg: number
  options: OptionSelection[]
  /** Sales engineer's extra discount on this line, bp; 0 when absent. */
  extraDiscountBp?: number
}

/** A one-off charge (NRE, tooling, test fixture), in minor units of the quote currency. */
export interface NreCharge {
  description: string
  amount: number
}

/** The copper index stamped on the quote (maintained by admin, frozen at issue). */
export interface CopperIndexStamp {
  valuePerKg: number
  currency: CurrencyCode
  stampedOn: IsoDate
}

export interface QuoteInput {
  quoteDate: IsoDate
  currency: CurrencyCode
  priceList: PriceList
  customer: CustomerTerms
  copperIndex: CopperIndexStamp
  lines: QuoteLineInput[]
  nre: NreCharge[]
  /** Deposit share of the total, bp (3 000 = 30 %). */
  depositBp: number
  /** The pricing sales engineer's limit on extra discount, bp. */
  salesDiscountLimitBp: number
}

export interface PricedOption {
  code: string
  category: OptionCategory
  label: string
  lengthMm: number | null
  /** Number of started 100 mm steps beyond standard for lead-length options, else null. */
  steps: number | null
  perUnit: number
}

export interface PricedLine {
  index: number
  variantId: string
  quantity: number
  moq: number
  leadTimeDays: number
  listUnitPrice: number
  appliedBreak: QuantityBreak | null
  breakUnitPrice: number
  discountSource: DiscountSource
  customerDiscountBp: number
  extraDiscountBp: number
  discountBp: number
  discountPerUnit: number
  discountedUnitPrice: number
  options: PricedOption[]
  optionsPerUnit: number
  copper: CopperSurcharge
  /** The copper amount actually applied per unit (a credit can be capped, see step 6). */
  copperPerUnit: number
  unitNetPrice: number
  extendedAmount: number
}

export interface QuoteTotals {
  subtotal: number
  nreTotal: number
  total: number
  depositBp: number
  depositAmount: number
  balanceAmount: number
  /** For display: sum over lines of discountPerUnit x quantity. */
  discountTotal: number
  /** For display: sum over lines of copperPerUnit x quantity (negative when a credit). */
  copperTotal: number
}

export interface PricedQuote {
  currency: CurrencyCode
  quoteDate: IsoDate
  priceListId: string
  copperIndex: CopperIndexStamp
  baseCopperIndexPerKg: number
  lines: PricedLine[]
  nre: NreCharge[]
  totals: QuoteTotals
  /** The longest lead time over the lines, in days. */
  leadTimeDays: number
}

/** Prices a quote, or returns every validation error found (fields named like `lines[0].quantity`). */
export function priceQuote(input: QuoteInput): PricingResult<PricedQuote> {
  const errors = validateQuoteInput(input)
  if (errors.length > 0) return { ok: false, errors }
  try {
    return { ok: true, value: computeQuote(input) }
  } catch (error) {
    if (error instanceof MoneyArithmeticError) {
      return { ok: false, errors: [pricingError('amount_too_large', 'lines', `the quote's amounts exceed what can be counted exactly: ${error.message}`)] }
    }
    throw error
  }
}

/** All input checks of {@link priceQuote}; empty when the quote can be priced. */
export function validateQuoteInput(input: QuoteInput): PricingError[] {
  const errors: PricingError[] = []
  const { priceList } = input
  errors.push(...validatePriceList(priceList))

  if (!isCurrencyCode(input.currency)) errors.push(pricingError('unknown_currency', 'currency', `unknown currency ${String(input.currency)}`))
  else {
    if (priceList.currency !== input.currency) {
      errors.push(pricingError('currency_mismatch', 'priceList.currency', `price list is in ${priceList.currency}, the quote in ${input.currency}`))
    }
    if (input.copperIndex.currency !== input.currency) {
      errors.push(pricingError('currency_mismatch', 'copperIndex.currency', `copper index is in ${input.copperIndex.currency}, the quote in ${input.currency}`))
    }
  }
  checkNonNegativeInteger(input.copperIndex.valuePerKg, 'copperIndex.valuePerKg', errors)
  if (!isIsoDate(input.copperIndex.stampedOn)) errors.push(pricingError('invalid_date', 'copperIndex.stampedOn', 'stampedOn must be YYYY-MM-DD'))

  if (!isIsoDate(input.quoteDate)) errors.push(pricingError('invalid_date', 'quoteDate', `quoteDate must be YYYY-MM-DD, got ${input.quoteDate}`))
  else {
    if (isIsoDate(priceList.validFrom) && compareIsoDates(input.quoteDate, priceList.validFrom) < 0) {
      errors.push(pricingError('price_list_not_yet_valid', 'priceList.validFrom', `price list ${priceList.id} applies from ${priceList.validFrom}`))
    }
    if (priceList.validTo !== null && isIsoDate(priceList.validTo) && compareIsoDates(input.quoteDate, priceList.validTo) > 0) {
      errors.push(pricingError('price_list_expired', 'priceList.validTo', `price list ${priceList.id} expired after ${priceList.validTo}`))
    }
  }

  input.customer.overrides.forEach((o, i) => checkBasisPoints(o.discountBp, `customer.overrides[${i}].discountBp`, errors))
  checkBasisPoints(input.depositBp, 'depositBp', errors)
  checkBasisPoints(input.salesDiscountLimitBp, 'salesDiscountLimitBp', errors)
  input.nre.forEach((charge, i) => checkNonNegativeInteger(charge.amount, `nre[${i}].amount`, errors))

  if (input.lines.length === 0) errors.push(pricingError('no_lines', 'lines', 'a quote needs at least one line'))
  input.lines.forEach((line, i) => validateLine(input, line, `lines[${i}]`, errors))
  return errors
}

function validateLine(input: QuoteInput, line: QuoteLineInput, f: string, errors: PricingError[]): void {
  const entry = findEntry(input.priceList, line.variantId)
  if (!entry) errors.push(pricingError('unknown_variant', `${f}.variantId`, `variant ${line.variantId} is not on price list ${input.priceList.id}`))
  if (checkNonNegativeInteger(line.quantity, `${f}.quantity`, errors)) {
    if (line.quantity < 1) errors.push(pricingError('not_positive', `${f}.quantity`, 'quantity must be at least 1'))
    else if (entry && line.quantity < entry.moq) {
      errors.push(pricingError('below_moq', `${f}.quantity`, `quantity ${line.quantity} is below the MOQ of ${entry.moq} for ${line.variantId}`))
    }
  }
  if (!Number.isFinite(line.copperMassKg)) errors.push(pricingError('not_integer', `${f}.copperMassKg`, 'copper mass must be a number'))
  else if (line.copperMassKg < 0) errors.push(pricingError('negative_amount', `${f}.copperMassKg`, 'copper mass must not be negative'))

  const seen = new Set<string>()
  line.options.forEach((sel, j) => {
    const of = `${f}.options[${j}]`
    const option = findOption(input.priceList, sel.code)
    if (!option) {
      errors.push(pricingError('unknown_option', `${of}.code`, `option ${sel.code} is not on price list ${input.priceList.id}`))
      return
    }
    if (seen.has(sel.code)) errors.push(pricingError('duplicate_option', `${of}.code`, `option ${sel.code} is chosen twice`))
    seen.add(sel.code)
    if (option.variantIds !== undefined && !option.variantIds.includes(line.variantId)) {
      errors.push(pricingError('option_not_available', `${of}.code`, `option ${sel.code} is not offered on ${line.variantId}`))
    }
    if (option.pricing === 'per_100mm') {
      if (sel.lengthMm === undefined) errors.push(pricingError('length_required', `${of}.lengthMm`, `option ${sel.code} needs a lead length in mm`))
      else checkNonNegativeInteger(sel.lengthMm, `${of}.lengthMm`, errors)
    }
  })

  const extra = line.extraDiscountBp ?? 0
  const sales = checkSalesDiscount(extra, input.salesDiscountLimitBp, `${f}.extraDiscountBp`)
  if (!sales.ok) errors.push(...sales.errors)
  else if (entry) {
    const customer = customerDiscountFor(input.customer, input.priceList, line.variantId)
    if (customer.discountBp + extra > 10_000) {
      errors.push(pricingError('discount_over_100_percent', `${f}.extraDiscountBp`, 'customer and extra discount together exceed 100 %'))
    }
  }
}

/** Per-unit amount of one chosen option (validated input). */
export function optionAdderPerUnit(option: OptionAdder, lengthMm: number | undefined): { perUnit: number; steps: number | null } {
  if (option.pricing === 'fixed') return { perUnit: option.amountPerUnit, steps: null }
  const extraMm = Math.max(0, (lengthMm ?? option.standardLengthMm) - option.standardLengthMm)
  const steps = Math.ceil(extraMm / 100)
  return { perUnit: multiplyMinor(option.amountPer100mm, steps), steps }
}

function computeQuote(input: QuoteInput): PricedQuote {
  const { priceList } = input
  const lines = input.lines.map((line, index): PricedLine => {
    const entry = findEntry(priceList, line.variantId)
    if (!entry) throw new Error(`unvalidated variant ${line.variantId}`)
    // 1
    const { unitPrice: breakUnitPrice, appliedBreak } = unitPriceForQuantity(entry, line.quantity)
    // 2-4
    const customer = customerDiscountFor(input.customer, priceList, line.variantId)
    const extraDiscountBp = line.extraDiscountBp ?? 0
    const discountBp = customer.discountBp + extraDiscountBp
    const discountPerUnit = applyBasisPoints(breakUnitPrice, discountBp)
    const discountedUnitPrice = breakUnitPrice - discountPerUnit
    // 5
    const options = line.options.map((sel): PricedOption => {
      const option = findOption(priceList, sel.code)
      if (!option) throw new Error(`unvalidated option ${sel.code}`)
      const { perUnit, steps } = optionAdderPerUnit(option, sel.lengthMm)
      return { code: option.code, category: option.category, label: option.label, lengthMm: sel.lengthMm ?? null, steps, perUnit }
    })
    const optionsPerUnit = sumMinor(options.map((o) => o.perUnit))
    // 6
    const copper = copperSurchargePerUnit({
      copperMassKg: line.copperMassKg,
      indexPerKg: input.copperIndex.valuePerKg,
      baseIndexPerKg: priceList.baseCopperIndexPerKg,
      creditBelowBase: priceList.copperCreditBelowBase,
    })
    const beforeCopper = discountedUnitPrice + optionsPerUnit
    // `0 - x` rather than `-x` so a zero floor is +0, not -0.
    const copperPerUnit = Math.max(copper.perUnit, 0 - beforeCopper)
    // 7-8
    const unitNetPrice = sumMinor([beforeCopper, copperPerUnit])
    const extendedAmount = multiplyMinor(unitNetPrice, line.quantity)
    return {
      index,
      variantId: line.variantId,
      quantity: line.quantity,
      moq: entry.moq,
      leadTimeDays: entry.leadTimeDays,
      listUnitPrice: entry.unitPrice,
      appliedBreak,
      breakUnitPrice,
      discountSource: customer.source,
      customerDiscountBp: customer.discountBp,
      extraDiscountBp,
      discountBp,
      discountPerUnit,
      discountedUnitPrice,
      options,
      optionsPerUnit,
      copper,
      copperPerUnit,
      unitNetPrice,
      extendedAmount,
    }
  })
  // 9-12
  const subtotal = sumMinor(lines.map((l) => l.extendedAmount))
  const nreTotal = sumMinor(input.nre.map((c) => c.amount))
  const total = sumMinor([subtotal, nreTotal])
  const depositAmount = applyBasisPoints(total, input.depositBp)
  return {
    currency: input.currency,
    quoteDate: input.quoteDate,
    priceListId: priceList.id,
    copperIndex: input.copperIndex,
    baseCopperIndexPerKg: priceList.baseCopperIndexPerKg,
    lines,
    nre: input.nre,
    totals: {
      subtotal,
      nreTotal,
      total,
      depositBp: input.depositBp,
      depositAmount,
      balanceAmount: total - depositAmount,
      discountTotal: sumMinor(lines.map((l) => multiplyMinor(l.discountPerUnit, l.quantity))),
      copperTotal: sumMinor(lines.map((l) => multiplyMinor(l.copperPerUnit, l.quantity))),
    },
    leadTimeDays: Math.max(0, ...lines.map((l) => l.leadTimeDays)),
  }
}
