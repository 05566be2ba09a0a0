// An invented QuoteDocument (Ashcombe Motor Works to Larkspur Air Appliances) for the PDF spec and
// the preview script. Prices come from the real pricing rules over an invented price list; the
// operating points come from a simple invented motor model solved here, so every marked point
// sits where its curves cross. None of it is catalogue data.
import type { LineDutyPoint, QuoteDocument, RevisionLine } from '../../shared/contracts/quote.contract'
import { priceQuote, type PriceList, type QuoteLineInput } from '../../shared/pricing'

interface InventedMotor {
  partNumber: string
  name: string
  tap: string | null
  unitPrice: number
  breaks: { minQuantity: number; unitPrice: number }[]
  moq: number
  leadTimeDays: number
  copperMassKg: number
  /** Torque-speed shape (Kloss form): breakdown torque and the slip at it; synchronous speed. */
  model: { syncRpm: number; breakdownNm: number; breakdownSlip: number; efficiency: number; powerFactor: number } | null
}

const MOTORS: InventedMotor[] = [
  {
    partNumber: 'AMW-PSC4-120-60-H',
    name: 'PSC motor, 4-pole, 120 V 60 Hz, 3 speed taps, 5 uF run capacitor, sleeve bearings',
    tap: 'high',
    unitPrice: 3875,
    breaks: [
      { minQuantity: 250, unitPrice: 3600 },
      { minQuantity: 1000, unitPrice: 3390 },
      { minQuantity: 5000, unitPrice: 3225 },
    ],
    moq: 50,
    leadTimeDays: 56,
    copperMassKg: 0.21,
    model: { syncRpm: 1800, breakdownNm: 0.62, breakdownSlip: 0.3, efficiency: 0.56, powerFactor: 0.93 },
  },
  {
    partNumber: 'AMW-SP16-120-60',
    name: 'Shaded-pole motor, 4-pole, 120 V 60 Hz, 16 W input class, thermally protected',
    tap: null,
    unitPrice: 1250,
    breaks: [
      { minQuantity: 500, unitPrice: 1150 },
      { minQuantity: 2000, unitPrice: 1045 },
    ],
    moq: 100,
    leadTimeDays: 42,
    copperMassKg: 0.085,
    model: { syncRpm: 1800, breakdownNm: 0.075, breakdownSlip: 0.45, efficiency: 0.22, powerFactor: 0.62 },
  },
  {
    partNumber: 'AMW-PSC6-120-60-M',
    name: 'PSC motor, 6-pole, 120 V 60 Hz, medium tap, ball bearings',
    tap: 'med',
    unitPrice: 4420,
    breaks: [{ minQuantity: 500, unitPrice: 4150 }],
    moq: 50,
    leadTimeDays: 63,
    copperMassKg: 0.26,
    model: { syncRpm: 1200, breakdownNm: 0.95, breakdownSlip: 0.35, efficiency: 0.52, powerFactor: 0.9 },
  },
  {
    partNumber: 'AMW-BRKT-3A',
    name: 'Three-arm mounting bracket kit, zinc-plated steel',
    tap: null,
    unitPrice: 140,
    breaks: [{ minQuantity: 1000, unitPrice: 118 }],
    moq: 200,
    leadTimeDays: 21,
    copperMassKg: 0,
    model: null,
  },
]

function priceList(): PriceList {
  return {
    id: 'AMW-USD-2026H1',
    currency: 'USD',
    validFrom: '2026-01-01',
    validTo: '2026-06-30',
    baseCopperIndexPerKg: 950,
    copperCreditBelowBase: false,
    tierDiscountBp: { oem_contract: 800, distributor: 1500 },
    entries: MOTORS.map((m) => ({ variantId: m.partNumber, unitPrice: m.unitPrice, breaks: m.breaks, moq: m.moq, leadTimeDays: m.leadTimeDays })),
    options: [
      { code: 'ROT-CW', category: 'rotation', label: 'Clockwise rotation (viewed from lead end)', pricing: 'fixed', amountPerUnit: 35 },
      { code: 'LEAD', category: 'lead_length', label: 'Lead length', pricing: 'per_100mm', amountPer100mm: 18, standardLengthMm: 300 },
      { code: 'CONN-2P', category: 'connector', label: '2-pole housing connector', pricing: 'fixed', amountPerUnit: 42 },
      { code: 'CAP-5UF', category: 'capacitor', label: 'Run capacitor 5 uF 370 VAC supplied', pricing: 'fixed', amountPerUnit: 95 },
    ],
  }
}

