/**
 * Selection: filter the catalogue by a study's constraints, solve the operating point of every
 * candidate (variant x speed tap) on the study's fan and system at nominal, low-line and, for
 * circuit models, hot-winding supply, then warn and rank. Pure: the server feeds it the catalogue.
 * The rules are documented in docs/selection.md.
 */
import {
  EngineeringInputError,
  breakdownTorque,
  prepareLoad,
  syncRpm,
  solveBound,
  tabulateScan,
  hotMotor,
  type MotorModel,
  type OperatingPoint,
  type PreparedLoad,
  type PreparedMotor,
  type BoundMotor,
  type Supply,
  prepareMotor,
  insulationClass,
  FIXED_LOSS_KNEE,
  type FanLoad,
} from '../engineering'
import type { InsulationClassCode, Lifecycle, MotorType } from '../contracts/catalogue.contract'
import { INSULATION_CLASS_CODES } from '../contracts/catalogue.contract'
import type {
  Candidate,
  CandidateCurves,
  CandidateWarning,
  CurveSample,
  PointSummary,
  RunResult,
  StudyInput,
} from '../contracts/study.contract'
import { StudyInputError, studyLoad } from './air'

/** One performance row ready for solving. */
export interface CataloguePerformance {
  id: string
  tap: string
  volts: number
  hz: number
  referenceTempC: number
  motor: MotorModel
  prepared: PreparedMotor
  /** Breakdown torque at the row's own volts and Hz (scaled with (V/V_row)^2 for the study supply). */
  breakdownNm: number
  /**
   * Circuit models: the motor with its windings at the insulation class limit (copper stator
   * 234.5, die-cast aluminium rotor 225), the worst it may run; absent for measured curves.
   */
  hotPrepared?: PreparedMotor
  hotC?: number
  /**
   * No shaft torque at the row's volts exceeds this (breakdown torque, plus for circuit models the
   * most fixed-loss torque, which does not scale with voltage, plus 1 % for the breakdown scan);
   * scaled with (V/V_row)^2 it bounds the motor on the study supply. Used to skip hopeless solves.
   */
  torqueCeilingNm: number
}

export interface CatalogueEntry {
  variantId: string
  partNumber: string
  name: string
  type: MotorType
  poles: number
  ratedOutputW: number
  frameDiameterMm: number
  mounting: string
  enclosure: string
  rotation: 'cw' | 'ccw'
  rotationViewedFrom: 'shaft-end' | 'lead-end'
  otherRotationAvailable: boolean
  insulationClass: InsulationClassCode
  protection: string
  maxAmbientC: number
  lifecycle: Lifecycle
  performance: CataloguePerformance[]
}

/** A performance row as stored, before preparePerformance(). */
export type SourcePerformance = Pick<CataloguePerformance, 'id' | 'tap' | 'volts' | 'hz' | 'referenceTempC' | 'motor'>
/** A catalogue entry as stored: plain data (it crosses to worker threads), prepared by prepareEntry(). */
export type CatalogueSource = Omit<CatalogueEntry, 'performance'> & { performance: SourcePerformance[] }

/** What a catalogue source takes from a variant record as it is (a database row or the demo generator's). */
export type SourceVariant = Pick<
  CatalogueSource,
  'partNumber' | 'name' | 'poles' | 'ratedOutputW' | 'frameDiameterMm' | 'mounting' | 'enclosure' | 'rotation' | 'rotationViewedFrom' | 'otherRotationAvailable' | 'protection' | 'maxAmbientC' | 'lifecycle'
>

/** A catalogue source with no performance rows yet, from a variant record. */
export function catalogueSource(variantId: string, variant: SourceVariant, type: MotorType, insulationClass: InsulationClassCode): CatalogueSource {
  return {
    variantId,
    partNumber: variant.partNumber,
    name: variant.name,
    type,
    poles: variant.poles,
    ratedOutputW: variant.ratedOutputW,
    frameDiameterMm: variant.frameDiameterMm,
    mounting: variant.mounting,
    enclosure: variant.enclosure,
    rotation: variant.rotation,
    rotationViewedFrom: variant.rotationViewedFrom,
    otherRotationAvailable: variant.otherRotationAvailable,
    insulationClass,
    protection: variant.protection,
    maxAmbientC: variant.maxAmbientC,
    lifecycle: variant.lifecycle,
    performance: [],
  }
}

/**
 * The solver-ready entry. A row that the core refuses is left out of selection rather than
 * breaking every run, and reported to `refused`.
 */
export function prepareEntry(source: CatalogueSource, refused: (row: SourcePerformance, error: unknown) => void = () => undefined): CatalogueEntry {
  const performance: CataloguePerformance[] = []
  for (const row of source.performance) {
    try {
      performance.push(preparePerformance(row, source.insulationClass))
    } catch (error) {
      refused(row, error)
    }
  }
  return { ...source, performance }
}

