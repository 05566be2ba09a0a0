/**
 * Incoterms 2020 rules (ICC publication no. 723, from memory): the eleven rules, the two groups
 * by mode of transport, and what the named place after the rule means. A quote's delivery term is
 * a rule plus a named place, e.g. "FCA Ashcombe works, Bristol, Incoterms 2020".
 */
import { pricingError, type PricingError, type PricingResult } from './errors'

export const INCOTERMS_2020 = ['EXW', 'FCA', 'CPT', 'CIP', 'DAP', 'DPU', 'DDP', 'FAS', 'FOB', 'CFR', 'CIF'] as const
export type Incoterm = (typeof INCOTERMS_2020)[number]

/** "any": any mode or modes of transport; "sea": sea and inland waterway transport only. */
export type IncotermTransport = 'any' | 'sea'

export interface IncotermRule {
  code: Incoterm
  name: string
  transport: IncotermTransport
  /** What the place named after the rule is. */
  namedPlace: 'place of delivery' | 'place of destination' | 'port of shipment' | 'port of destination'
  /** Whether the seller must buy cargo insurance for the buyer (CIP and CIF only). */
  sellerInsures: boolean
}

export const INCOTERM_RULES: Readonly<Record<Incoterm, IncotermRule>> = {
  EXW: { code: 'EXW', name: 'Ex Works', transport: 'any', namedPlace: 'place of delivery', sellerInsures: false },
  FCA: { code: 'FCA', name: 'Free Carrier', transport: 'any', namedPlace: 'place of delivery', sellerInsures: false },
  CPT: { code: 'CPT', name: 'Carriage Paid To', transport: 'any', namedPlace: 'place of destination', sellerInsures: false },
  CIP: { code: 'CIP', name: 'Carriage and Insurance Paid To', transport: 'any', namedPlace: 'place of destination', sellerInsures: true },
  DAP: { code: 'DAP', name: 'Delivered at Place', transport: 'any', namedPlace: 'place of destination', sellerInsures: false },
  DPU: { code: 'DPU', name: 'Delivered at Place Unloaded', transport: 'any', namedPlace: 'place of destination', sellerInsures: false },
  DDP: { code: 'DDP', name: 'Delivered Duty Paid', transport: 'any', namedPlace: 'place of destination', sellerInsures: false },
  FAS: { code: 'FAS', name: 'Free Alongside Ship', transport: 'sea', namedPlace: 'port of shipment', sellerInsures: false },
  FOB: { code: 'FOB', name: 'Free on Board', transport: 'sea', namedPlace: 'port of shipment', sellerInsures: false },
  CFR: { code: 'CFR', name: 'Cost and Freight', transport: 'sea', namedPlace: 'port of destination', sellerInsures: false },
  CIF: { code: 'CIF', name: 'Cost Insurance and Freight', transport: 'sea', namedPlace: 'port of destination', sellerInsures: true },
}

export function isIncoterm(code: string): code is Incoterm {
  return INCOTERMS_2020.some((rule) => rule === code)
}

/** True for FAS, FOB, CFR and CIF, which suit sea and inland waterway transport only. */
export function isSeaOnlyIncoterm(code: Incoterm): boolean {
  return INCOTERM_RULES[code].transport === 'sea'
}

export interface DeliveryTerm {
  rule: Incoterm
  namedPlace: string
}

/** Checks a rule code and its named place (required, non-blank) and returns the tidy term. */
export function validateDeliveryTerm(input: { rule: string; namedPlace: string }, field = 'incoterm'): PricingResult<DeliveryTerm> {
  const errors: PricingError[] = []
  const rule = input.rule.trim().toUpperCase()
  const place = input.namedPlace.trim().replace(/\s+/g, ' ')
  if (!isIncoterm(rule)) errors.push(pricingError('unknown_incoterm', `${field}.rule`, `"${input.rule}" is not an Incoterms 2020 rule`))
  if (place === '') errors.push(pricingError('place_required', `${field}.namedPlace`, 'an Incoterms rule needs a named place'))
  if (errors.length > 0 || !isIncoterm(rule)) return { ok: false, errors }
  return { ok: true, value: { rule, namedPlace: place } }
}

/** "FOB Avonmouth, Incoterms 2020": the way the term is printed on a quote. */
export function formatDeliveryTerm(term: DeliveryTerm): string {
  return `${term.rule} ${term.namedPlace}, Incoterms 2020`
}
