/**
 * Worked cases of priceQuote that a reader can redo by hand. Prices, masses and indices are
 * invented (Ashcombe demo data); the arithmetic rules are ours (price-quote.ts, money.ts) and the
 * trade conventions they follow (whole-quantity breaks, copper surcharge against a base index,
 * deposits as a share of the order value) are common practice.
 */
import { describe, expect, it } from 'vitest'
import { priceQuote, type PricedQuote, type QuoteInput } from './price-quote'
import { baseQuote, jpyList2026, larkspurOem, quillonDistributor, usdList2026 } from './test-fixtures'
import type { PricingError, PricingResult } from './errors'

function priced(input: QuoteInput): PricedQuote {
  const result = priceQuote(input)
  if (!result.ok) throw new Error(`expected a priced quote, got ${JSON.stringify(result.errors)}`)
  return result.value
}

function errorsOf(result: PricingResult<unknown>): PricingError[] {
  if (result.ok) throw new Error('expected errors, got a priced quote')
  return result.errors
}

function firstLine(q: PricedQuote) {
  const line = q.lines[0]
  if (!line) throw new Error('no line')
  return line
}

describe('priceQuote: a two-line OEM quote worked by hand', () => {
  // Line 1: SP-Q16 x 2000, break 2000 -> 10.45; OEM 8 % = 83.6 -> 84 c; 961 c.
  //   options: CW rotation 35 c + lead 450 mm (150 mm over 300 mm = 2 started 100 mm x 18 c = 36 c) = 71 c
  //   copper: 85 g x (10.70 - 9.50 USD/kg) = 85 x 120 / 1000 = 10.2 -> 10 c
  //   unit net 961 + 71 + 10 = 1042 c; extended 1042 x 2000 = 2 084 000 c (USD 20 840.00)
  // Line 2: PSC-4P x 1000, break 1000 -> 33.90; 8 % = 271.2 -> 271 c; 3119 c.
  //   options: capacitor 95 c + bracket 60 c = 155 c; copper 210 g x 120 / 1000 = 25.2 -> 25 c
  //   unit net 3119 + 155 + 25 = 3299 c; extended 3 299 000 c
  // Subtotal 5 383 000; NRE 250 000 (lead-dress tooling); total 5 633 000; deposit 30 % = 1 689 900.
  const quote = priced(
    baseQuote({
      lines: [
        { variantId: 'SP-Q16-230-50', quantity: 2000, copperMassKg: 0.085, options: [{ code: 'ROT-CW' }, { code: 'LEAD', lengthMm: 450 }] },
        { variantId: 'PSC-4P-120-60', quantity: 1000, copperMassKg: 0.21, options: [{ code: 'CAP-5UF' }, { code: 'BRKT-3' }] },
      ],
      nre: [{ description: 'Lead-dress tooling', amount: 250_000 }],
    }),
  )
  const [a, b] = quote.lines

  it('keeps every step of line 1', () => {
    expect(a).toMatchObject({
      breakUnitPrice: 1045,
      appliedBreak: { minQuantity: 2000, unitPrice: 1045 },
      discountSource: 'tier',
      discountBp: 800,
      discountPerUnit: 84,
      discountedUnitPrice: 961,
      optionsPerUnit: 71,
      copperPerUnit: 10,
      unitNetPrice: 1042,
      extendedAmount: 2_084_000,
    })
    expect(a?.options.map((o) => [o.code, o.steps, o.perUnit])).toEqual([
      ['ROT-CW', null, 35],
      ['LEAD', 2, 36],
    ])
    expect(a?.copper).toMatchObject({ copperMassGrams: 85, deltaPerKg: 120, perUnit: 10, floored: false })
  })

  it('keeps every step of line 2', () => {
    expect(b).toMatchObject({ breakUnitPrice: 3390, discountPerUnit: 271, discountedUnitPrice: 3119, optionsPerUnit: 155, copperPerUnit: 25, unitNetPrice: 3299, extendedAmount: 3_299_000 })
  })

  it('adds up the totals and the deposit', () => {
    expect(quote.totals).toEqual({
      subtotal: 5_383_000,
      nreTotal: 250_000,
      total: 5_633_000,
      depositBp: 3000,
      depositAmount: 1_689_900,
      balanceAmount: 3_943_100,
      discountTotal: 84 * 2000 + 271 * 1000,
      copperTotal: 10 * 2000 + 25 * 1000,
    })
  })

  it('quotes the longest lead time of its lines', () => {
    expect(quote.leadTimeDays).toBe(56)
  })
})

