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
  solveOperatingPoint,
  hotMotor,
  type MotorModel,
  type OperatingPoint,
  type PreparedLoad,
  type PreparedMotor,
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

function summary(point: OperatingPoint): PointSummary {
  return {
    status: point.status,
    rpm: point.rpm,
    flowM3s: point.flowM3s ?? 0,
    staticPa: point.staticPa ?? 0,
    inputW: point.inputW ?? null,
    currentA: point.currentA ?? null,
    powerFactor: point.powerFactor ?? null,
    efficiency: point.efficiency ?? null,
    outputW: point.outputW,
    shaftTorqueNm: point.shaftTorqueNm,
    crawl: point.crawl,
    fanStall: point.fanStall ?? false,
  }
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
    samples.push({ rpm, torqueNm: bound.torque(rpm) })
  }
  return samples
}

function sampleLoad(load: PreparedLoad, maxRpm: number, points = 61): CurveSample[] {
  const samples: CurveSample[] = []
  for (let i = 0; i <= points - 1; i += 1) {
    const rpm = (maxRpm * i) / (points - 1)
    samples.push({ rpm, torqueNm: load.evaluate(rpm).torqueNm })
  }
  return samples
}

/** A candidate after its ranking solves; the rest of its figures are built only if it is returned. */
interface Scored {
  entry: CatalogueEntry
  row: CataloguePerformance
  nominal: OperatingPoint
  /** Solved when the nominal point meets the duty (the tier depends on it) or when returned. */
  lowLine?: OperatingPoint
  hot?: OperatingPoint
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

/** Low line, and the hot winding at low line only where it could still change the verdict (a cold motor already short stays short hot). */
function solveWorstCase(item: Scored, load: PreparedLoad, lowSupply: Supply, requiredFlow: number): void {
  const lowLine = solveOperatingPoint(item.row.prepared, load, lowSupply)
  item.lowLine = lowLine
  const lowLineGood = runsClear(lowLine) && (lowLine.flowM3s ?? 0) >= requiredFlow
  if (item.row.hotPrepared && lowLineGood) item.hot = solveOperatingPoint(item.row.hotPrepared, load, lowSupply)
}

/** Meets the duty: at nominal and at the worst case (low line, hot winding where modelled), running clear of any torque dip. */
function meetsDutyOf(item: Scored, requiredFlow: number): boolean {
  if (!nominalMeets(item.nominal, requiredFlow) || !runsClear(item.lowLine)) return false
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
  load: PreparedLoad
  requiredFlow: number
  minClass: InsulationClassCode | undefined
}

/** The full candidate (worst-case points, warnings, energy) for one that is returned. */
function buildCandidate(item: Scored, rank: number, context: BuildContext): Candidate {
  const { input, supply, lowSupply, requiredFlow, minClass } = context
  if (!item.lowLine) solveWorstCase(item, context.load, lowSupply, requiredFlow)
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
    marginPct: (nominalFlow / dutyFlow - 1) * 100,
    lowLineMarginPct: ((lowLine.flowM3s ?? 0) / dutyFlow - 1) * 100,
    breakdownMarginPct,
    energyPerYearKWh: kWh,
    energyPerYearMinor: Math.round(kWh * input.energy.tariffMinorPerKWh),
    lifeEnergyMinor: Math.round(kWh * input.energy.tariffMinorPerKWh * input.energy.lifeYears),
    warnings,
    score: item.score,
  }
}

export interface SelectionOptions {
  /** Candidates returned (default CANDIDATE_LIMIT). */
  limit?: number
  /** Skip the solves of candidates proven short of the duty when they cannot be returned (default true; off only to check it). */
  skipHopeless?: boolean
}

