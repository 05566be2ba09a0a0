// The invented Ashcombe Motor Works demo catalogue: families, variants and performance data.
// Pure and deterministic (seeded PRNG per part number). Every rated figure of a variant is read off
// its own top-tap performance data at its rated supply through the engineering core, never typed.
// See docs/demo-data.md for what is invented and how the curves were made.
import {
  breakdownTorque,
  evaluateMotor,
  prepareMotor,
  syncRpm,
  type CircuitMotor,
  type CurveMotor,
  type CurvePoint,
  type MotorModel,
  type Supply,
} from '../../shared/engineering'
import type {
  Enclosure,
  FamilySpec,
  InsulationClassCode,
  Lifecycle,
  Mounting,
  MotorType,
  PerformanceSpec,
  Protection,
  VariantSpec,
} from '../../shared/contracts/catalogue.contract'

// ---------------------------------------------------------------- deterministic randomness

/** 32-bit FNV-1a hash of a string, the seed of each part number's random stream. */
export function hashSeed(text: string): number {
  let h = 0x811c9dc5
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i)
    h = Math.imul(h, 0x01000193) >>> 0
  }
  return h
}

/** Mulberry32: a small, fast 32-bit PRNG; good enough for demo data, fully reproducible. */
export class Rng {
  private state: number
  constructor(seed: number) {
    this.state = seed >>> 0
  }

  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0
    let t = this.state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }

  range(lo: number, hi: number): number {
    return lo + (hi - lo) * this.next()
  }

  /** x times (1 + u), u uniform in [-frac, frac]. */
  jitter(x: number, frac: number): number {
    return x * (1 + this.range(-frac, frac))
  }

  chance(p: number): boolean {
    return this.next() < p
  }

  pick<T>(items: readonly T[]): T {
    const item = items[Math.floor(this.next() * items.length)] ?? items[0]
    if (item === undefined) throw new Error('Rng.pick: empty list')
    return item
  }

  shuffle<T>(items: readonly T[]): T[] {
    const out = [...items]
    for (let i = out.length - 1; i > 0; i--) {
      const j = Math.floor(this.next() * (i + 1))
      const a = out[i]
      const b = out[j]
      if (a !== undefined && b !== undefined) {
        out[i] = b
        out[j] = a
      }
    }
    return out
  }
}

// ---------------------------------------------------------------- supplies and lines

export const SUPPLY_CODES = {
  /** 120 V 60 Hz (North America). */
  A6: { volts: 120, hz: 60, dual: false },
  /** 230 V 50 Hz (Europe and most of the world). */
  E5: { volts: 230, hz: 50, dual: false },
  /** 230 V 60 Hz. */
  E6: { volts: 230, hz: 60, dual: false },
  /** 100 V, rated at 60 Hz and also at 50 Hz (both halves of Japan's grid). */
  JD: { volts: 100, hz: 60, dual: true },
} as const
export type SupplyCode = keyof typeof SUPPLY_CODES

interface LineDef {
  name: string
  type: MotorType
  /** How the line is built, used in names ("C-frame shaded-pole"). */
  style: string
  description: string
  mountings: readonly Mounting[]
  enclosures: readonly Enclosure[]
  insulation: readonly InsulationClassCode[]
  protection: (outputW: number, rng: Rng) => Protection
  ambientC: readonly number[]
  shaftsMm: readonly number[]
  /** Shaded-pole: depth of the third-harmonic saddle as a fraction of breakdown torque, and how often it shows. */
  dip?: { depth: readonly [number, number]; share: number }
  /** PSC: speed taps per variant, and the share of variants published as measured curves. */
  taps?: readonly number[]
  curveShare?: number
}

const spProtection = (outputW: number): Protection => (outputW <= 25 ? 'impedance' : 'auto-reset')
const pscProtection =
  (manualShare: number) =>
  (_outputW: number, rng: Rng): Protection =>
    rng.chance(manualShare) ? 'manual-reset' : 'auto-reset'