/** Builds the solver-ready form of a performance row once (the server caches it per catalogue revision). */
export function preparePerformance(row: Omit<CataloguePerformance, 'prepared' | 'breakdownNm' | 'hotPrepared' | 'hotC' | 'torqueCeilingNm'>, insulation?: InsulationClassCode): CataloguePerformance {
  const prepared = prepareMotor(row.motor)
  const breakdownNm = breakdownTorque(prepared, { volts: row.volts, hz: row.hz }).torqueNm
  const torqueCeilingNm = 1.01 * (Math.max(0, breakdownNm) + fixedLossTorqueMax(row.motor, row.hz))
  const hotC = insulation ? insulationClass(insulation)?.classC : undefined
  if (row.motor.model !== 'circuit' || hotC === undefined) return { ...row, prepared, breakdownNm, torqueCeilingNm }
  const hot = prepareMotor(hotMotor(row.motor, { referenceC: row.referenceTempC, hotC, rotorConstant: 225 }))
  return { ...row, prepared, breakdownNm, torqueCeilingNm, hotPrepared: hot, hotC }
}

/**
 * The largest torque a circuit model's fixed losses take (at the knee, where the drag torque
 * P_fixed / w peaks; see machine.ts); a measured curve already is shaft torque.
 */
function fixedLossTorqueMax(motor: MotorModel, hz: number): number {
  if (motor.model !== 'circuit') return 0
  const knee = (FIXED_LOSS_KNEE * syncRpm(motor.poles, hz) * 2 * Math.PI) / 60
  return ((motor.coreLossW ?? 0) + (motor.frictionW ?? 0)) / knee
}

/**
 * What a motor must at least deliver for the nominal flow to reach the requirement: fan flow
 * rises with speed (the system curve meets the fan further right as speed rises), so meeting it
 * needs n_op >= nRequired, where the motor's torque equals the load's. Where the load torque never
 * falls with speed (no offset: T goes with n^2; with an offset only if the fan's shaft power rises
 * with flow) the motor needs T_motor >= T_load(nRequired) somewhere at or above nRequired. A
 * motor whose torque ceiling stays under that, or whose synchronous speed is below nRequired,
 * cannot meet the duty at nominal supply: its tier is 2 or worse, decided without a solve.
 * Null when the load gives no such guarantee (then every candidate is solved).
 */
export interface ShortfallTest {
  nRequired: number
  torqueAtRequired: number
}

export function shortfallTest(load: PreparedLoad, fanLoad: FanLoad, requiredFlow: number, hz: number): ShortfallTest | null {
  const points = fanLoad.fan.points
  const powerRises = points.every((point, i) => i === 0 || point.shaftW >= (points[i - 1]?.shaftW ?? 0))
  if ((fanLoad.system.offsetPa ?? 0) > 0 && !powerRises) return null
  // No motor runs faster than a 2-pole one's synchronous speed, nor the load beyond its curve.
  const top = Math.min(load.maxRpm, syncRpm(2, hz))
  const flowAt = (rpm: number) => load.evaluate(rpm).flowM3s ?? 0
  if (flowAt(top) < requiredFlow) return { nRequired: Number.POSITIVE_INFINITY, torqueAtRequired: Number.POSITIVE_INFINITY }
  let lo = 0
  let hi = top
  for (let i = 0; i < 80 && hi - lo > 1e-9 * top; i++) {
    const mid = 0.5 * (lo + hi)
    if (flowAt(mid) >= requiredFlow) hi = mid
    else lo = mid
  }
  // lo is below the required speed (flow short there): the test stays a proof.
  return { nRequired: lo, torqueAtRequired: load.torque(lo) }
}

export function provablyShort(test: ShortfallTest, row: CataloguePerformance, poles: number, supply: Supply): boolean {
  if (syncRpm(poles, supply.hz) < test.nRequired) return true
  const kv = supply.volts / row.volts
  return row.torqueCeilingNm * kv * kv < test.torqueAtRequired
}

/**
 * The second, sharper proof, at the cost of one motor evaluation: a motor whose shaft torque at
 * nRequired is below the load's there is decelerating at that speed, so accelerating from
 * standstill it meets the load at a lower speed (or never starts): its nominal flow is short of
 * the requirement. Holds under the same premise as the first (load torque not falling with speed).
 */
export function shortAtRequired(test: ShortfallTest, motor: BoundMotor): boolean {
  return motor.torque(test.nRequired) < test.torqueAtRequired
}

/** Supplies within this fraction of a row's volts (same Hz) use that row, scaled by the core. */
export const SUPPLY_VOLTS_WINDOW = 0.1
/** Breakdown torque under this multiple of the running load torque earns a warning (common practice margin). */
export const BREAKDOWN_WARN_RATIO = 1.3
/** Candidates returned (the best ones); a catalogue of thousands would otherwise answer megabytes. */
export const CANDIDATE_LIMIT = 500
/** Curves returned for the charts. */
export const CHART_CANDIDATES = 12

export type SelectionResult = Omit<RunResult, 'ranAt' | 'durationMs' | 'catalogueRevision'>

function rankOfClass(code: string): number {
  return INSULATION_CLASS_CODES.findIndex((candidate) => candidate === code)
}

