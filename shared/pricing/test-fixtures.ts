/**
 * Invented Ashcombe Motor Works price lists for the pricing specs (not used by the app).
 * Amounts are minor units: USD cents, JPY yen.
 */
import type { CustomerTerms } from './discount'
import type { PriceList } from './price-list'
import type { QuoteInput } from './price-quote'

export function usdList2026(): PriceList {
  return {
    id: 'AMW-USD-2026H1',
    currency: 'USD',
    validFrom: '2026-01-01',
    validTo: '2026-06-30',
    baseCopperIndexPerKg: 950, // USD 9.50 per kg
    copperCreditBelowBase: false,
    tierDiscountBp: { oem_contract: 800, distributor: 1500 },
    entries: [
      {
        variantId: 'SP-Q16-230-50',
        unitPrice: 1250,
        breaks: [
          { minQuantity: 500, unitPrice: 1150 },
          { minQuantity: 2000, unitPrice: 1045 },
          { minQuantity: 10_000, unitPrice: 980 },
        ],
        moq: 100,
        leadTimeDays: 42,
      },
      {
        variantId: 'PSC-4P-120-60',
        unitPrice: 3875,
        breaks: [
          { minQuantity: 250, unitPrice: 3600 },
          { minQuantity: 1000, unitPrice: 3390 },
        ],
        moq: 50,
        leadTimeDays: 56,
      },
    ],
    options: [
      { code: 'ROT-CW', category: 'rotation', label: 'Clockwise rotation (viewed from lead end)', pricing: 'fixed', amountPerUnit: 35 },
      { code: 'LEAD', category: 'lead_length', label: 'Lead length', pricing: 'per_100mm', amountPer100mm: 18, standardLengthMm: 300 },
      { code: 'CONN-2P', category: 'connector', label: '2-pole housing connector', pricing: 'fixed', amountPerUnit: 42 },
      { code: 'CAP-5UF', category: 'capacitor', label: 'Run capacitor 5 uF 370 VAC supplied', pricing: 'fixed', amountPerUnit: 95, variantIds: ['PSC-4P-120-60'] },
      { code: 'BRKT-3', category: 'bracket', label: '3-arm mounting bracket', pricing: 'fixed', amountPerUnit: 60 },
    ],
  }
}

export function jpyList2026(): PriceList {
  return {
    id: 'AMW-JPY-2026',
    currency: 'JPY',
    validFrom: '2026-01-01',
    validTo: null,
    baseCopperIndexPerKg: 1450,
    copperCreditBelowBase: true,
    tierDiscountBp: { oem_contract: 700, distributor: 1500 },
    entries: [{ variantId: 'SP-Q16-100-50', unitPrice: 1480, breaks: [{ minQuantity: 1000, unitPrice: 1350 }], moq: 200, leadTimeDays: 49 }],
    options: [],
  }
}

export const larkspurOem: CustomerTerms = { accountId: 'acct-larkspur', tier: 'oem_contract', overrides: [] }
export const quillonDistributor: CustomerTerms = { accountId: 'acct-quillon', tier: 'distributor', overrides: [] }

/** A one-line USD quote for Larkspur that specs tweak. */
export function baseQuote(overrides: Partial<QuoteInput> = {}): QuoteInput {
  return {
    quoteDate: '2026-03-02',
    currency: 'USD',
    priceList: usdList2026(),
    customer: larkspurOem,
    copperIndex: { valuePerKg: 1070, currency: 'USD', stampedOn: '2026-03-02' },
    lines: [{ variantId: 'SP-Q16-230-50', quantity: 500, copperMassKg: 0.085, options: [] }],
    nre: [],
    depositBp: 3000,
    salesDiscountLimitBp: 500,
    ...overrides,
  }
}