describe('priceQuote: quantity breaks price the whole quantity', () => {
  it.each([
    [100, 1250, null],
    [499, 1250, null],
    [500, 1150, 500],
    [1999, 1150, 500],
    [2000, 1045, 2000],
    [10_000, 980, 10_000],
    [1_000_000, 980, 10_000],
  ])('quantity %d is priced at %d c per unit (break %s)', (quantity, unitPrice, threshold) => {
    const line = firstLine(priced(baseQuote({ customer: { ...larkspurOem, overrides: [{ discountBp: 0 }] }, lines: [{ variantId: 'SP-Q16-230-50', quantity, copperMassKg: 0, options: [] }] })))
    expect(line.breakUnitPrice).toBe(unitPrice)
    expect(line.appliedBreak?.minQuantity ?? null).toBe(threshold)
    expect(line.extendedAmount).toBe(unitPrice * quantity)
  })

  it('makes 500 pieces cost less than 499 when the break is deep enough', () => {
    const at = (quantity: number) =>
      firstLine(priced(baseQuote({ lines: [{ variantId: 'SP-Q16-230-50', quantity, copperMassKg: 0, options: [] }] }))).extendedAmount
    // 499 x 1250 less 8 % (100 c) = 499 x 1150 = 573 850; 500 x (1150 - 92) = 529 000.
    expect(at(499)).toBe(573_850)
    expect(at(500)).toBe(529_000)
  })
})

describe('priceQuote: tier discounts and account overrides', () => {
  const line = (input: Partial<QuoteInput>) => firstLine(priced(baseQuote(input)))

  it('gives a distributor 15 %: 11.50 less 172.5 -> 173 c (tie rounds up) = 977 c', () => {
    expect(line({ customer: quillonDistributor })).toMatchObject({ discountSource: 'tier', discountBp: 1500, discountPerUnit: 173, discountedUnitPrice: 977 })
  })

  it('lets a whole-account override replace the tier discount', () => {
    expect(line({ customer: { ...larkspurOem, overrides: [{ discountBp: 1000 }] } })).toMatchObject({ discountSource: 'account_override', discountBp: 1000, discountPerUnit: 115 })
  })

  it('lets a variant override win over the account override', () => {
    const customer = { ...larkspurOem, overrides: [{ discountBp: 1000 }, { variantId: 'SP-Q16-230-50', discountBp: 1200 }] }
    expect(line({ customer })).toMatchObject({ discountSource: 'variant_override', discountBp: 1200, discountPerUnit: 138 })
  })

  it('ignores a variant override for another variant', () => {
    const customer = { ...larkspurOem, overrides: [{ variantId: 'PSC-4P-120-60', discountBp: 2500 }] }
    expect(line({ customer })).toMatchObject({ discountSource: 'tier', discountBp: 800 })
  })

  it('adds the sales extra discount to the customer discount: 8 % + 3 % of 11.50 = 126.5 -> 127 c', () => {
    expect(line({ lines: [{ variantId: 'SP-Q16-230-50', quantity: 500, copperMassKg: 0, options: [], extraDiscountBp: 300 }] })).toMatchObject({
      customerDiscountBp: 800,
      extraDiscountBp: 300,
      discountBp: 1100,
      discountPerUnit: 127,
      discountedUnitPrice: 1023,
    })
  })

  it('refuses an extra discount above the sales engineer limit, naming the field', () => {
    const errors = errorsOf(priceQuote(baseQuote({ salesDiscountLimitBp: 500, lines: [{ variantId: 'SP-Q16-230-50', quantity: 500, copperMassKg: 0, options: [], extraDiscountBp: 501 }] })))
    expect(errors).toEqual([expect.objectContaining({ code: 'discount_limit_exceeded', field: 'lines[0].extraDiscountBp' })])
  })

  it('refuses a customer plus extra discount above 100 %', () => {
    const errors = errorsOf(
      priceQuote(baseQuote({ customer: { ...larkspurOem, overrides: [{ discountBp: 9900 }] }, lines: [{ variantId: 'SP-Q16-230-50', quantity: 500, copperMassKg: 0, options: [], extraDiscountBp: 200 }] })),
    )
    expect(errors.map((e) => e.code)).toEqual(['discount_over_100_percent'])
  })

  it('does not discount option adders or the copper surcharge', () => {
    const l = line({ lines: [{ variantId: 'SP-Q16-230-50', quantity: 500, copperMassKg: 0.1, options: [{ code: 'CONN-2P' }] }] })
    // 1150 - 92 = 1058; + 42 connector; + 100 g x 120 / 1000 = 12 c
    expect(l.unitNetPrice).toBe(1058 + 42 + 12)
  })
})