function facing(direction: 'cw' | 'ccw', from: 'shaft-end' | 'lead-end'): 'cw' | 'ccw' {
  // Seen from the other end the same rotation reads the other way round.
  if (from === 'shaft-end') return direction
  return direction === 'cw' ? 'ccw' : 'cw'
}

/** Significant digits of the figures a run answers with: more than any motor or fan datum holds. */
export const ANSWER_DIGITS = 6

/**
 * x to ANSWER_DIGITS significant digits, as the nearest double (prints as that decimal). A run's
 * answer carries thousands of figures: full doubles doubled its size, to no reader's use.
 */
export function sig(x: number): number {
  if (x === 0 || !Number.isFinite(x)) return x
  const places = ANSWER_DIGITS - 1 - Math.floor(Math.log10(Math.abs(x)))
  // Divide or multiply by an exact power of ten, so the result is the double nearest the decimal.
  if (places >= 0) {
    const f = 10 ** places
    return Math.round(x * f) / f
  }
  const f = 10 ** -places
  return Math.round(x / f) * f
}

function sigOrNull(x: number | undefined): number | null {
  return x === undefined ? null : sig(x)
}

function summary(point: OperatingPoint): PointSummary {
  return {
    status: point.status,
    rpm: sig(point.rpm),
    flowM3s: sig(point.flowM3s ?? 0),
    staticPa: sig(point.staticPa ?? 0),
    inputW: sigOrNull(point.inputW),
    currentA: sigOrNull(point.currentA),
    powerFactor: sigOrNull(point.powerFactor),
    efficiency: sigOrNull(point.efficiency),
    outputW: sig(point.outputW),
    shaftTorqueNm: sig(point.shaftTorqueNm),
    crawl: point.crawl,
    fanStall: point.fanStall ?? false,
  }
}

/** Supplies whose plans are kept per catalogue (the last ones asked for). */
const PLANNED_SUPPLIES = 8

/**
 * A catalogue's rows on one supply, flat and in catalogue order: the rows of entry i are
 * rows[first[i]] to rows[first[i + 1] - 1]. The figures the hopeless test reads sit in typed
 * arrays, so skipping a motor touches no row object (the test is memory-bound on big catalogues).
 */
interface SupplyPlan {
  first: Int32Array
  rows: CataloguePerformance[]
  /** Synchronous speed of the row's motor on the supply, r/min. */
  syncRpm: Float64Array
  /** The row's torque ceiling scaled to the supply, N m. */
  ceilingNm: Float64Array
  /** The row's motor bound to the supply (read straight from here, not through the motor's cache of bindings). */
  bound: BoundMotor[]
  /** The same rows bound to other supplies (a study's low line), by rowsOnSupply(). */
  elsewhere: Map<string, RowsOnSupply>
}

/** A plan's rows bound to another supply: each row's own motor and, for circuit models, its hot winding. */
interface RowsOnSupply {
  bound: BoundMotor[]
  hot: Array<BoundMotor | undefined>
}

/** Other supplies whose bindings a plan keeps (low line at the tolerances asked for lately). */
const OTHER_SUPPLIES = 4

const supplyKey = (supply: Supply): string => `${supply.volts}|${supply.hz}`

/** A motor bound to a supply with its scan from standstill tabulated, as a plan keeps it. */
function planned(motor: PreparedMotor, supply: Supply): BoundMotor {
  const bound = motor.bind(supply)
  tabulateScan(bound)
  return bound
}

/**
 * The plan's rows on `supply`, built once per plan and supply: the worst-case solves read their
 * motors from here in the order the ranking asks for them, without a lookup per solve.
 */
function rowsOnSupply(plan: SupplyPlan, supply: Supply): RowsOnSupply {
  const key = supplyKey(supply)
  const known = plan.elsewhere.get(key)
  if (known) return known
  if (plan.elsewhere.size >= OTHER_SUPPLIES) {
    const oldest = plan.elsewhere.keys().next().value
    if (oldest !== undefined) plan.elsewhere.delete(oldest)
  }
  const rows: RowsOnSupply = { bound: [], hot: [] }
  for (const row of plan.rows) {
    rows.bound.push(planned(row.prepared, supply))
    rows.hot.push(row.hotPrepared ? planned(row.hotPrepared, supply) : undefined)
  }
  plan.elsewhere.set(key, rows)
  return rows
}

const supplyPlans = new WeakMap<readonly CatalogueEntry[], Map<string, SupplyPlan>>()

/**
 * The plan of a catalogue on a supply, kept while the catalogue array lives: the server builds a
 * new array per catalogue revision and never changes one in place.
 */