const LINES = {
  WR: {
    name: 'Wren',
    type: 'shaded-pole',
    style: 'C-frame shaded-pole',
    description: 'Open C-frame (skeleton) shaded-pole motors for small blowers, bath fans and appliance cooling. Impedance protected.',
    mountings: ['stud', 'bracket'],
    enclosures: ['open'],
    insulation: ['A', 'E', 'B'],
    protection: spProtection,
    ambientC: [40, 45, 50],
    shaftsMm: [5, 6],
    dip: { depth: [0.1, 0.25], share: 0.6 },
  },
  TN: {
    name: 'Tern',
    type: 'shaded-pole',
    style: 'round-frame shaded-pole',
    description: 'Round-frame shaded-pole motors with sleeve bearings, for axial fans and small centrifugal blowers.',
    mountings: ['through-bolt', 'stud', 'resilient-ring'],
    enclosures: ['open', 'air-over'],
    insulation: ['E', 'B'],
    protection: spProtection,
    ambientC: [40, 50, 55],
    shaftsMm: [6, 8],
    dip: { depth: [0.12, 0.3], share: 0.7 },
  },
  PV: {
    name: 'Plover',
    type: 'shaded-pole',
    style: 'air-over evaporator shaded-pole',
    description: 'Air-over shaded-pole motors for refrigeration evaporator and condenser fans; need the fan airstream for cooling.',
    mountings: ['bracket', 'stud'],
    enclosures: ['air-over'],
    insulation: ['B', 'F'],
    protection: spProtection,
    ambientC: [40, 50],
    shaftsMm: [5, 6, 8],
    dip: { depth: [0.1, 0.2], share: 0.5 },
  },
  LN: {
    name: 'Linnet',
    type: 'shaded-pole',
    style: 'compact shaded-pole',
    description: 'Compact shaded-pole motors of a few watts for humidifiers, air purifiers and display fans.',
    mountings: ['stud', 'bracket'],
    enclosures: ['open'],
    insulation: ['A', 'E'],
    protection: spProtection,
    ambientC: [40, 45],
    shaftsMm: [5],
    dip: { depth: [0.08, 0.2], share: 0.5 },
  },
  SH: {
    name: 'Shrike',
    type: 'shaded-pole',
    style: 'unskewed shaded-pole',
    description: 'Earlier shaded-pole design with an unskewed rotor and a pronounced torque saddle near a third of synchronous speed. Kept for service replacement.',
    mountings: ['through-bolt', 'stud'],
    enclosures: ['open'],
    insulation: ['A', 'E'],
    protection: spProtection,
    ambientC: [40],
    shaftsMm: [6, 8],
    dip: { depth: [0.5, 0.62], share: 1 },
  },
  DN: {
    name: 'Dunlin',
    type: 'shaded-pole',
    style: 'two-pole shaded-pole',
    description: 'Two-pole shaded-pole motors for small high-pressure blowers (burner and dryer fans).',
    mountings: ['through-bolt', 'flange'],
    enclosures: ['open'],
    insulation: ['B', 'F'],
    protection: spProtection,
    ambientC: [40, 50, 60],
    shaftsMm: [6, 8],
    dip: { depth: [0.1, 0.2], share: 0.4 },
  },
  KS: {
    name: 'Kestrel',
    type: 'psc',
    style: 'four-pole PSC blower motor',
    description: 'Open four-pole PSC motors for centrifugal blowers, with speed taps and a run capacitor. Automatic-reset thermal protector.',
    mountings: ['resilient-ring', 'belly-band', 'through-bolt'],
    enclosures: ['open'],
    insulation: ['B', 'F'],
    protection: pscProtection(0.1),
    ambientC: [40, 50, 60],
    shaftsMm: [8, 12.7],
    taps: [3, 3, 4],
    curveShare: 0.15,
  },
  OS: {
    name: 'Osprey',
    type: 'psc',
    style: 'six-pole PSC fan motor',
    description: 'Six-pole PSC motors for axial fans and quiet blowers; air-over versions need the fan airstream for cooling.',
    mountings: ['through-bolt', 'flange', 'belly-band'],
    enclosures: ['air-over', 'open'],
    insulation: ['B', 'F'],
    protection: pscProtection(0.15),
    ambientC: [40, 50, 60],
    shaftsMm: [8, 12.7],
    taps: [2, 3, 3],
    curveShare: 0.15,
  },
  MR: {
    name: 'Merlin',
    type: 'psc',
    style: 'two-pole PSC motor',
    description: 'Two-pole PSC motors for high-pressure blowers and pumps-style fan duties.',
    mountings: ['flange', 'through-bolt'],
    enclosures: ['open'],
    insulation: ['F'],
    protection: pscProtection(0.4),
    ambientC: [40, 50],
    shaftsMm: [8, 12.7],
    taps: [2],
    curveShare: 0.1,
  },
  HR: {
    name: 'Heron',
    type: 'psc',
    style: 'range-hood PSC blower motor',
    description: 'PSC blower motors for range hoods and kitchen extract, four and six poles, three or four speed taps.',
    mountings: ['belly-band', 'flange', 'resilient-ring'],
    enclosures: ['open'],
    insulation: ['B', 'F'],
    protection: pscProtection(0.1),
    ambientC: [50, 60, 65],
    shaftsMm: [8, 12.7],
    taps: [3, 4],
    curveShare: 0.2,
  },
  FM: {
    name: 'Fulmar',
    type: 'psc',
    style: 'air-over PSC condenser fan motor',
    description: 'Air-over six-pole PSC motors for condenser and heat-pump fans, for hot ambient; need the fan airstream for cooling.',
    mountings: ['through-bolt', 'belly-band'],
    enclosures: ['air-over'],
    insulation: ['F', 'H'],
    protection: pscProtection(0.2),
    ambientC: [55, 60, 65],
    shaftsMm: [12.7],
    taps: [2, 3],
    curveShare: 0.1,
  },
  PT: {
    name: 'Petrel',
    type: 'psc',
    style: 'PSC motor (measured curves)',
    description: 'PSC motors published with measured torque-speed curves per tap rather than an equivalent circuit.',
    mountings: ['through-bolt', 'resilient-ring'],
    enclosures: ['open', 'air-over'],
    insulation: ['B', 'F'],
    protection: pscProtection(0.5),
    ambientC: [40, 50],
    shaftsMm: [8, 12.7],
    taps: [3],
    curveShare: 1,
  },
} as const satisfies Record<string, LineDef>
type LineKey = keyof typeof LINES

interface FamilyDef {
  line: LineKey
  frameMm: number
  stacksMm: readonly number[]
  poles: readonly number[]
  supplies: readonly SupplyCode[]
  lifecycle?: Lifecycle
  /** At most this many variants (a deterministic selection of the combinations). */
  max?: number
}

