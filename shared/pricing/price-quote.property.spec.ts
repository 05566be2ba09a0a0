/** Property tests of priceQuote over random valid quotes (fast-check). */
import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { priceQuote, type QuoteInput } from './price-quote'
import type { PriceList } from './price-list'

const variantIds = ['V1', 'V2', 'V3']

const priceListArb: fc.Arbitrary<PriceList> = fc
  .record({
    base: fc.integer({ min: 0, max: 2_000_000 }),
    credit: fc.boolean(),
    tiers: fc.tuple(fc.integer({ min: 0, max: 10_000 }), fc.integer({ min: 0, max: 10_000 })),
    entries: fc.tuple(
      ...variantIds.map((variantId) =>
        fc.record({
          unitPrice: fc.integer({ min: 0, max: 5_000_000 }),
          steps: fc.array(fc.record({ gap: fc.integer({ min: 1, max: 5000 }), cut: fc.integer({ min: 0, max: 200_000 }) }), { maxLength: 4 }),
          moq: fc.integer({ min: 1, max: 500 }),
          leadTimeDays: fc.integer({ min: 0, max: 200 }),
        }).map(({ unitPrice, steps, moq, leadTimeDays }) => {
          let threshold = 1
          let price = unitPrice
          const breaks = steps.map(({ gap, cut }) => {
            threshold += gap
            price = Math.max(0, price - cut)
            return { minQuantity: threshold, unitPrice: price }
          })
          return { variantId, unitPrice, breaks, moq, leadTimeDays }
        }),
      ),
    ),
    adders: fc.tuple(fc.integer({ min: 0, max: 50_000 }), fc.integer({ min: 0, max: 5_000 }), fc.integer({ min: 0, max: 1000 })),
  })
  .map(({ base, credit, tiers, entries, adders }) => ({
    id: 'PL-PROP',
    currency: 'EUR',
    validFrom: '2026-01-01',
    validTo: '2026-12-31',
    baseCopperIndexPerKg: base,
    copperCreditBelowBase: credit,
    tierDiscountBp: { oem_contract: tiers[0], distributor: tiers[1] },
    entries,
    options: [
      { code: 'BRKT', category: 'bracket', label: 'Bracket', pricing: 'fixed', amountPerUnit: adders[0] },
      { code: 'LEAD', category: 'lead_length', label: 'Lead', pricing: 'per_100mm', amountPer100mm: adders[1], standardLengthMm: adders[2] },
    ],
  }))

const quoteArb: fc.Arbitrary<QuoteInput> = fc
  .record({
    priceList: priceListArb,
    tier: fc.constantFrom('oem_contract' as const, 'distributor' as const),
    accountOverride: fc.option(fc.integer({ min: 0, max: 10_000 }), { nil: undefined }),
    index: fc.integer({ min: 0, max: 3_000_000 }),
    lines: fc.array(
      fc.record({
        variant: fc.integer({ min: 0, max: variantIds.length - 1 }),
        extraQty: fc.integer({ min: 0, max: 100_000 }),
        grams: fc.integer({ min: 0, max: 3000 }),
        bracket: fc.boolean(),
        lengthMm: fc.option(fc.integer({ min: 0, max: 3000 }), { nil: undefined }),
        extra: fc.integer({ min: 0, max: 10_000 }),
      }),
      { minLength: 1, maxLength: 6 },
    ),
    nre: fc.array(fc.integer({ min: 0, max: 10_000_000 }), { maxLength: 3 }),
    depositBp: fc.integer({ min: 0, max: 10_000 }),
  })
  .map(({ priceList, tier, accountOverride, index, lines, nre, depositBp }) => ({
    quoteDate: '2026-05-15',
    currency: 'EUR',
    priceList,
    customer: { accountId: 'acct', tier, overrides: accountOverride === undefined ? [] : [{ discountBp: accountOverride }] },
    copperIndex: { valuePerKg: index, currency: 'EUR', stampedOn: '2026-05-15' },
    lines: lines.map((l) => {
      const entry = priceList.entries[l.variant]
      const variantId = variantIds[l.variant] ?? 'V1'
      const customerBp = accountOverride ?? priceList.tierDiscountBp[tier]
      return {
        variantId,
        quantity: (entry?.moq ?? 1) + l.extraQty,
        copperMassKg: l.grams / 1000,
        options: [...(l.bracket ? [{ code: 'BRKT' }] : []), ...(l.lengthMm === undefined ? [] : [{ code: 'LEAD', lengthMm: l.lengthMm }])],
        // keep customer + extra within 100 % so every generated quote is valid
        extraDiscountBp: Math.min(l.extra, 10_000 - customerBp),
      }
    }),
    nre: nre.map((amount, i) => ({ description: `NRE ${i}`, amount })),
    depositBp,
    salesDiscountLimitBp: 10_000,
  }))