function planOnSupply(catalogue: readonly CatalogueEntry[], supply: Supply): SupplyPlan {
  let bySupply = supplyPlans.get(catalogue)
  if (!bySupply) {
    bySupply = new Map()
    supplyPlans.set(catalogue, bySupply)
  }
  const key = supplyKey(supply)
  const known = bySupply.get(key)
  if (known) return known
  if (bySupply.size >= PLANNED_SUPPLIES) {
    const oldest = bySupply.keys().next().value
    if (oldest !== undefined) bySupply.delete(oldest)
  }
  const first = new Int32Array(catalogue.length + 1)
  const rows: CataloguePerformance[] = []
  const bound: BoundMotor[] = []
  const sync: number[] = []
  const ceiling: number[] = []
  for (const [index, entry] of catalogue.entries()) {
    first[index] = rows.length
    for (const row of pickRows(entry, supply)) {
      const kv = supply.volts / row.volts
      rows.push(row)
      bound.push(planned(row.prepared, supply))
      sync.push(syncRpm(entry.poles, supply.hz))
      ceiling.push(row.torqueCeilingNm * kv * kv)
    }
  }
  first[catalogue.length] = rows.length
  const plan: SupplyPlan = { first, rows, syncRpm: Float64Array.from(sync), ceilingNm: Float64Array.from(ceiling), bound, elsewhere: new Map() }
  bySupply.set(key, plan)
  return plan
}

/** Per tap, the row nearest the supply's volts at its Hz within SUPPLY_VOLTS_WINDOW (hot path: no maps). */
function pickRows(entry: CatalogueEntry, supply: Supply): CataloguePerformance[] {
  const picked: CataloguePerformance[] = []
  for (const row of entry.performance) {
    if (row.hz !== supply.hz) continue
    const off = Math.abs(supply.volts - row.volts)
    if (off / row.volts > SUPPLY_VOLTS_WINDOW) continue
    let same = -1
    for (let i = 0; i < picked.length; i++) if (picked[i]?.tap === row.tap) same = i
    if (same < 0) picked.push(row)
    else if (Math.abs(supply.volts - (picked[same] as CataloguePerformance).volts) > off) picked[same] = row
  }
  return picked
}

interface Excluded {
  reason: string
  count: number
}

function hardFilter(entry: CatalogueEntry, input: StudyInput): string | null {
  const c = input.constraints
  if (c.activeOnly && entry.lifecycle !== 'active') return 'not active (lifecycle)'
  if (c.motorTypes.length > 0 && !c.motorTypes.includes(entry.type)) return 'motor type'
  if (c.maxFrameDiameterMm !== undefined && entry.frameDiameterMm > c.maxFrameDiameterMm) return 'frame diameter'
  if (c.mountings.length > 0 && !c.mountings.some((mounting) => mounting === entry.mounting)) return 'mounting'
  if (c.enclosures.length > 0 && !c.enclosures.some((enclosure) => enclosure === entry.enclosure)) return 'enclosure'
  if (c.protections.length > 0 && !c.protections.some((protection) => protection === entry.protection)) return 'protection'
  if (c.rotation && !entry.otherRotationAvailable) {
    if (facing(c.rotation.direction, c.rotation.viewedFrom) !== facing(entry.rotation, entry.rotationViewedFrom)) return 'rotation'
  }
  return null
}

function sampleMotor(prepared: PreparedMotor, supply: Supply, points = 41): CurveSample[] {
  const bound = prepared.bind(supply)
  const samples: CurveSample[] = []
  for (let i = 0; i <= points - 1; i += 1) {
    const rpm = (bound.syncRpm * i) / (points - 1)
    samples.push({ rpm: sig(rpm), torqueNm: sig(bound.torque(rpm)) })
  }
  return samples
}

function sampleLoad(load: PreparedLoad, maxRpm: number, points = 61): CurveSample[] {
  const samples: CurveSample[] = []
  for (let i = 0; i <= points - 1; i += 1) {
    const rpm = (maxRpm * i) / (points - 1)
    samples.push({ rpm: sig(rpm), torqueNm: sig(load.evaluate(rpm).torqueNm) })
  }
  return samples
}

/** A candidate after its ranking solves; the rest of its figures are built only if it is returned. */
interface Scored {
  entry: CatalogueEntry
  row: CataloguePerformance
  /** The row's index in the plan (its motors on the low-line supply are at the same index there). */
  index: number
  nominal: OperatingPoint
  /** Solved when the nominal point meets the duty (the tier depends on it) or when returned. */
  lowLine?: OperatingPoint
  hot?: OperatingPoint
  /** The worst case was proven short of the duty without its solve (see settleWorstCase). */
  worstShort?: boolean
  tier: number
  score: number
}

const TIER_LABEL = ['meets the duty at worst case', 'meets at nominal only', 'runs below the duty', 'crawls in a torque dip', 'does not start'] as const

/**
 * Orders candidates: worst-case duty met first; within the meeting tiers the higher duty
 * efficiency (the air power the buyer asked for, Q_duty x p_duty, over the electrical input at
 * nominal supply), which also ranks a motor that overshoots the duty below one that just meets
 * it; below the duty, the higher flow. score = (4 - tier) x 1000 + a tie-breaker under 1000, so
 * higher is better and the order is the score's.
 */
function scoreOf(tier: number, nominal: OperatingPoint, duty: { flowM3s: number; staticPa: number }): number {
  const inputW = nominal.inputW ?? 0
  const dutyEfficiency = inputW > 0 ? (duty.flowM3s * duty.staticPa) / inputW : 0
  const within = tier <= 1 ? Math.min(999, dutyEfficiency * 999) : Math.min(999, ((nominal.flowM3s ?? 0) / duty.flowM3s) * 999)
  return (4 - tier) * 1000 + within
}