/** The demo families: shaded-pole frames 60-100 mm, PSC frames 100-150 mm. */
const FAMILIES: readonly FamilyDef[] = [
  // Shaded-pole
  { line: 'LN', frameMm: 60, stacksMm: [10, 14], poles: [4], supplies: ['A6', 'E5', 'JD'] },
  { line: 'LN', frameMm: 64, stacksMm: [12, 16], poles: [4, 2], supplies: ['A6', 'E5'] },
  { line: 'WR', frameMm: 62, stacksMm: [13, 18], poles: [4], supplies: ['A6', 'E5', 'E6'] },
  { line: 'WR', frameMm: 68, stacksMm: [15, 20], poles: [4], supplies: ['A6', 'E5', 'JD'] },
  { line: 'WR', frameMm: 72, stacksMm: [16, 22], poles: [4, 6], supplies: ['A6', 'E5'] },
  { line: 'WR', frameMm: 78, stacksMm: [18, 25], poles: [4], supplies: ['A6', 'E5', 'E6', 'JD'] },
  { line: 'WR', frameMm: 84, stacksMm: [20, 28], poles: [4, 2], supplies: ['A6', 'E5'] },
  { line: 'TN', frameMm: 70, stacksMm: [15, 20], poles: [4], supplies: ['A6', 'E5', 'E6'] },
  { line: 'TN', frameMm: 76, stacksMm: [18, 24], poles: [4, 6], supplies: ['A6', 'E5'] },
  { line: 'TN', frameMm: 83, stacksMm: [20, 27], poles: [4], supplies: ['A6', 'E5', 'JD'] },
  { line: 'TN', frameMm: 89, stacksMm: [22, 30], poles: [4, 6], supplies: ['A6', 'E5'] },
  { line: 'TN', frameMm: 95, stacksMm: [25, 32], poles: [4], supplies: ['A6', 'E5', 'E6'] },
  { line: 'TN', frameMm: 100, stacksMm: [28, 36], poles: [4, 6], supplies: ['A6', 'E5'] },
  { line: 'PV', frameMm: 76, stacksMm: [14, 18], poles: [4], supplies: ['A6', 'E5', 'E6'] },
  { line: 'PV', frameMm: 82, stacksMm: [16, 20], poles: [4], supplies: ['A6', 'E5', 'JD'] },
  { line: 'PV', frameMm: 86, stacksMm: [18, 24], poles: [4, 6], supplies: ['A6', 'E5'] },
  { line: 'SH', frameMm: 80, stacksMm: [20, 25], poles: [4], supplies: ['A6', 'E5'], lifecycle: 'not-for-new-designs' },
  { line: 'SH', frameMm: 90, stacksMm: [24, 30], poles: [4], supplies: ['A6', 'E5'], lifecycle: 'discontinued' },
  { line: 'DN', frameMm: 72, stacksMm: [16, 22], poles: [2], supplies: ['A6', 'E5', 'E6'] },
  { line: 'DN', frameMm: 84, stacksMm: [20, 26], poles: [2], supplies: ['A6', 'E5', 'JD'] },
  // PSC
  { line: 'KS', frameMm: 104, stacksMm: [20, 28], poles: [4], supplies: ['A6', 'JD', 'E6'] },
  { line: 'KS', frameMm: 112, stacksMm: [22, 30, 38], poles: [4], supplies: ['A6', 'E5'] },
  { line: 'KS', frameMm: 120, stacksMm: [25, 35], poles: [4], supplies: ['A6', 'E5', 'E6', 'JD'] },
  { line: 'KS', frameMm: 127, stacksMm: [30, 40, 50], poles: [4], supplies: ['A6', 'E5'] },
  { line: 'KS', frameMm: 136, stacksMm: [35, 50], poles: [4], supplies: ['A6', 'E5', 'E6'] },
  { line: 'OS', frameMm: 112, stacksMm: [25, 35], poles: [6], supplies: ['A6', 'E5', 'JD'] },
  { line: 'OS', frameMm: 120, stacksMm: [30, 40], poles: [6], supplies: ['A6', 'E5', 'E6'] },
  { line: 'OS', frameMm: 127, stacksMm: [30, 45], poles: [6], supplies: ['A6', 'E5'] },
  { line: 'OS', frameMm: 136, stacksMm: [35, 50], poles: [6], supplies: ['A6', 'E5', 'E6'] },
  { line: 'OS', frameMm: 146, stacksMm: [40, 55], poles: [6], supplies: ['A6', 'E5'], lifecycle: 'not-for-new-designs' },
  { line: 'MR', frameMm: 102, stacksMm: [20, 28], poles: [2], supplies: ['A6', 'E5', 'E6'] },
  { line: 'MR', frameMm: 114, stacksMm: [25, 35], poles: [2], supplies: ['A6', 'E5'] },
  { line: 'MR', frameMm: 127, stacksMm: [30, 40], poles: [2], supplies: ['A6', 'E5', 'E6'] },
  { line: 'HR', frameMm: 112, stacksMm: [25, 32, 40], poles: [4, 6], supplies: ['A6'], max: 6 },
  { line: 'HR', frameMm: 120, stacksMm: [28, 36, 44], poles: [4, 6], supplies: ['A6', 'JD'], max: 8 },
  { line: 'HR', frameMm: 130, stacksMm: [32, 42], poles: [4, 6], supplies: ['A6', 'E5'], max: 8 },
  { line: 'FM', frameMm: 127, stacksMm: [35, 45], poles: [6], supplies: ['A6', 'E5', 'E6'] },
  { line: 'FM', frameMm: 140, stacksMm: [40, 55], poles: [6], supplies: ['A6', 'E5'] },
  { line: 'FM', frameMm: 150, stacksMm: [45, 60], poles: [6, 4], supplies: ['A6', 'E5'], max: 8 },
  { line: 'PT', frameMm: 108, stacksMm: [22, 30], poles: [4, 6], supplies: ['A6', 'E5'], max: 6 },
  { line: 'PT', frameMm: 118, stacksMm: [28, 38], poles: [4, 6], supplies: ['A6', 'E5'], max: 6 },
  { line: 'PT', frameMm: 130, stacksMm: [30, 42], poles: [4], supplies: ['A6', 'E5', 'E6'], lifecycle: 'discontinued' },
]