/** Kloss-form torque at speed n (invented shape, good enough for a plausible small chart). */
function klossTorque(model: NonNullable<InventedMotor['model']>, rpm: number, voltageRatio: number): number {
  const slip = Math.max((model.syncRpm - rpm) / model.syncRpm, 1e-9)
  return (voltageRatio ** 2 * 2 * model.breakdownNm) / (slip / model.breakdownSlip + model.breakdownSlip / slip)
}

/** Stable root of motor torque = k n^2 above the breakdown speed, by bisection. */
function solve(model: NonNullable<InventedMotor['model']>, k: number, voltageRatio: number): number {
  let lo = model.syncRpm * (1 - model.breakdownSlip)
  let hi = model.syncRpm
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2
    if (klossTorque(model, mid, voltageRatio) > k * mid * mid) lo = mid
    else hi = mid
  }
  return (lo + hi) / 2
}

const round = (value: number, digits: number): number => Math.round(value * 10 ** digits) / 10 ** digits

function dutyPoint(model: NonNullable<InventedMotor['model']>, index: number): LineDutyPoint {
  const volts = 120
  const lowVolts = 108
  // Load torque at 90 % of synchronous speed is 70 % of breakdown torque; the fan moves
  // flowPerRpm m3/s per r/min and builds pressure with the square of speed (fan laws).
  const ref = model.syncRpm * 0.9
  const k = (0.7 * model.breakdownNm) / (ref * ref)
  const flowPerRpm = (model.breakdownNm * 0.11) / 1000
  const pressurePerRpm2 = 55 / (1500 * 1500)
  const nominalRpm = Math.round(solve(model, k, 1))
  const lowRpm = Math.round(solve(model, k, lowVolts / volts))
  // Power factor rises a little at reduced voltage (less magnetising current), so current falls.
  const point = (rpm: number, v: number, powerFactor: number) => {
    const torque = k * rpm * rpm
    const outputW = (torque * rpm * 2 * Math.PI) / 60
    const inputW = outputW / model.efficiency
    return {
      rpm,
      flowM3s: round(flowPerRpm * rpm, 5),
      staticPa: round(pressurePerRpm2 * rpm * rpm, 1),
      inputW: round(inputW, 1),
      currentA: round(inputW / (v * powerFactor), 3),
    }
  }
  const nominal = point(nominalRpm, volts, model.powerFactor)
  const low = point(lowRpm, lowVolts, Math.min(0.99, model.powerFactor * 1.05))
  // The duty asks for a little less than nominal delivers; every other line is sized tight, so
  // its low-line point falls short and the PDF has to say "no".
  const dutyShare = index % 2 === 0 ? 0.96 : 0.995
  const duty = { flowM3s: round(nominal.flowM3s * dutyShare, 5), staticPa: round(nominal.staticPa * dutyShare * dutyShare, 1) }
  const steps = 24
  const speeds = Array.from({ length: steps + 1 }, (_, i) => (model.syncRpm * i) / steps)
  return {
    studyName: index % 2 === 0 ? 'Larkspur H-60 range hood, 150 mm duct' : 'Larkspur B-110 bath fan, 100 mm duct',
    supply: { volts, hz: 60 },
    duty,
    nominal: { ...nominal, efficiency: model.efficiency, status: 'running' },
    lowLine: { volts: lowVolts, ...low, status: 'running' },
    meetsDuty: low.flowM3s >= duty.flowM3s && low.staticPa >= duty.staticPa,
    motorCurve: speeds.map((rpm) => ({ rpm: round(rpm, 1), torqueNm: round(klossTorque(model, rpm, 1), 4) })),
    motorLowLineCurve: speeds.map((rpm) => ({ rpm: round(rpm, 1), torqueNm: round(klossTorque(model, rpm, lowVolts / volts), 4) })),
    loadCurve: speeds.map((rpm) => ({ rpm: round(rpm, 1), torqueNm: round(k * rpm * rpm, 4) })),
  }
}

/**
 * The sample quote. `lineCount` repeats the four invented items (at rising quantities) so page
 * breaks can be exercised; the default is the four-line quote a person would preview.
 */