function runsClear(point: OperatingPoint | undefined): boolean {
  return point !== undefined && point.status === 'running' && !point.crawl
}

function nominalMeets(nominal: OperatingPoint, requiredFlow: number): boolean {
  return runsClear(nominal) && (nominal.flowM3s ?? 0) >= requiredFlow
}

/**
 * Low line, and the hot winding at low line only where it could still change the verdict (a cold
 * motor already short stays short hot). With a shortfall test, a motor proven short at low line
 * (or hot) by shortAtRequired() is settled without that solve: the solve could only confirm
 * it. The motors come bound to the low-line supply from the plan (rowsOnSupply).
 */
function settleWorstCase(item: Scored, load: PreparedLoad, low: RowsOnSupply, requiredFlow: number, shortfall: ShortfallTest | null): void {
  const motor = low.bound[item.index] as BoundMotor
  if (shortfall && shortAtRequired(shortfall, motor)) {
    item.worstShort = true
    return
  }
  const lowLine = solveBound(motor, load)
  item.lowLine = lowLine
  const hot = low.hot[item.index]
  if (!hot || !lowLineGood(lowLine, requiredFlow)) return
  if (shortfall && shortAtRequired(shortfall, hot)) {
    item.worstShort = true
    return
  }
  item.hot = solveBound(hot, load)
}

/** The worst-case points a returned candidate shows, whatever settled its tier. */
function completeWorstCase(item: Scored, load: PreparedLoad, low: RowsOnSupply, requiredFlow: number): void {
  item.lowLine ??= solveBound(low.bound[item.index] as BoundMotor, load)
  const hot = low.hot[item.index]
  if (hot && !item.hot && lowLineGood(item.lowLine, requiredFlow)) item.hot = solveBound(hot, load)
}

function lowLineGood(lowLine: OperatingPoint, requiredFlow: number): boolean {
  return runsClear(lowLine) && (lowLine.flowM3s ?? 0) >= requiredFlow
}

/** Meets the duty: at nominal and at the worst case (low line, hot winding where modelled), running clear of any torque dip. */
function meetsDutyOf(item: Scored, requiredFlow: number): boolean {
  if (item.worstShort || !nominalMeets(item.nominal, requiredFlow) || !runsClear(item.lowLine)) return false
  if (item.hot && !runsClear(item.hot)) return false
  return worstFlowOf(item) >= requiredFlow
}

function worstFlowOf(item: Scored): number {
  return Math.min(item.lowLine?.flowM3s ?? 0, item.hot?.flowM3s ?? Number.POSITIVE_INFINITY)
}

function tierOf(item: Scored, requiredFlow: number): number {
  const nominal = item.nominal
  if (nominal.status !== 'running') return 4
  if (nominal.crawl) return 3
  if (meetsDutyOf(item, requiredFlow)) return 0
  return nominalMeets(nominal, requiredFlow) ? 1 : 2
}

interface BuildContext {
  input: StudyInput
  supply: Supply
  lowSupply: Supply
  low: RowsOnSupply
  load: PreparedLoad
  requiredFlow: number
  minClass: InsulationClassCode | undefined
}