// ---------------------------------------------------------------- numeric helpers

const clamp = (x: number, lo: number, hi: number): number => Math.min(hi, Math.max(lo, x))
/** Round to n significant figures. */
export function roundSig(x: number, n: number): number {
  if (x === 0 || !Number.isFinite(x)) return x
  const p = Math.pow(10, n - 1 - Math.floor(Math.log10(Math.abs(x))))
  return Math.round(x * p) / p
}
const round = (x: number, digits: number): number => {
  const p = Math.pow(10, digits)
  return Math.round(x * p) / p
}

/** Preferred run-capacitor values, uF (common practice for motor run capacitors). */
const CAPACITORS_UF = [2, 2.5, 3, 3.5, 4, 5, 6, 7.5, 8, 10, 12.5, 15] as const
const nearestCapacitor = (uF: number): number =>
  CAPACITORS_UF.reduce((best, c) => (Math.abs(Math.log(c / uF)) < Math.abs(Math.log(best / uF)) ? c : best), 5)

/** Speed taps from fastest to slowest; the first is the top tap that the rated figures come from. */
const TAP_NAMES: Record<number, readonly string[]> = {
  1: ['SINGLE'],
  2: ['HI', 'LO'],
  3: ['HI', 'MED', 'LO'],
  4: ['HI', 'MH', 'ML', 'LO'],
}
/** Main-winding turns of each tap relative to the top tap. */
const TAP_TURNS: Record<number, readonly number[]> = {
  1: [1],
  2: [1, 1.3],
  3: [1, 1.17, 1.38],
  4: [1, 1.12, 1.26, 1.45],
}

// ---------------------------------------------------------------- rated figures through the core

export interface RatedFigures {
  ratedOutputW: number
  ratedRpm: number
  ratedCurrentA: number
  ratedInputW: number
  lockedRotorTorqueNm: number
  breakdownTorqueNm: number
  breakdownRpm: number
}

/**
 * The rated point of a motor on a supply: the speed on the stable branch (between the speed of
 * maximum output and synchronous speed, where output falls as speed rises) at which the shaft
 * output equals `outputW`; the current and input there; locked-rotor torque at 0 r/min and the
 * breakdown torque of the core. Throws if the motor cannot give that output on its stable branch.
 */
export function ratedFiguresAt(motor: MotorModel, supply: Supply, outputW: number): RatedFigures {
  const prepared = prepareMotor(motor)
  const ns = syncRpm(motor.poles, supply.hz)
  const bd = breakdownTorque(prepared, supply)
  const out = (n: number): number => evaluateMotor(prepared, supply, n).outputW ?? 0
  const { nMax, pMax } = maxStableOutput(motor, supply)
  if (!(outputW < pMax)) throw new Error(`rated output ${outputW} W is above the motor's maximum ${pMax.toFixed(2)} W`)
  let lo = nMax
  let hi = ns
  for (let i = 0; i < 80; i++) {
    const mid = 0.5 * (lo + hi)
    if (out(mid) > outputW) lo = mid
    else hi = mid
  }
  const ratedRpm = 0.5 * (lo + hi)
  const e = evaluateMotor(prepared, supply, ratedRpm)
  return {
    ratedOutputW: outputW,
    ratedRpm,
    ratedCurrentA: e.currentA ?? 0,
    ratedInputW: e.inputW ?? 0,
    lockedRotorTorqueNm: evaluateMotor(prepared, supply, 0).shaftTorqueNm,
    breakdownTorqueNm: bd.torqueNm,
    breakdownRpm: bd.rpm,
  }
}

/** The largest shaft output at or above breakdown speed, and its speed (scan of 200 steps). */
export function maxStableOutput(motor: MotorModel, supply: Supply): { nMax: number; pMax: number } {
  const prepared = prepareMotor(motor)
  const ns = syncRpm(motor.poles, supply.hz)
  const bd = breakdownTorque(prepared, supply)
  const out = (n: number): number => evaluateMotor(prepared, supply, n).outputW ?? 0
  let nMax = bd.rpm
  let pMax = out(nMax)
  for (let i = 1; i <= 200; i++) {
    const n = bd.rpm + ((ns - bd.rpm) * i) / 200
    const p = out(n)
    if (p > pMax) {
      pMax = p
      nMax = n
    }
  }
  return { nMax, pMax }
}