export function sampleQuoteDocument(options: { lineCount?: number; quantityFactor?: number } = {}): QuoteDocument {
  const lineCount = options.lineCount ?? 4
  const factor = options.quantityFactor ?? 1
  const chosen = Array.from({ length: lineCount }, (_, i) => {
    const motor = MOTORS[i % MOTORS.length]
    if (motor === undefined) throw new Error('no invented motors')
    return { motor, quantity: [1200, 600, 300, 2400][i % 4] ?? 500, i }
  })
  const inputs: QuoteLineInput[] = chosen.map(({ motor, quantity, i }) => ({
    variantId: motor.partNumber,
    quantity: (quantity + 50 * Math.floor(i / MOTORS.length)) * factor,
    copperMassKg: motor.copperMassKg,
    options:
      motor.model === null
        ? []
        : i % 4 === 0
          ? [{ code: 'CAP-5UF' }, { code: 'LEAD', lengthMm: 550 }]
          : i % 4 === 1
            ? [{ code: 'ROT-CW' }, { code: 'CONN-2P' }]
            : [],
    extraDiscountBp: i % 4 === 0 ? 200 : 0,
  }))
  const priced = priceQuote({
    quoteDate: '2026-03-02',
    currency: 'USD',
    priceList: priceList(),
    customer: { accountId: 'acct-larkspur', tier: 'oem_contract', overrides: [] },
    copperIndex: { valuePerKg: 1070, currency: 'USD', stampedOn: '2026-03-02' },
    lines: inputs,
    nre: [
      { description: 'Tooling for customer-specific lead exit and grommet', amount: 185000 },
      { description: 'First-article inspection report (PPAP level 2)', amount: 42000 },
    ],
    depositBp: 3000,
    salesDiscountLimitBp: 500,
  })
  if (!priced.ok) throw new Error(`fixture does not price: ${priced.errors.map((e) => e.message).join('; ')}`)
  const lines: RevisionLine[] = chosen.map(({ motor, i }) => ({
    partNumber: motor.partNumber,
    name: motor.name,
    tap: motor.tap,
    quantity: inputs[i]?.quantity ?? 0,
    moq: motor.moq,
    leadTimeDays: motor.leadTimeDays,
    breaks: motor.breaks,
    options: (priced.value.lines[i]?.options ?? []).map((o) => ({ code: o.code, label: o.label, perUnit: o.perUnit })),
    dutyPoint: motor.model === null ? null : dutyPoint(motor.model, i),
  }))
  return {
    number: 'SW-2026-00042',
    revision: 'B',
    issuedOn: '2026-03-02',
    validUntil: '2026-04-01',
    currency: 'USD',
    maker: {
      name: 'Ashcombe Motor Works',
      address: ['Unit 7, Ferrous Way', 'Ashcombe Trading Estate', 'Bristol BS11 9QX, United Kingdom'],
      email: 'sales@ashcombe.test',
    },
    customer: { name: 'Larkspur Air Appliances', tier: 'oem_contract', contactName: 'Dana Whitcombe', contactEmail: 'buyer@larkspur.test' },
    salesEngineer: { name: 'Priya Ashworth', email: 'sales@ashcombe.test' },
    lines,
    priced: priced.value,
    terms: {
      incoterm: 'FCA',
      incotermPlace: 'Ashcombe works, Bristol',
      paymentTerms: 'Deposit with acceptance, balance 30 days net from shipment',
      depositBp: 3000,
      notes:
        'Samples of each motor (5 pcs) ship within 10 working days of acceptance. Quantities are for call-off over 12 months in lots of at least the MOQ. Motors are marked with the Larkspur part number on request at no charge.',
    },
    copperIndex: { valuePerKg: 1070, baseValuePerKg: 950, stampedOn: '2026-03-02' },
  }
}

/**
 * The awkward cases a layout must survive: eight-digit amounts, long names that wrap, a motor that
 * does not start at low line, the longest notes the draft allows.
 */
export function stressQuoteDocument(): QuoteDocument {
  const doc = sampleQuoteDocument({ lineCount: 6, quantityFactor: 1000 })
  doc.customer = { ...doc.customer, name: 'Larkspur Air Appliances International Holdings (North America) LLC', contactName: 'Dana Whitcombe-Fairweather' }
  const first = doc.lines[0]
  if (first) first.name = `${first.name}, with customer-specific lead exit, double-insulated leads and UL recognised thermal protector`
  const second = doc.lines[1]
  if (second?.dutyPoint) {
    second.partNumber = 'AMW-SP16-120-60-LONG-PART-NO-X'
    second.dutyPoint.lowLine = { ...second.dutyPoint.lowLine, rpm: 0, flowM3s: 0, staticPa: 0, inputW: null, currentA: null, status: 'no-start' }
    second.dutyPoint.meetsDuty = false
  }
  doc.terms = { ...doc.terms, notes: Array.from({ length: 26 }, (_, i) => `Note ${i + 1}: call-offs are confirmed in writing at least four weeks before the wanted ship date, in lots of the MOQ or more.`).join(' ').slice(0, 4000) }
  return doc
}
