import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { copperMassGrams, copperSurchargePerUnit } from './copper'

describe('copperSurchargePerUnit', () => {
  it('takes the mass to the nearest gram', () => {
    expect(copperMassGrams(0.0854)).toBe(85)
    expect(copperMassGrams(0.0856)).toBe(86)
    expect(copperMassGrams(1.2)).toBe(1200)
  })

  it('charges 1.2 kg x (10.70 - 9.50) USD/kg = 144 c', () => {
    expect(copperSurchargePerUnit({ copperMassKg: 1.2, indexPerKg: 1070, baseIndexPerKg: 950, creditBelowBase: false }).perUnit).toBe(144)
  })

  it('is never negative without a credit rule, and is the mirror image with one (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 5000 }), fc.integer({ min: 0, max: 100_000 }), fc.integer({ min: 0, max: 100_000 }), (grams, index, base) => {
        const args = { copperMassKg: grams / 1000, indexPerKg: index, baseIndexPerKg: base }
        const noCredit = copperSurchargePerUnit({ ...args, creditBelowBase: false })
        const credit = copperSurchargePerUnit({ ...args, creditBelowBase: true })
        expect(noCredit.perUnit).toBeGreaterThanOrEqual(0)
        expect(noCredit.perUnit).toBe(Math.max(0, credit.perUnit))
        const mirrored = copperSurchargePerUnit({ copperMassKg: grams / 1000, indexPerKg: base, baseIndexPerKg: index, creditBelowBase: true })
        expect(mirrored.perUnit).toBe(0 - credit.perUnit)
      }),
    )
  })
})
