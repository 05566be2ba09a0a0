import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { unitPriceForQuantity, validatePriceList, type PriceList, type PriceListEntry } from './price-list'
import { usdList2026 } from './test-fixtures'

function withEntry(change: Partial<PriceListEntry>): PriceList {
  const list = usdList2026()
  const entry = list.entries[0]
  if (!entry) throw new Error('fixture')
  list.entries[0] = { ...entry, ...change }
  return list
}

describe('validatePriceList', () => {
  it('accepts the demo list', () => {
    expect(validatePriceList(usdList2026())).toEqual([])
  })

  it('rejects break thresholds that do not rise', () => {
    const list = withEntry({ breaks: [{ minQuantity: 500, unitPrice: 1150 }, { minQuantity: 500, unitPrice: 1100 }] })
    expect(validatePriceList(list).map((e) => [e.code, e.field])).toEqual([['breaks_not_ascending', 'priceList.entries[0].breaks[1].minQuantity']])
  })

  it('rejects a break that raises the unit price', () => {
    const list = withEntry({ breaks: [{ minQuantity: 500, unitPrice: 1300 }] })
    expect(validatePriceList(list).map((e) => e.code)).toEqual(['break_raises_price'])
  })

  it('rejects negative prices, an MOQ of zero and fractional lead times', () => {
    const list = withEntry({ unitPrice: -1, moq: 0, leadTimeDays: 4.5, breaks: [] })
    expect(validatePriceList(list).map((e) => [e.code, e.field])).toEqual([
      ['negative_amount', 'priceList.entries[0].unitPrice'],
      ['not_integer', 'priceList.entries[0].leadTimeDays'],
      ['not_positive', 'priceList.entries[0].moq'],
    ])
  })

  it('rejects validTo before validFrom, duplicate variants and tier discounts over 100 %', () => {
    const list = usdList2026()
    list.validTo = '2025-12-31'
    list.tierDiscountBp.distributor = 12_000
    const first = list.entries[0]
    if (first) list.entries.push({ ...first })
    expect(validatePriceList(list).map((e) => e.code)).toEqual(['invalid_date', 'discount_over_100_percent', 'duplicate_variant'])
  })

  it('rejects duplicate option codes and negative adders', () => {
    const list = usdList2026()
    list.options.push({ code: 'ROT-CW', category: 'rotation', label: 'again', pricing: 'fixed', amountPerUnit: -3 })
    expect(validatePriceList(list).map((e) => e.code)).toEqual(['duplicate_option_code', 'negative_amount'])
  })
})

describe('unitPriceForQuantity', () => {
  it('finds the highest break at or below the quantity even if breaks were stored unsorted', () => {
    const entry: PriceListEntry = { variantId: 'x', unitPrice: 100, moq: 1, leadTimeDays: 0, breaks: [{ minQuantity: 1000, unitPrice: 80 }, { minQuantity: 100, unitPrice: 90 }] }
    expect(unitPriceForQuantity(entry, 99).unitPrice).toBe(100)
    expect(unitPriceForQuantity(entry, 100).unitPrice).toBe(90)
    expect(unitPriceForQuantity(entry, 5000).unitPrice).toBe(80)
  })

  it('never raises the unit price as the quantity grows on a valid list (property)', () => {
    const entry = usdList2026().entries[0]
    if (!entry) throw new Error('fixture')
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 50_000 }), fc.integer({ min: 0, max: 50_000 }), (q, extra) => {
        expect(unitPriceForQuantity(entry, q + extra).unitPrice).toBeLessThanOrEqual(unitPriceForQuantity(entry, q).unitPrice)
      }),
    )
  })
})