describe('priceQuote: options', () => {
  const optionLine = (options: QuoteInput['lines'][number]['options'], variantId = 'SP-Q16-230-50') =>
    priceQuote(baseQuote({ lines: [{ variantId, quantity: 500, copperMassKg: 0, options }] }))

  it.each([
    [300, 0, 0],
    [250, 0, 0],
    [301, 1, 18],
    [400, 1, 18],
    [401, 2, 36],
    [1000, 7, 126],
  ])('a %d mm lead over the 300 mm standard is %d started 100 mm = %d c', (lengthMm, steps, perUnit) => {
    const result = optionLine([{ code: 'LEAD', lengthMm }])
    expect(result.ok && result.value.lines[0]?.options[0]).toMatchObject({ steps, perUnit })
  })

  it('rejects an unknown option code, naming the field', () => {
    expect(errorsOf(optionLine([{ code: 'ROT-CW' }, { code: 'GOLD-PLATE' }]))).toEqual([expect.objectContaining({ code: 'unknown_option', field: 'lines[0].options[1].code' })])
  })

  it('rejects an option not offered on the variant (capacitor on a shaded-pole motor)', () => {
    expect(errorsOf(optionLine([{ code: 'CAP-5UF' }])).map((e) => e.code)).toEqual(['option_not_available'])
  })

  it('accepts the capacitor on the PSC variant', () => {
    expect(optionLine([{ code: 'CAP-5UF' }], 'PSC-4P-120-60').ok).toBe(true)
  })

  it('rejects the same option twice and a lead option without a length', () => {
    expect(errorsOf(optionLine([{ code: 'BRKT-3' }, { code: 'BRKT-3' }])).map((e) => e.code)).toEqual(['duplicate_option'])
    expect(errorsOf(optionLine([{ code: 'LEAD' }]))).toEqual([expect.objectContaining({ code: 'length_required', field: 'lines[0].options[0].lengthMm' })])
  })
})

describe('priceQuote: copper surcharge', () => {
  const withIndex = (valuePerKg: number, copperMassKg: number, credit = false) => {
    const priceList = { ...usdList2026(), copperCreditBelowBase: credit }
    return firstLine(priced(baseQuote({ priceList, copperIndex: { valuePerKg, currency: 'USD', stampedOn: '2026-03-02' }, lines: [{ variantId: 'SP-Q16-230-50', quantity: 500, copperMassKg, options: [] }] })))
  }

  it('adds 85 g x (12.00 - 9.50 USD/kg) = 21.25 -> 21 c per unit above base', () => {
    expect(withIndex(1200, 0.085)).toMatchObject({ copperPerUnit: 21, unitNetPrice: 1058 + 21 })
  })

  it('is zero at the base index', () => {
    expect(withIndex(950, 0.085).copperPerUnit).toBe(0)
  })

  it('holds at zero below base when the list gives no credit, and says so', () => {
    const l = withIndex(900, 0.085)
    expect(l.copperPerUnit).toBe(0)
    expect(l.copper).toMatchObject({ deltaPerKg: -50, floored: true })
  })

  it('credits 85 g x (9.00 - 9.50) = -4.25 -> -4 c below base when the list allows a credit', () => {
    expect(withIndex(900, 0.085, true)).toMatchObject({ copperPerUnit: -4, unitNetPrice: 1058 - 4 })
  })

  it('rounds a half-cent credit away from zero: 50 g x -0.10 USD/kg = -0.5 -> -1 c', () => {
    expect(withIndex(940, 0.05, true).copperPerUnit).toBe(-1)
  })

  it('rounds a half-cent surcharge away from zero: 50 g x 0.10 USD/kg = 0.5 -> 1 c', () => {
    expect(withIndex(960, 0.05).copperPerUnit).toBe(1)
  })

  it('never lets a credit take the unit price below zero', () => {
    const priceList = { ...usdList2026(), copperCreditBelowBase: true }
    const l = firstLine(
      priced(
        baseQuote({
          priceList,
          customer: { ...larkspurOem, overrides: [{ discountBp: 10_000 }] },
          copperIndex: { valuePerKg: 0, currency: 'USD', stampedOn: '2026-03-02' },
          lines: [{ variantId: 'SP-Q16-230-50', quantity: 500, copperMassKg: 1, options: [] }],
        }),
      ),
    )
    expect(l).toMatchObject({ discountedUnitPrice: 0, copperPerUnit: 0, unitNetPrice: 0, extendedAmount: 0 })
    expect(l.copper.perUnit).toBe(-950)
  })

  it('stamps the index used on the priced quote', () => {
    const q = priced(baseQuote())
    expect(q.copperIndex).toEqual({ valuePerKg: 1070, currency: 'USD', stampedOn: '2026-03-02' })
    expect(q.baseCopperIndexPerKg).toBe(950)
  })
})