/** Round down to two significant figures (a rating is never above what the motor gives). */
const floorSig2 = (x: number): number => {
  const p = Math.pow(10, 1 - Math.floor(Math.log10(x)))
  return Math.floor(x * p + 1e-9) / p
}

// ---------------------------------------------------------------- PSC motors

interface PscDesign {
  /** The top tap's circuit; lower taps are derived from it. */
  top: CircuitMotor
  designSlip: number
}

/**
 * A PSC fan motor's circuit, per unit on Z_base = 1.9 V^2 / P (P the size of the frame and stack).
 * Small motors carry relatively more resistance (lower efficiency, common practice). The capacitor
 * is the preferred value nearest the one that roughly balances the windings, and the aux turns
 * ratio is set so that this value suits the motor.
 */
function designPsc(poles: number, volts: number, hz: number, sizeW: number, rng: Rng): PscDesign {
  const zBase = (1.9 * volts * volts) / sizeW
  const rpu = rng.jitter(1.42 - (0.3 * Math.log(sizeW / 15)) / Math.log(250 / 15), 0.05)
  const xmPu = rng.jitter(poles === 2 ? 1.2 : poles === 4 ? 0.85 : 0.62, 0.05)
  const xLeak = rng.jitter(0.045, 0.08)
  // Capacitor for an aux winding of turns ratio 1 (Xc about 0.8 Z_base), then the turns ratio that suits a preferred value.
  const c1 = 1e6 / (2 * Math.PI * hz * 0.8 * zBase)
  const capacitorUf = nearestCapacitor(clamp(c1 / 1.69, 2, 15))
  const a = clamp(Math.sqrt(c1 / capacitorUf), 0.7, 2.4)
  const top: CircuitMotor = {
    model: 'circuit',
    poles,
    ratedHz: hz,
    r1: roundSig(0.06 * zBase * rpu, 4),
    x1: roundSig(xLeak * zBase, 4),
    r2: roundSig(0.085 * zBase * rpu * rng.jitter(1, 0.05), 4),
    x2: roundSig(xLeak * zBase, 4),
    xm: roundSig(xmPu * zBase, 4),
    coreLossW: roundSig(rng.jitter(0.04, 0.1) * sizeW, 3),
    frictionW: roundSig(rng.jitter(0.02, 0.2) * sizeW, 3),
    aux: {
      r: roundSig(0.066 * zBase * a * a * rpu, 4),
      x: roundSig(xLeak * zBase * a * a, 4),
      turnsRatio: roundSig(a, 3),
      capacitorUf,
    },
  }
  return { top, designSlip: rng.range(0.095, 0.12) }
}

/**
 * A lower speed tap: the main winding with t times the turns. Every main-winding quantity (and the
 * rotor and magnetising branch referred to it) goes with t^2, the aux winding and capacitor are
 * unchanged and its turns ratio to the main winding falls to a / t. The volts per turn fall by t.
 */
function tapCircuit(top: CircuitMotor, t: number): CircuitMotor {
  if (t === 1) return top
  const t2 = t * t
  const aux = top.aux
  const out: CircuitMotor = {
    ...top,
    r1: roundSig(top.r1 * t2, 4),
    x1: roundSig(top.x1 * t2, 4),
    r2: roundSig(top.r2 * t2, 4),
    x2: roundSig(top.x2 * t2, 4),
    xm: roundSig(top.xm * t2, 4),
  }
  if (aux) out.aux = { ...aux, turnsRatio: roundSig(aux.turnsRatio / t, 3) }
  return out
}

/** Speeds, as fractions of synchronous speed, at which curves are published. */
const PSC_CURVE_U = [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.68, 0.75, 0.8, 0.84, 0.87, 0.9, 0.92, 0.94, 0.96, 0.98, 1] as const

/**
 * A "measured" curve made from a circuit: the core evaluates torque, current and input at fixed
 * speeds; a little invented measurement noise is added; then the curve is made plausible as a test
 * would publish it: torque non-decreasing up to its peak and falling after it, current falling
 * with speed, never negative.
 */
function curveFromCircuit(circuit: CircuitMotor, supply: Supply, rng: Rng): CurveMotor {
  const ns = syncRpm(circuit.poles, supply.hz)
  const prepared = prepareMotor(circuit)
  const raw = PSC_CURVE_U.map((u) => {
    const e = evaluateMotor(prepared, supply, u * ns)
    return {
      rpm: u === 1 ? ns : Math.round(u * ns),
      torqueNm: e.shaftTorqueNm * (u === 1 ? 1 : rng.jitter(1, 0.012)),
      currentA: (e.currentA ?? 0) * rng.jitter(1, 0.008),
      inputW: (e.inputW ?? 0) * rng.jitter(1, 0.01),
    }
  })
  let peak = 0
  raw.forEach((p, i) => {
    if (p.torqueNm > (raw[peak]?.torqueNm ?? -Infinity)) peak = i
  })
  for (let i = 1; i <= peak; i++) {
    const prev = raw[i - 1]
    const p = raw[i]
    if (prev && p && p.torqueNm < prev.torqueNm) p.torqueNm = prev.torqueNm * 1.001
  }
  for (let i = peak + 1; i < raw.length; i++) {
    const prev = raw[i - 1]
    const p = raw[i]
    if (prev && p && p.torqueNm >= prev.torqueNm) p.torqueNm = prev.torqueNm - 1e-4
  }
  for (let i = 1; i < raw.length; i++) {
    const prev = raw[i - 1]
    const p = raw[i]
    if (prev && p && p.currentA > prev.currentA) p.currentA = prev.currentA * 0.999
  }
  // A test stops short of synchronous speed where the shaft torque is about nil: the published
  // curve keeps the positive points and ends at 0 N m at n_s.
  const kept = raw.filter((p, i) => i === raw.length - 1 || i <= peak || p.torqueNm > 0)
  const last = kept[kept.length - 1]
  if (last) last.torqueNm = 0
  return {
    model: 'curve',
    poles: circuit.poles,
    ratedVolts: supply.volts,
    ratedHz: supply.hz,
    points: kept.map((p) => ({
      rpm: p.rpm,
      torqueNm: roundSig(p.torqueNm, 4),
      currentA: roundSig(Math.max(0, p.currentA), 4),
      inputW: roundSig(Math.max(0, p.inputW), 4),
    })),
  }
}

