// Demo price list, copper index and account terms (invented, USD): list prices follow the motor's
// type and rated output, with quantity breaks at 500, 2 000 and 10 000 pieces.
import type { EntityManager } from 'typeorm'
import { AccountTerms, CopperIndexRecord, MotorVariant, Organisation, PriceListEntryRecord, PriceListRecord, User } from '../db/entities'
import type { OptionAdder } from '../../shared/pricing'

export const DEMO_PRICE_LIST_CODE = 'AMW-USD-2026H2'

/** Invented list price in US cents: a base by type plus a rate per rated output watt. */
export function demoListPrice(type: 'shaded-pole' | 'psc', outputW: number): number {
  const cents = type === 'shaded-pole' ? 420 + 38 * outputW : 1450 + 21 * outputW
  return Math.round(cents / 5) * 5
}

export const DEMO_OPTIONS: OptionAdder[] = [
  { code: 'ROT-OPP', category: 'rotation', label: 'Opposite rotation', pricing: 'fixed', amountPerUnit: 35 },
  { code: 'LEAD-EXT', category: 'lead_length', label: 'Longer leads', pricing: 'per_100mm', amountPer100mm: 12, standardLengthMm: 300 },
  { code: 'CONN-2P', category: 'connector', label: '2-pin connector fitted', pricing: 'fixed', amountPerUnit: 45 },
  { code: 'CONN-5P', category: 'connector', label: '5-pin tap connector fitted', pricing: 'fixed', amountPerUnit: 70 },
  { code: 'CAP-SUP', category: 'capacitor', label: 'Run capacitor supplied', pricing: 'fixed', amountPerUnit: 110 },
  { code: 'BRKT-STD', category: 'bracket', label: 'Mounting bracket', pricing: 'fixed', amountPerUnit: 80 },
]

export async function seedDemoPricing(manager: EntityManager): Promise<void> {
  const list = await manager.save(
    manager.create(PriceListRecord, {
      code: DEMO_PRICE_LIST_CODE,
      name: 'Ashcombe OEM list, USD, second half 2026',
      currency: 'USD',
      validFrom: '2026-07-01',
      validTo: '2027-06-30',
      // US cents per kg of copper the list prices were set at.
      baseCopperIndexPerKg: 900,
      copperCreditBelowBase: false,
      tierDiscountBp: { oem: 800, distributor: 1500 },
      options: DEMO_OPTIONS,
    }),
  )
  const variants = await manager.find(MotorVariant, { select: { id: true, type: true, ratedOutputW: true, moq: true, leadTimeDays: true } })
  const entries = variants.map((variant) => {
    const unitPrice = demoListPrice(variant.type, variant.ratedOutputW)
    return {
      priceListId: list.id,
      variantId: variant.id,
      unitPrice,
      breaks: [
        { minQuantity: 500, unitPrice: Math.round((unitPrice * 0.94) / 5) * 5 },
        { minQuantity: 2000, unitPrice: Math.round((unitPrice * 0.88) / 5) * 5 },
        { minQuantity: 10000, unitPrice: Math.round((unitPrice * 0.82) / 5) * 5 },
      ],
      moq: variant.moq,
      leadTimeDays: variant.leadTimeDays,
    }
  })
  for (let start = 0; start < entries.length; start += 200) await manager.insert(PriceListEntryRecord, entries.slice(start, start + 200))
  await manager.insert(CopperIndexRecord, [
    { currency: 'USD', valuePerKg: 940, effectiveFrom: '2026-10-01', createdById: null },
    { currency: 'USD', valuePerKg: 985, effectiveFrom: '2026-11-01', createdById: null },
  ])
  const sales = await manager.findOneBy(User, { email: 'sales@ashcombe.test' })
  if (sales) await manager.update(User, { id: sales.id }, { discountLimitBp: 1000 })
  const customers = await manager.findBy(Organisation, { kind: 'customer' })
  for (const customer of customers) {
    await manager.insert(AccountTerms, { organisationId: customer.id, priceListId: list.id, salesEngineerId: sales?.id ?? null, overrides: [] })
  }
}