describe('priceQuote: rounding edge cases', () => {
  it('rounds a 0.5 c discount up: 5 % of 12.50 = 62.5 -> 63 c', () => {
    const l = firstLine(priced(baseQuote({ customer: { ...larkspurOem, overrides: [{ discountBp: 500 }] }, lines: [{ variantId: 'SP-Q16-230-50', quantity: 100, copperMassKg: 0, options: [] }] })))
    expect(l).toMatchObject({ breakUnitPrice: 1250, discountPerUnit: 63, discountedUnitPrice: 1187 })
  })

  it('rounds a 0.5 c deposit up: 50 % of a 1001 c total is 500.5 -> 501 c', () => {
    const priceList = usdList2026()
    const entry = priceList.entries[0]
    if (!entry) throw new Error('fixture')
    priceList.entries[0] = { ...entry, unitPrice: 1001, breaks: [], moq: 1 }
    const q = priced(baseQuote({ priceList, customer: { ...larkspurOem, overrides: [{ discountBp: 0 }] }, depositBp: 5000, lines: [{ variantId: 'SP-Q16-230-50', quantity: 1, copperMassKg: 0, options: [] }] }))
    expect(q.totals).toMatchObject({ total: 1001, depositAmount: 501, balanceAmount: 500 })
  })
})

describe('priceQuote: JPY has no decimals', () => {
  // 1000 x SP-Q16-100-50 for a distributor: break 1000 -> 1350 yen; 15 % = 202.5 -> 203 yen; 1147 yen.
  // copper 85 g x (1580 - 1450 yen/kg) = 11.05 -> 11 yen; unit 1158 yen; 1000 -> 1 158 000 yen.
  const q = priced({
    quoteDate: '2026-04-10',
    currency: 'JPY',
    priceList: jpyList2026(),
    customer: quillonDistributor,
    copperIndex: { valuePerKg: 1580, currency: 'JPY', stampedOn: '2026-04-10' },
    lines: [{ variantId: 'SP-Q16-100-50', quantity: 1000, copperMassKg: 0.085, options: [] }],
    nre: [{ description: 'Test fixture', amount: 120_000 }],
    depositBp: 2500,
    salesDiscountLimitBp: 0,
  })

  it('prices whole yen at each step', () => {
    expect(firstLine(q)).toMatchObject({ breakUnitPrice: 1350, discountPerUnit: 203, discountedUnitPrice: 1147, copperPerUnit: 11, unitNetPrice: 1158, extendedAmount: 1_158_000 })
  })

  it('totals 1 278 000 yen with a 25 % deposit of 319 500 yen', () => {
    expect(q.totals).toMatchObject({ subtotal: 1_158_000, nreTotal: 120_000, total: 1_278_000, depositAmount: 319_500 })
  })
})

describe('priceQuote: large quantities', () => {
  it('stays exact for 5 million PSC motors (a safe integer far above 2^31)', () => {
    const q = priced(baseQuote({ lines: [{ variantId: 'PSC-4P-120-60', quantity: 5_000_000, copperMassKg: 0.21, options: [] }] }))
    // 3390 - 271 + 25 = 3144 c x 5e6
    expect(q.totals.subtotal).toBe(15_720_000_000)
    expect(Number.isSafeInteger(q.totals.total)).toBe(true)
  })

  it('returns amount_too_large instead of a rounded float when the extended amount is unsafe', () => {
    const errors = errorsOf(priceQuote(baseQuote({ lines: [{ variantId: 'PSC-4P-120-60', quantity: 10 ** 15, copperMassKg: 0, options: [] }] })))
    expect(errors.map((e) => e.code)).toEqual(['amount_too_large'])
  })
})