// ---------------------------------------------------------------- shaded-pole curves

/** Speeds (fractions of n_s) of the shaded-pole test points; 1/3 is a knot so a saddle's bottom is one. */
const SP_CURVE_U = [0, 0.08, 0.17, 0.25, 1 / 3, 0.42, 0.5, 0.58, 0.65, 0.72, 0.78, 0.84, 0.89, 0.94, 0.97, 1] as const

interface SpShape {
  /** Breakdown slip (breakdown near 70-80 % of n_s). */
  sb: number
  /** Locked-rotor torque over breakdown torque. */
  lockedRatio: number
  /** Saddle depth as a fraction of breakdown torque (0: none). */
  dip: number
}

/**
 * Normalised shaded-pole torque at u = n / n_s (peak about 1): a Kloss-type curve with a high
 * breakdown slip, lifted at low speed to the locked-rotor value, minus a Gaussian saddle centred on
 * a third of synchronous speed (the third space harmonic's synchronous speed). Zero at n_s.
 */
function spShape(u: number, shape: SpShape): number {
  const s = 1 - u
  const kloss = (x: number): number => (x <= 0 ? 0 : 2 / (x / shape.sb + shape.sb / x))
  const lift = (shape.lockedRatio - kloss(1)) * s * s * s
  const saddle = shape.dip * Math.exp(-Math.pow((u - 1 / 3) / 0.075, 2))
  return kloss(s) + lift - saddle
}

interface SpDesign {
  curve: CurveMotor
  designRpm: number
}

/**
 * A shaded-pole "measured" curve: torque from the shape scaled so that the output at the design
 * slip is `sizeW`; input power nearly flat (higher at standstill) such that the efficiency at the
 * design point is `efficiency`; current from input and a low power factor.
 */
function designSpCurve(poles: number, supply: Supply, sizeW: number, efficiency: number, designSlip: number, shape: SpShape, rng: Rng): SpDesign {
  const ns = syncRpm(poles, supply.hz)
  const ur = 1 - designSlip
  const designRpm = ur * ns
  const wr = (designRpm * 2 * Math.PI) / 60
  const peakT = sizeW / (wr * spShape(ur, shape))
  const inputR = sizeW / efficiency
  const pf = rng.range(0.48, 0.62)
  const currentR = inputR / (supply.volts * pf)
  // Input: 0.88 of rated at n_s, about 1.3 at standstill; current rises a little less.
  const pIn = Math.log(0.12 / 0.42) / Math.log(designSlip)
  const inputAt = (u: number): number => inputR * (0.88 + 0.42 * Math.pow(1 - u, pIn))
  const currentAt = (u: number): number => currentR * (0.92 + 0.26 * Math.pow(1 - u, pIn))
  const points: CurvePoint[] = SP_CURVE_U.map((u) => {
    const noise = u === 1 ? 1 : rng.jitter(1, 0.012)
    return {
      rpm: u === 1 ? ns : Math.round(u * ns * 10) / 10,
      torqueNm: u === 1 ? 0 : roundSig(peakT * spShape(u, shape) * noise, 4),
      currentA: roundSig(currentAt(u) * rng.jitter(1, 0.006), 4),
      inputW: roundSig(inputAt(u) * rng.jitter(1, 0.008), 4),
    }
  })
  // Plausible as published: falling torque on the stable branch beyond the peak.
  let peak = 0
  points.forEach((p, i) => {
    if (p.torqueNm > (points[peak]?.torqueNm ?? -Infinity)) peak = i
  })
  for (let i = peak + 1; i < points.length - 1; i++) {
    const prev = points[i - 1]
    const p = points[i]
    if (prev && p && p.torqueNm >= prev.torqueNm) p.torqueNm = roundSig(prev.torqueNm * 0.99, 4)
  }
  return { curve: { model: 'curve', poles, ratedVolts: supply.volts, ratedHz: supply.hz, points }, designRpm }
}

// ---------------------------------------------------------------- the catalogue

export interface DemoCatalogue {
  families: FamilySpec[]
  variants: VariantSpec[]
  performance: PerformanceSpec[]
}

