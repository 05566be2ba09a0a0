// Source for the rule list, the transport groups and the named places: ICC Incoterms 2020
// (ICC publication no. 723), from memory.
import { describe, expect, it } from 'vitest'
import { formatDeliveryTerm, INCOTERM_RULES, INCOTERMS_2020, isIncoterm, isSeaOnlyIncoterm, validateDeliveryTerm } from './incoterms'

describe('Incoterms 2020', () => {
  it('has the eleven rules', () => {
    expect([...INCOTERMS_2020].sort()).toEqual(['CFR', 'CIF', 'CIP', 'CPT', 'DAP', 'DDP', 'DPU', 'EXW', 'FAS', 'FCA', 'FOB'])
  })

  it('marks FAS, FOB, CFR and CIF as sea and inland waterway only', () => {
    expect(INCOTERMS_2020.filter(isSeaOnlyIncoterm)).toEqual(['FAS', 'FOB', 'CFR', 'CIF'])
  })

  it('names the place after each rule as ICC does', () => {
    expect(INCOTERM_RULES.FOB.namedPlace).toBe('port of shipment')
    expect(INCOTERM_RULES.CIF.namedPlace).toBe('port of destination')
    expect(INCOTERM_RULES.FCA.namedPlace).toBe('place of delivery')
    expect(INCOTERM_RULES.DPU.namedPlace).toBe('place of destination')
    expect(INCOTERMS_2020.filter((r) => INCOTERM_RULES[r].sellerInsures)).toEqual(['CIP', 'CIF'])
  })

  it('no longer knows DAT (replaced by DPU in 2020)', () => {
    expect(isIncoterm('DAT')).toBe(false)
    expect(isIncoterm('DPU')).toBe(true)
  })

  it('requires a named place and tidies the input', () => {
    expect(validateDeliveryTerm({ rule: ' fca ', namedPlace: '  Ashcombe works,   Bristol ' })).toEqual({ ok: true, value: { rule: 'FCA', namedPlace: 'Ashcombe works, Bristol' } })
    const missing = validateDeliveryTerm({ rule: 'DAP', namedPlace: '   ' })
    expect(missing.ok ? [] : missing.errors.map((e) => [e.code, e.field])).toEqual([['place_required', 'incoterm.namedPlace']])
    const unknown = validateDeliveryTerm({ rule: 'FOT', namedPlace: 'Leeds' })
    expect(unknown.ok ? [] : unknown.errors.map((e) => e.code)).toEqual(['unknown_incoterm'])
  })

  it('prints the term with the rules version', () => {
    expect(formatDeliveryTerm({ rule: 'FOB', namedPlace: 'Avonmouth' })).toBe('FOB Avonmouth, Incoterms 2020')
  })
})