describe('priceQuote: validation names the field', () => {
  const codesAndFields = (input: QuoteInput) => errorsOf(priceQuote(input)).map((e) => [e.code, e.field])

  it('rejects a quantity below the MOQ', () => {
    const errors = errorsOf(priceQuote(baseQuote({ lines: [{ variantId: 'SP-Q16-230-50', quantity: 99, copperMassKg: 0, options: [] }] })))
    expect(errors).toEqual([{ code: 'below_moq', field: 'lines[0].quantity', message: 'quantity 99 is below the MOQ of 100 for SP-Q16-230-50' }])
  })

  it('accepts exactly the MOQ', () => {
    expect(priceQuote(baseQuote({ lines: [{ variantId: 'SP-Q16-230-50', quantity: 100, copperMassKg: 0, options: [] }] })).ok).toBe(true)
  })

  it('rejects zero, fractional and negative quantities', () => {
    expect(codesAndFields(baseQuote({ lines: [{ variantId: 'SP-Q16-230-50', quantity: 0, copperMassKg: 0, options: [] }] }))).toEqual([['not_positive', 'lines[0].quantity']])
    expect(codesAndFields(baseQuote({ lines: [{ variantId: 'SP-Q16-230-50', quantity: 150.5, copperMassKg: 0, options: [] }] }))).toEqual([['not_integer', 'lines[0].quantity']])
    expect(codesAndFields(baseQuote({ lines: [{ variantId: 'SP-Q16-230-50', quantity: -200, copperMassKg: 0, options: [] }] }))).toEqual([['negative_amount', 'lines[0].quantity']])
  })

  it('rejects negative NRE, copper mass, index and deposit', () => {
    const input = baseQuote({
      nre: [{ description: 'Tooling', amount: -1 }],
      copperIndex: { valuePerKg: -5, currency: 'USD', stampedOn: '2026-03-02' },
      depositBp: -100,
      lines: [{ variantId: 'SP-Q16-230-50', quantity: 500, copperMassKg: -0.1, options: [] }],
    })
    expect(codesAndFields(input)).toEqual([
      ['negative_amount', 'copperIndex.valuePerKg'],
      ['negative_amount', 'depositBp'],
      ['negative_amount', 'nre[0].amount'],
      ['negative_amount', 'lines[0].copperMassKg'],
    ])
  })

  it('rejects a deposit above 100 %', () => {
    expect(codesAndFields(baseQuote({ depositBp: 10_001 }))).toEqual([['discount_over_100_percent', 'depositBp']])
  })

  it('rejects a price list that expired before the quote date, and accepts its last day', () => {
    expect(codesAndFields(baseQuote({ quoteDate: '2026-07-01' }))).toEqual([['price_list_expired', 'priceList.validTo']])
    expect(priceQuote(baseQuote({ quoteDate: '2026-06-30' })).ok).toBe(true)
  })

  it('rejects a price list not yet valid and accepts its first day', () => {
    expect(codesAndFields(baseQuote({ quoteDate: '2025-12-31' }))).toEqual([['price_list_not_yet_valid', 'priceList.validFrom']])
    expect(priceQuote(baseQuote({ quoteDate: '2026-01-01' })).ok).toBe(true)
  })

  it('rejects an impossible quote date', () => {
    expect(codesAndFields(baseQuote({ quoteDate: '2026-02-30' }))).toEqual([['invalid_date', 'quoteDate']])
  })

  it('rejects a currency mismatch with the price list and with the copper index', () => {
    expect(codesAndFields(baseQuote({ currency: 'EUR' }))).toEqual([
      ['currency_mismatch', 'priceList.currency'],
      ['currency_mismatch', 'copperIndex.currency'],
    ])
    expect(codesAndFields(baseQuote({ copperIndex: { valuePerKg: 1070, currency: 'GBP', stampedOn: '2026-03-02' } }))).toEqual([['currency_mismatch', 'copperIndex.currency']])
  })

  it('rejects an unknown variant and an empty quote', () => {
    expect(codesAndFields(baseQuote({ lines: [{ variantId: 'SP-NOPE', quantity: 500, copperMassKg: 0, options: [] }] }))).toEqual([['unknown_variant', 'lines[0].variantId']])
    expect(codesAndFields(baseQuote({ lines: [] }))).toEqual([['no_lines', 'lines']])
  })

  it('reports every problem at once', () => {
    const input = baseQuote({
      quoteDate: '2026-08-01',
      lines: [
        { variantId: 'SP-Q16-230-50', quantity: 10, copperMassKg: 0, options: [{ code: 'NOPE' }] },
        { variantId: 'PSC-4P-120-60', quantity: 10, copperMassKg: 0, options: [] },
      ],
    })
    expect(codesAndFields(input)).toEqual([
      ['price_list_expired', 'priceList.validTo'],
      ['below_moq', 'lines[0].quantity'],
      ['unknown_option', 'lines[0].options[0].code'],
      ['below_moq', 'lines[1].quantity'],
    ])
  })
})