/** The full candidate (worst-case points, warnings, energy) for one that is returned. */
function buildCandidate(item: Scored, rank: number, context: BuildContext): Candidate {
  const { input, supply, lowSupply, requiredFlow, minClass } = context
  completeWorstCase(item, context.load, context.low, requiredFlow)
  const { entry, row, nominal } = item
  const lowLine = item.lowLine as OperatingPoint
  const hotPoint = item.hot
  const dutyFlow = input.duty.flowM3s
  const meetsDuty = item.tier === 0
  const isNominalMeeting = nominalMeets(nominal, requiredFlow)
  const worstFlow = worstFlowOf(item)
  const nominalFlow = nominal.flowM3s ?? 0

  const breakdownNm = row.breakdownNm * (supply.volts / row.volts) ** 2
  const breakdownMarginPct = nominal.status === 'running' && nominal.shaftTorqueNm > 0 ? (breakdownNm / nominal.loadTorqueNm - 1) * 100 : null
  const warnings: CandidateWarning[] = []
  if (nominal.status !== 'running') warnings.push({ code: 'no-start', message: 'Cannot start the fan: locked-rotor torque is below the load at standstill' })
  else if (lowLine.status !== 'running') warnings.push({ code: 'no-start', message: `Does not start at low line (${Math.round(lowSupply.volts)} V)` })
  if (nominal.crawl || lowLine.crawl) {
    warnings.push({ code: 'crawl', message: `Stuck in a torque dip at ${Math.round((nominal.crawl ? nominal : lowLine).rpm)} r/min${nominal.crawl ? '' : ' at low line'}; it would not reach full speed` })
  }
  if (breakdownMarginPct !== null && breakdownMarginPct < (BREAKDOWN_WARN_RATIO - 1) * 100) {
    warnings.push({ code: 'near-breakdown', message: `Breakdown torque only ${Math.round(breakdownMarginPct)} % above the load; a small rise in load or drop in voltage may stall it` })
  }
  if (nominal.fanStall || lowLine.fanStall) warnings.push({ code: 'fan-stall', message: 'The fan runs left of its pressure peak (stall region): noisy and unstable airflow' })
  if (isNominalMeeting && !meetsDuty) {
    warnings.push({ code: 'low-line-short', message: `Meets the duty at nominal supply but delivers ${Math.round((worstFlow / dutyFlow) * 100)} % of it at the worst case` })
  }
  if (input.ambient.temperatureC > entry.maxAmbientC) {
    warnings.push({ code: 'ambient-above-rating', message: `Ambient ${input.ambient.temperatureC} °C is above the motor's rating of ${entry.maxAmbientC} °C` })
  }
  if (minClass && rankOfClass(entry.insulationClass) < rankOfClass(minClass)) {
    warnings.push({ code: 'insulation-below-requirement', message: `Insulation class ${entry.insulationClass} is below the required class ${minClass}` })
  }
  if (input.constraints.maxInputW !== undefined && (nominal.inputW ?? 0) > input.constraints.maxInputW) {
    warnings.push({ code: 'input-above-limit', message: `Input ${Math.round(nominal.inputW ?? 0)} W is above the limit of ${input.constraints.maxInputW} W` })
  }
  if (entry.lifecycle === 'discontinued') warnings.push({ code: 'discontinued', message: 'Discontinued: not available for new orders' })
  if (entry.lifecycle === 'not-for-new-designs') warnings.push({ code: 'not-for-new-designs', message: 'Not for new designs: supplied for existing products only' })
  if (nominal.extrapolated) warnings.push({ code: 'extrapolated', message: 'The operating point lies beyond the measured data' })

  const inputW = nominal.status === 'running' ? (nominal.inputW ?? 0) : 0
  const kWh = (inputW * input.energy.hoursPerYear) / 1000
  return {
    rank,
    variantId: entry.variantId,
    partNumber: entry.partNumber,
    name: entry.name,
    type: entry.type,
    poles: entry.poles,
    tap: row.tap,
    frameDiameterMm: entry.frameDiameterMm,
    insulationClass: entry.insulationClass,
    lifecycle: entry.lifecycle,
    ratedOutputW: entry.ratedOutputW,
    nominal: summary(nominal),
    lowLine: summary(lowLine),
    hot: hotPoint ? summary(hotPoint) : null,
    meetsDuty,
    marginPct: sig((nominalFlow / dutyFlow - 1) * 100),
    lowLineMarginPct: sig(((lowLine.flowM3s ?? 0) / dutyFlow - 1) * 100),
    breakdownMarginPct: breakdownMarginPct === null ? null : sig(breakdownMarginPct),
    energyPerYearKWh: sig(kWh),
    energyPerYearMinor: Math.round(kWh * input.energy.tariffMinorPerKWh),
    lifeEnergyMinor: Math.round(kWh * input.energy.tariffMinorPerKWh * input.energy.lifeYears),
    warnings,
    score: sig(item.score),
  }
}

export interface SelectionOptions {
  /** Candidates returned (default CANDIDATE_LIMIT). */
  limit?: number
  /** Skip the solves of candidates proven short of the duty when they cannot be returned (default true; off only to check it). */
  skipHopeless?: boolean
}

/** What every share of a run needs from the study: its load and supplies, built once per run. */
export interface StudyFrame {
  input: StudyInput
  fanLoad: FanLoad
  load: PreparedLoad
  supply: Supply
  lowSupply: Supply
  requiredFlow: number
}

/** The study's load and supplies; a study whose inputs do not fit together throws StudyInputError. */
export function studyFrame(input: StudyInput): StudyFrame {
  const fanLoad = studyLoad(input)
  let load: PreparedLoad
  try {
    load = prepareLoad(fanLoad, 'fan')
  } catch (error) {
    if (error instanceof EngineeringInputError) throw new StudyInputError(error.field.replace(/^fan\.fan\./, 'fan.'), error.message)
    throw error
  }
  const supply: Supply = { volts: input.supply.volts, hz: input.supply.hz }
  const lowSupply: Supply = { volts: supply.volts * (1 - input.tolerance.voltagePct / 100), hz: supply.hz }
  return { input, fanLoad, load, supply, lowSupply, requiredFlow: input.duty.flowM3s * (1 + input.tolerance.minMarginPct / 100) }
}

/** Where a candidate stands in the answer's order: higher score first, then part number, then tap. */
export interface RankKey {
  score: number
  partNumber: string
  tap: string
}

export function compareRankKeys(a: RankKey, b: RankKey): number {
  return b.score - a.score || a.partNumber.localeCompare(b.partNumber) || a.tap.localeCompare(b.tap)
}

