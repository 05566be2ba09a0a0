import { describe, expect, it } from 'vitest'
import { checkSalesDiscount, customerDiscountFor } from './discount'
import { larkspurOem, quillonDistributor, usdList2026 } from './test-fixtures'

describe('customerDiscountFor', () => {
  const list = usdList2026()
  it('uses the tier discount of the price list by default', () => {
    expect(customerDiscountFor(larkspurOem, list, 'SP-Q16-230-50')).toEqual({ discountBp: 800, source: 'tier' })
    expect(customerDiscountFor(quillonDistributor, list, 'SP-Q16-230-50')).toEqual({ discountBp: 1500, source: 'tier' })
  })
  it('lets an override of 0 bp remove the tier discount (an override replaces, it does not add)', () => {
    expect(customerDiscountFor({ ...quillonDistributor, overrides: [{ discountBp: 0 }] }, list, 'SP-Q16-230-50')).toEqual({ discountBp: 0, source: 'account_override' })
  })
})

describe('checkSalesDiscount', () => {
  it('accepts a discount up to and including the limit', () => {
    expect(checkSalesDiscount(500, 500)).toEqual({ ok: true, value: 500 })
    expect(checkSalesDiscount(0, 0)).toEqual({ ok: true, value: 0 })
  })
  it('returns a typed error above the limit', () => {
    expect(checkSalesDiscount(501, 500)).toEqual({
      ok: false,
      errors: [{ code: 'discount_limit_exceeded', field: 'extraDiscountBp', message: 'extra discount 501 bp exceeds the sales limit of 500 bp' }],
    })
  })
  it('rejects negative and fractional discounts', () => {
    const codes = (bp: number) => {
      const r = checkSalesDiscount(bp, 1000)
      return r.ok ? [] : r.errors.map((e) => e.code)
    }
    expect(codes(-1)).toEqual(['negative_amount'])
    expect(codes(2.5)).toEqual(['not_integer'])
  })
})