const supplyLabel = (code: SupplyCode): string => {
  const s = SUPPLY_CODES[code]
  return s.dual ? `${s.volts} V 50/60 Hz` : `${s.volts} V ${s.hz} Hz`
}

function familyCode(def: FamilyDef): string {
  return `${def.line}-${def.frameMm}`
}

/** Part number: family code without its dash, poles and stack, supply code, e.g. "KS120-4P35-A6". */
export function partNumberOf(family: string, poles: number, stackMm: number, supply: SupplyCode): string {
  return `${family.replace('-', '')}-${poles}P${stackMm}-${supply}`
}

/** Output scale of a frame and stack in W (common practice: output grows with bore^2 x stack; these exponents are ours). */
function sizeOf(type: MotorType, frameMm: number, stackMm: number, poles: number, rng: Rng): number {
  if (type === 'shaded-pole') {
    const poleFactor = poles === 2 ? 1.3 : poles === 6 ? 0.7 : 1
    return rng.jitter(2 * Math.pow(frameMm / 60, 3.15) * (stackMm / 10) * poleFactor, 0.04)
  }
  const poleFactor = poles === 2 ? 1.35 : poles === 6 ? 0.72 : 1
  return rng.jitter(18 * Math.pow(frameMm / 100, 4.2) * (stackMm / 20) * poleFactor, 0.04)
}

/** Mass of the stator and rotor iron plus copper plus hardware, grams (steel 7.65 g/cm3, 55 % fill of the frame disc). */
function weightOf(frameMm: number, stackMm: number, copperG: number, type: MotorType): number {
  const iron = 7.65e-3 * ((Math.PI / 4) * frameMm * frameMm * stackMm) * 0.55
  const hardware = type === 'psc' ? 180 + 1.2 * frameMm : 40 + 0.6 * frameMm
  return Math.round(iron + copperG + hardware)
}

interface BuiltVariant {
  variant: VariantSpec
  performance: PerformanceSpec[]
}

function buildVariant(def: FamilyDef, family: FamilySpec, poles: number, stackMm: number, supplyCode: SupplyCode): BuiltVariant {
  const line: LineDef = LINES[def.line]
  const partNumber = partNumberOf(family.code, poles, stackMm, supplyCode)
  const rng = new Rng(hashSeed(partNumber))
  const sup = SUPPLY_CODES[supplyCode]
  const rated: Supply = { volts: sup.volts, hz: sup.hz }
  const supplies: Supply[] = sup.dual ? [rated, { volts: sup.volts, hz: 50 }] : [rated]
  const size = sizeOf(line.type, def.frameMm, stackMm, poles, rng)
  const performance: PerformanceSpec[] = []
  let taps: readonly string[]
  let ratedMotor: MotorModel
  let designRpm: number
  let capacitorUf: number | null = null
  let capacitorVac: number | null = null

  if (line.type === 'psc') {
    const tapCount = rng.pick(line.taps ?? [3])
    taps = TAP_NAMES[tapCount] ?? ['HI']
    const turns = TAP_TURNS[tapCount] ?? [1]
    const design = designPsc(poles, rated.volts, rated.hz, size, rng)
    const asCurve = rng.chance(line.curveShare ?? 0)
    capacitorUf = design.top.aux?.capacitorUf ?? null
    capacitorVac = rated.volts > 150 ? 440 : 370
    designRpm = syncRpm(poles, rated.hz) * (1 - design.designSlip)
    ratedMotor = design.top
    taps.forEach((tap, i) => {
      const circuit = tapCircuit(design.top, turns[i] ?? 1)
      for (const s of supplies) {
        const motor: MotorModel = asCurve ? curveFromCircuit(circuit, s, rng) : circuit
        if (i === 0 && s === rated) ratedMotor = motor
        performance.push({
          partNumber,
          tap,
          volts: s.volts,
          hz: s.hz,
          source: asCurve ? 'measured' : 'fitted',
          referenceTempC: 25,
          motor,
        })
      }
    })
  } else {
    taps = TAP_NAMES[1] ?? ['SINGLE']
    const dipDef = line.dip
    const shape: SpShape = {
      sb: rng.range(0.2, 0.27),
      lockedRatio: rng.range(0.55, 0.8),
      dip: dipDef && rng.chance(dipDef.share) ? rng.range(dipDef.depth[0], dipDef.depth[1]) : 0,
    }
    const effBase = 0.115 + (0.22 * clamp(Math.log(size / 2) / Math.log(20), 0, 1)) + (poles === 2 ? 0.02 : 0)
    const efficiency = clamp(rng.jitter(effBase, 0.06), 0.1, 0.35)
    const slipBase = poles === 2 ? 0.17 : poles === 6 ? 0.13 : 0.15
    const designSlip = clamp(rng.jitter(slipBase, 0.12), 0.1, shape.sb - 0.07)
    const source = rng.chance(0.7) ? 'measured' : 'datasheet'
    const first = designSpCurve(poles, rated, size, efficiency, designSlip, shape, rng)
    ratedMotor = first.curve
    designRpm = first.designRpm
    performance.push({ partNumber, tap: 'SINGLE', volts: rated.volts, hz: rated.hz, source, referenceTempC: 25, motor: first.curve })
    for (const s of supplies.slice(1)) {
      // At 50 Hz on the same volts the flux is higher: a little more torque, more input, similar shape.
      const other = designSpCurve(poles, s, size * 0.92, efficiency * 0.95, designSlip * 1.05, shape, rng)
      performance.push({ partNumber, tap: 'SINGLE', volts: s.volts, hz: s.hz, source, referenceTempC: 25, motor: other.curve })
    }
  }

  const designOut = evaluateMotor(ratedMotor, rated, designRpm).outputW ?? 0
  const { pMax } = maxStableOutput(ratedMotor, rated)
  const figures = ratedFiguresAt(ratedMotor, rated, floorSig2(Math.min(designOut, 0.95 * pMax)))
  const outputW = figures.ratedOutputW
  const copperMassG = Math.round(line.type === 'psc' ? 60 + 2.4 * outputW : 15 * Math.pow(outputW, 0.7))
  const mounting = rng.pick(line.mountings)
  const enclosure = rng.pick(line.enclosures)
  const shaftDiameterMm = line.type === 'psc' ? (def.frameMm >= 125 ? 12.7 : rng.pick(line.shaftsMm)) : rng.pick(line.shaftsMm)
  const variantLifecycle: Lifecycle = family.lifecycle !== 'active' ? family.lifecycle : rng.chance(0.05) ? 'not-for-new-designs' : 'active'
  const insulation = rng.pick(line.insulation)
  const typeWord = line.type === 'psc' ? 'PSC' : 'shaded-pole'
  const variant: VariantSpec = {
    partNumber,
    familyCode: family.code,
    name: `Ashcombe ${line.name} ${typeWord} ${def.frameMm} mm, ${stackMm} mm stack, ${poles}-pole, ${supplyLabel(supplyCode)}`,
    poles,
    ratedVolts: rated.volts,
    ratedHz: rated.hz === 50 ? 50 : 60,
    dualFrequency: sup.dual,
    ratedOutputW: outputW,
    ratedRpm: Math.round(figures.ratedRpm),
    ratedCurrentA: roundSig(figures.ratedCurrentA, 3),
    ratedInputW: roundSig(figures.ratedInputW, 3),
    lockedRotorTorqueNm: roundSig(figures.lockedRotorTorqueNm, 3),
    breakdownTorqueNm: roundSig(figures.breakdownTorqueNm, 3),
    frameDiameterMm: def.frameMm,
    stackLengthMm: stackMm,
    shaftDiameterMm,
    shaftLengthMm: shaftDiameterMm >= 12 ? rng.pick([40, 50, 60]) : rng.pick([20, 25, 30, 38]),
    mounting,
    rotation: rng.chance(0.6) ? 'ccw' : 'cw',
    rotationViewedFrom: rng.chance(0.75) ? 'shaft-end' : 'lead-end',
    // PSC motors reverse by swapping the capacitor's leads; a shaded-pole stator has to be turned over.
    otherRotationAvailable: line.type === 'psc' ? rng.chance(0.8) : rng.chance(0.35),
    enclosure,
    insulationClass: insulation,
    protection: line.protection(outputW, rng),
    maxAmbientC: rng.pick(line.ambientC),
    capacitorUf,
    capacitorVac,
    copperMassG,
    weightG: weightOf(def.frameMm, stackMm, copperMassG, line.type),
    moq: line.type === 'psc' ? rng.pick([100, 200, 250, 500]) : rng.pick([250, 500, 1000, 2000]),
    leadTimeDays: rng.pick([28, 35, 42, 56, 70, 84]),
    lifecycle: variantLifecycle,
    speedTaps: [...taps],
  }
  return { variant, performance }
}