describe('priceQuote properties', () => {
  it('prices every generated valid quote', () => {
    fc.assert(
      fc.property(quoteArb, (input) => {
        const result = priceQuote(input)
        expect(result.ok ? [] : result.errors).toEqual([])
      }),
    )
  })

  it('total = sum of line extended amounts + NRE, and deposit + balance = total', () => {
    fc.assert(
      fc.property(quoteArb, (input) => {
        const result = priceQuote(input)
        if (!result.ok) return
        const { lines, totals } = result.value
        expect(totals.subtotal).toBe(lines.reduce((s, l) => s + l.extendedAmount, 0))
        expect(totals.total).toBe(totals.subtotal + input.nre.reduce((s, c) => s + c.amount, 0))
        expect(totals.depositAmount + totals.balanceAmount).toBe(totals.total)
      }),
    )
  })

  it('keeps 0 <= deposit <= total, all totals safe integers', () => {
    fc.assert(
      fc.property(quoteArb, (input) => {
        const result = priceQuote(input)
        if (!result.ok) return
        const t = result.value.totals
        expect(t.depositAmount).toBeGreaterThanOrEqual(0)
        expect(t.depositAmount).toBeLessThanOrEqual(t.total)
        for (const v of Object.values(t)) expect(Number.isSafeInteger(v)).toBe(true)
      }),
    )
  })

  it('never lets a discount make a price negative or exceed the break price, and each line adds up', () => {
    fc.assert(
      fc.property(quoteArb, (input) => {
        const result = priceQuote(input)
        if (!result.ok) return
        for (const l of result.value.lines) {
          expect(l.discountedUnitPrice).toBeGreaterThanOrEqual(0)
          expect(l.discountedUnitPrice).toBeLessThanOrEqual(l.breakUnitPrice)
          expect(l.unitNetPrice).toBeGreaterThanOrEqual(0)
          expect(l.unitNetPrice).toBe(l.discountedUnitPrice + l.optionsPerUnit + l.copperPerUnit)
          expect(l.extendedAmount).toBe(l.unitNetPrice * l.quantity)
          if (!input.priceList.copperCreditBelowBase) expect(l.copperPerUnit).toBeGreaterThanOrEqual(0)
        }
      }),
    )
  })

  it('never raises the subtotal when the sales extra discount grows', () => {
    fc.assert(
      fc.property(quoteArb, fc.integer({ min: 0, max: 10_000 }), (input, more) => {
        const richer: QuoteInput = {
          ...input,
          lines: input.lines.map((l) => {
            const customerBp = input.customer.overrides[0]?.discountBp ?? input.priceList.tierDiscountBp[input.customer.tier]
            return { ...l, extraDiscountBp: Math.min((l.extraDiscountBp ?? 0) + more, 10_000 - customerBp) }
          }),
        }
        const before = priceQuote(input)
        const after = priceQuote(richer)
        if (!before.ok || !after.ok) throw new Error('generated quote did not price')
        expect(after.value.totals.subtotal).toBeLessThanOrEqual(before.value.totals.subtotal)
      }),
    )
  })
})