export function runSelection(catalogue: readonly CatalogueEntry[], input: StudyInput, options: SelectionOptions = {}): SelectionResult {
  const limit = options.limit ?? CANDIDATE_LIMIT
  const fanLoad = studyLoad(input)
  let load: PreparedLoad
  try {
    load = prepareLoad(fanLoad, 'fan')
  } catch (error) {
    if (error instanceof EngineeringInputError) throw new StudyInputError(error.field.replace(/^fan\.fan\./, 'fan.'), error.message)
    throw error
  }
  const supply: Supply = { volts: input.supply.volts, hz: input.supply.hz }
  const dutyFlow = input.duty.flowM3s
  const requiredFlow = dutyFlow * (1 + input.tolerance.minMarginPct / 100)
  const excluded = new Map<string, number>()
  const exclude = (reason: string) => excluded.set(reason, (excluded.get(reason) ?? 0) + 1)
  const scored: Scored[] = []
  const minClass = input.constraints.minInsulationClass
  const lowSupply: Supply = { volts: supply.volts * (1 - input.tolerance.voltagePct / 100), hz: supply.hz }
  const shortfall = options.skipHopeless === false ? null : shortfallTest(load, fanLoad, requiredFlow, supply.hz)
  /** Candidates proven short of the duty at nominal supply, solved only if the returned list reaches them. */
  const deferred: { entry: CatalogueEntry; row: CataloguePerformance }[] = []
  let considered = 0
  /** Nominal candidates that meet the duty there; their worst case decides tier 0 or 1. */
  const pending: Scored[] = []
  const score = (entry: CatalogueEntry, row: CataloguePerformance): void => {
    const nominal = solveOperatingPoint(row.prepared, load, supply)
    const item: Scored = { entry, row, nominal, tier: 4, score: 0 }
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

  for (const entry of catalogue) {
    const reason = hardFilter(entry, input)
    if (reason) {
      exclude(reason)
      continue
    }
    const rows = pickRows(entry, supply)
    if (rows.length === 0) {
      exclude('no data for this supply')
      continue
    }
    for (const row of rows) {
      considered += 1
      // The nominal point for every candidate; low line (and the hot winding at low line) only
      // where it decides the tier: a nominal point short of the duty is tier 2 to 4 whatever low
      // line gives. Returned candidates get the rest in buildCandidate(). A candidate proven
      // short without solving waits: it ranks below every one that meets the duty at nominal.
      if (shortfall && provablyShort(shortfall, row, entry.poles, supply)) {
        deferred.push({ entry, row })
        continue
      }
      score(entry, row)
    }
  }
  const skipped = pending.length < limit ? 0 : deferred.length
  if (skipped === 0) for (const { entry, row } of deferred) score(entry, row)

  // The worst case for those that meet the duty at nominal, the best possible score first. Once
  // `limit` of them meet it at the worst case too, one whose best possible score is below the
  // last of those cannot be returned, nor can any after it: their worst case is left unsolved.
  pending.sort((a, b) => b.score - a.score)
  let worstCaseMet = 0
  let cutoff = Number.NEGATIVE_INFINITY
  let unresolved = 0
  for (const [index, item] of pending.entries()) {
    if (worstCaseMet >= limit && item.score < cutoff) {
      unresolved = pending.length - index
      break
    }
    solveWorstCase(item, load, lowSupply, requiredFlow)
    item.tier = tierOf(item, requiredFlow)
    item.score = scoreOf(item.tier, item.nominal, input.duty)
    scored.push(item)
    if (item.tier === 0) {
      worstCaseMet += 1
      if (worstCaseMet === limit) cutoff = item.score
    }
  }

  scored.sort((a, b) => b.score - a.score || a.entry.partNumber.localeCompare(b.entry.partNumber) || a.row.tap.localeCompare(b.row.tap))
  const returned = scored.slice(0, limit)
  const context: BuildContext = { input, supply, lowSupply, load, requiredFlow, minClass }
  const candidates = returned.map((item, index) => buildCandidate(item, index + 1, context))

  const curves: CandidateCurves[] = returned.slice(0, CHART_CANDIDATES).map((item) => ({
    variantId: item.entry.variantId,
    partNumber: item.entry.partNumber,
    tap: item.row.tap,
    motorNominal: sampleMotor(item.row.prepared, supply),
    motorLowLine: sampleMotor(item.row.prepared, lowSupply),
  }))
  let fastestSync = syncRpm(2, supply.hz) / 2
  for (const item of scored) fastestSync = Math.max(fastestSync, syncRpm(item.entry.poles, supply.hz))
  if (skipped > 0) for (const { entry } of deferred) fastestSync = Math.max(fastestSync, syncRpm(entry.poles, supply.hz))
  if (unresolved > 0) for (const item of pending.slice(pending.length - unresolved)) fastestSync = Math.max(fastestSync, syncRpm(item.entry.poles, supply.hz))

  return {
    densityKgM3: fanLoad.density ?? fanLoad.fan.refDensity,
    systemK: fanLoad.system.k,
    considered,
    excluded: [...excluded.entries()].map(([reason, count]) => ({ reason, count })).sort((a, b) => b.count - a.count),
    candidates,
    candidateTotal: scored.length + skipped + unresolved,
    curves,
    loadCurve: sampleLoad(load, fastestSync),
  }
}

export { TIER_LABEL }