/**
 * The demo catalogue of the invented Ashcombe Motor Works. Deterministic: two calls give equal
 * data. Families in order, then their variants, then the performance rows (top tap first).
 */
export function generateDemoCatalogue(): DemoCatalogue {
  const families: FamilySpec[] = []
  const variants: VariantSpec[] = []
  const performance: PerformanceSpec[] = []
  for (const def of FAMILIES) {
    const line: LineDef = LINES[def.line]
    const code = familyCode(def)
    const family: FamilySpec = {
      code,
      name: `Ashcombe ${line.name} ${line.style}, ${def.frameMm} mm frame`,
      type: line.type,
      description: line.description,
      lifecycle: def.lifecycle ?? 'active',
    }
    families.push(family)
    const combos: { poles: number; stackMm: number; supply: SupplyCode }[] = []
    for (const poles of def.poles) for (const stackMm of def.stacksMm) for (const supply of def.supplies) combos.push({ poles, stackMm, supply })
    const rng = new Rng(hashSeed(code))
    const chosen = def.max !== undefined && combos.length > def.max ? rng.shuffle(combos).slice(0, def.max) : combos
    const ordered = combos.filter((c) => chosen.includes(c))
    for (const c of ordered) {
      const built = buildVariant(def, family, c.poles, c.stackMm, c.supply)
      variants.push(built.variant)
      performance.push(...built.performance)
    }
  }
  return { families, variants, performance }
}

/** The performance row a variant's rated figures come from: its first (top) tap at its rated supply. */
export function ratedPerformanceOf(catalogue: DemoCatalogue, variant: VariantSpec): PerformanceSpec | undefined {
  const top = variant.speedTaps[0]
  return catalogue.performance.find(
    (p) => p.partNumber === variant.partNumber && p.tap === top && p.volts === variant.ratedVolts && p.hz === variant.ratedHz,
  )
}
