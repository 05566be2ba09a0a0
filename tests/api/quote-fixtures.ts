// A customer account with a price list over the fixture motors, for quote tests (invented figures).
import type { DataSource } from 'typeorm'
import { AccountTerms, CopperIndexRecord, MotorVariant, PriceListEntryRecord, PriceListRecord, User } from '../../server/db/entities'
import { Like } from 'typeorm'
import { randomUUID } from 'node:crypto'
import { DEMO_OPTIONS } from '../../server/seed/demo-pricing'

export async function priceListFor(dataSource: DataSource, prefix: string): Promise<PriceListRecord> {
  const list = await dataSource.getRepository(PriceListRecord).save(
    dataSource.getRepository(PriceListRecord).create({
      code: `PL-${randomUUID().slice(0, 8)}`,
      name: 'Test list',
      currency: 'USD',
      validFrom: '2026-01-01',
      validTo: '2027-12-31',
      baseCopperIndexPerKg: 900,
      copperCreditBelowBase: false,
      tierDiscountBp: { oem: 800, distributor: 1500 },
      options: DEMO_OPTIONS,
    }),
  )
  const variants = await dataSource.getRepository(MotorVariant).findBy({ partNumber: Like(`${prefix}-%`) })
  await dataSource.getRepository(PriceListEntryRecord).insert(
    variants.map((variant) => ({
      priceListId: list.id,
      variantId: variant.id,
      unitPrice: 2500,
      breaks: [
        { minQuantity: 500, unitPrice: 2350 },
        { minQuantity: 2000, unitPrice: 2200 },
      ],
      moq: 100,
      leadTimeDays: 42,
    })),
  )
  if (!(await dataSource.getRepository(CopperIndexRecord).existsBy({ currency: 'USD' }))) {
    await dataSource.getRepository(CopperIndexRecord).insert({ currency: 'USD', valuePerKg: 1000, effectiveFrom: '2026-01-01', createdById: null })
  }
  return list
}

export async function assignAccount(dataSource: DataSource, organisationId: string, priceListId: string, sales: User): Promise<void> {
  await dataSource.getRepository(AccountTerms).insert({ organisationId, priceListId, salesEngineerId: sales.id, overrides: [] })
  await dataSource.getRepository(User).update({ id: sales.id }, { discountLimitBp: 1000 })
}