/**
 * One catalogue, or one share of it, ranked for a study: the keys of its best `limit` candidates,
 * best first, and its counts. The best `limit` of a whole catalogue are among the best `limit` of
 * its shares, so shares ranked apart (in worker threads) merge into the answer of the whole.
 */
export interface RankedShare {
  keys: RankKey[]
  considered: number
  candidateTotal: number
  excluded: Array<[reason: string, count: number]>
  /** The fastest synchronous speed among the candidates: the load curve is drawn up to it. */
  fastestSync: number
}

/** A built candidate of a share, and its curves when it is charted. */
export interface BuiltShare {
  candidates: Candidate[]
  curves: Array<{ rank: number; curves: CandidateCurves }>
}

/** Which of a share's ranked candidates the answer takes (index into its keys) and at what rank. */
export interface SharePick {
  index: number
  rank: number
}

export interface ShareRanking {
  share: RankedShare
  /** Builds the picked candidates in full (worst-case points, warnings, energy) and the charted ones' curves. */
  build(picks: readonly SharePick[]): BuiltShare
}

/** Ranks one catalogue (or share) for a study; the candidates are built only when picked. */
export function rankCatalogue(catalogue: readonly CatalogueEntry[], frame: StudyFrame, options: SelectionOptions = {}): ShareRanking {
  const limit = options.limit ?? CANDIDATE_LIMIT
  const { input, fanLoad, load, supply, lowSupply, requiredFlow } = frame
  const excluded = new Map<string, number>()
  const exclude = (reason: string) => excluded.set(reason, (excluded.get(reason) ?? 0) + 1)
  const scored: Scored[] = []
  const shortfall = options.skipHopeless === false ? null : shortfallTest(load, fanLoad, requiredFlow, supply.hz)
  /** Candidates proven short of the duty at nominal supply, solved only if the returned list reaches them. */
  const deferred: number[] = []
  let considered = 0
  /** Nominal candidates that meet the duty there; their worst case decides tier 0 or 1. */
  const pending: Scored[] = []
  const plan = planOnSupply(catalogue, supply)
  const low = rowsOnSupply(plan, lowSupply)
  const score = (entry: CatalogueEntry, index: number): void => {
    const nominal = solveBound(plan.bound[index] as BoundMotor, load)
    const item: Scored = { entry, row: plan.rows[index] as CataloguePerformance, index, nominal, tier: 4, score: 0 }
    if (nominalMeets(nominal, requiredFlow)) {
      // The score it has if the worst case meets the duty too: the most it can have.
      item.score = scoreOf(0, nominal, input.duty)
      pending.push(item)
      return
    }
    item.tier = tierOf(item, requiredFlow)
    item.score = scoreOf(item.tier, nominal, input.duty)
    scored.push(item)
  }

  /** Entry of each deferred row (parallel to `deferred`). */
  const deferredEntry: CatalogueEntry[] = []
  // Index loops on the hot paths: an entries() iterator allocates a pair per step.
  for (let index = 0; index < catalogue.length; index += 1) {
    const entry = catalogue[index] as CatalogueEntry
    const reason = hardFilter(entry, input)
    if (reason) {
      exclude(reason)
      continue
    }
    const from = plan.first[index] ?? 0
    const to = plan.first[index + 1] ?? 0
    if (to === from) {
      exclude('no data for this supply')
      continue
    }
    for (let r = from; r < to; r += 1) {
      considered += 1
      // The nominal point for every candidate; low line (and the hot winding at low line) only
      // where it decides the tier: a nominal point short of the duty is tier 2 to 4 whatever low
      // line gives. Returned candidates get the rest in buildCandidate(). A candidate proven
      // short without solving waits: it ranks below every one that meets the duty at nominal.
      // provablyShort()'s tests read from the plan's arrays, then shortAtRequired() on the plan's motor.
      if (shortfall && ((plan.syncRpm[r] ?? 0) < shortfall.nRequired || (plan.ceilingNm[r] ?? 0) < shortfall.torqueAtRequired || shortAtRequired(shortfall, plan.bound[r] as BoundMotor))) {
        deferred.push(r)
        deferredEntry.push(entry)
        continue
      }
      score(entry, r)
    }
  }
  const skipped = pending.length < limit ? 0 : deferred.length
  if (skipped === 0) for (let i = 0; i < deferred.length; i += 1) score(deferredEntry[i] as CatalogueEntry, deferred[i] ?? 0)

  // The worst case for those that meet the duty at nominal, the best possible score first. Once
  // `limit` of them meet it at the worst case too, one whose best possible score is below the
  // last of those cannot be returned, nor can any after it: their worst case is left unsolved.
  pending.sort((a, b) => b.score - a.score)
  let worstCaseMet = 0
  let cutoff = Number.NEGATIVE_INFINITY
  let unresolved = 0
  for (let index = 0; index < pending.length; index += 1) {
    const item = pending[index] as Scored
    if (worstCaseMet >= limit && item.score < cutoff) {
      unresolved = pending.length - index
      break
    }
    settleWorstCase(item, load, low, requiredFlow, shortfall)
    item.tier = tierOf(item, requiredFlow)
    item.score = scoreOf(item.tier, item.nominal, input.duty)
    scored.push(item)
    if (item.tier === 0) {
      worstCaseMet += 1
      if (worstCaseMet === limit) cutoff = item.score
    }
  }

  const keyOf = (item: Scored): RankKey => ({ score: item.score, partNumber: item.entry.partNumber, tap: item.row.tap })
  // compareRankKeys() on the items themselves (no key objects per comparison).
  scored.sort((a, b) => b.score - a.score || a.entry.partNumber.localeCompare(b.entry.partNumber) || a.row.tap.localeCompare(b.row.tap))
  const returned = scored.slice(0, limit)
  let fastestSync = syncRpm(2, supply.hz) / 2
  for (const item of scored) fastestSync = Math.max(fastestSync, syncRpm(item.entry.poles, supply.hz))
  if (skipped > 0) for (const entry of deferredEntry) fastestSync = Math.max(fastestSync, syncRpm(entry.poles, supply.hz))
  if (unresolved > 0) for (const item of pending.slice(pending.length - unresolved)) fastestSync = Math.max(fastestSync, syncRpm(item.entry.poles, supply.hz))

  const context: BuildContext = { input, supply, lowSupply, low, load, requiredFlow, minClass: input.constraints.minInsulationClass }
  return {
    share: { keys: returned.map(keyOf), considered, candidateTotal: scored.length + skipped + unresolved, excluded: [...excluded.entries()], fastestSync },
    build(picks) {
      const built: BuiltShare = { candidates: [], curves: [] }
      for (const pick of picks) {
        const item = returned[pick.index]
        if (!item) throw new Error(`rankCatalogue: no ranked candidate ${pick.index}`)
        built.candidates.push(buildCandidate(item, pick.rank, context))
        if (pick.rank > CHART_CANDIDATES) continue
        built.curves.push({
          rank: pick.rank,
          curves: {
            variantId: item.entry.variantId,
            partNumber: item.entry.partNumber,
            tap: item.row.tap,
            motorNominal: sampleMotor(item.row.prepared, supply),
            motorLowLine: sampleMotor(item.row.prepared, lowSupply),
          },
        })
      }
      return built
    },
  }
}

/** The answer's `limit` best over all shares, in order: for each, its share, index there and rank. */
export function mergeShares(shares: readonly RankedShare[], limit = CANDIDATE_LIMIT): Array<SharePick & { share: number }> {
  const all: Array<{ key: RankKey; share: number; index: number }> = []
  shares.forEach((share, s) => share.keys.forEach((key, index) => all.push({ key, share: s, index })))
  all.sort((a, b) => compareRankKeys(a.key, b.key))
  return all.slice(0, limit).map((item, i) => ({ share: item.share, index: item.index, rank: i + 1 }))
}

/** The run's answer from its shares' counts and their built candidates (any order; sorted by rank here). */
export function assembleResult(frame: StudyFrame, shares: readonly RankedShare[], built: readonly BuiltShare[]): SelectionResult {
  const excluded = new Map<string, number>()
  for (const share of shares) for (const [reason, count] of share.excluded) excluded.set(reason, (excluded.get(reason) ?? 0) + count)
  const candidates = built.flatMap((part) => part.candidates).sort((a, b) => a.rank - b.rank)
  const curves = built.flatMap((part) => part.curves).sort((a, b) => a.rank - b.rank).map((item) => item.curves)
  const fastestSync = shares.reduce((top, share) => Math.max(top, share.fastestSync), syncRpm(2, frame.supply.hz) / 2)
  return {
    densityKgM3: frame.fanLoad.density ?? frame.fanLoad.fan.refDensity,
    systemK: frame.fanLoad.system.k,
    considered: shares.reduce((sum, share) => sum + share.considered, 0),
    // Most frequent first; equal counts by reason, so the order does not depend on how the catalogue was shared out.
    excluded: [...excluded.entries()].map(([reason, count]) => ({ reason, count })).sort((a, b) => b.count - a.count || a.reason.localeCompare(b.reason)),
    candidates,
    candidateTotal: shares.reduce((sum, share) => sum + share.candidateTotal, 0),
    curves,
    loadCurve: sampleLoad(frame.load, fastestSync),
  }
}

/** Picks per share from mergeShares(), in the answer's order. */
export function picksByShare(picks: ReadonlyArray<SharePick & { share: number }>, shareCount: number): SharePick[][] {
  const byShare: SharePick[][] = Array.from({ length: shareCount }, () => [])
  for (const pick of picks) byShare[pick.share]?.push({ index: pick.index, rank: pick.rank })
  return byShare
}

/** A whole study run in this thread: rank, pick, build, assemble. */
export function runSelection(catalogue: readonly CatalogueEntry[], input: StudyInput, options: SelectionOptions = {}): SelectionResult {
  const frame = studyFrame(input)
  const ranking = rankCatalogue(catalogue, frame, options)
  const [picks = []] = picksByShare(mergeShares([ranking.share], options.limit), 1)
  return assembleResult(frame, [ranking.share], [ranking.build(picks)])
}

export { TIER_LABEL }
