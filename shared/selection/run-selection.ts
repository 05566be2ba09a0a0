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
export function preparePerformance(row: Omit<CataloguePerformance, 'prepared' | 'breakdownNm' | 'hotPrepared' | 'hotC'>, insulation?: InsulationClassCode): CataloguePerformance {
  const prepared = prepareMotor(row.motor)
  const breakdownNm = breakdownTorque(prepared, { volts: row.volts, hz: row.hz }).torqueNm
  const hotC = insulation ? insulationClass(insulation)?.classC : undefined
  if (row.motor.model !== 'circuit' || hotC === undefined) return { ...row, prepared, breakdownNm }
  const hot = prepareMotor(hotMotor(row.motor, { referenceC: row.referenceTempC, hotC, rotorConstant: 225 }))
  return { ...row, prepared, breakdownNm, hotPrepared: hot, hotC }
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

function pickRows(entry: CatalogueEntry, supply: Supply): CataloguePerformance[] {
  const best = new Map<string, CataloguePerformance>()
  for (const row of entry.performance) {
    if (row.hz !== supply.hz) continue
    const off = Math.abs(supply.volts - row.volts) / row.volts
    if (off > SUPPLY_VOLTS_WINDOW) continue
    const current = best.get(row.tap)
    if (!current || Math.abs(supply.volts - current.volts) > Math.abs(supply.volts - row.volts)) best.set(row.tap, row)
  }
  return [...best.values()]
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

interface Scored {
  candidate: Candidate
  tier: number
  rows: { prepared: PreparedMotor }
}

const TIER_LABEL = ['meets the duty at worst case', 'meets at nominal only', 'runs below the duty', 'crawls in a torque dip', 'does not start'] as const

/**
 * Orders candidates: worst-case duty met first; within the meeting tiers the higher duty
 * efficiency (the air power the buyer asked for, Q_duty x p_duty, over the electrical input at
 * nominal supply), which also ranks a motor that overshoots the duty below one that just meets
 * it; below the duty, the higher flow. score = (4 - tier) x 1000 + a tie-breaker under 1000, so
 * higher is better and the order is the score's.
 */
function scoreOf(tier: number, candidate: Candidate, duty: { flowM3s: number; staticPa: number }): number {
  const inputW = candidate.nominal.inputW ?? 0
  const dutyEfficiency = inputW > 0 ? (duty.flowM3s * duty.staticPa) / inputW : 0
  const within = tier <= 1 ? Math.min(999, dutyEfficiency * 999) : Math.min(999, (candidate.nominal.flowM3s / duty.flowM3s) * 999)
  return (4 - tier) * 1000 + within
}

export function runSelection(catalogue: readonly CatalogueEntry[], input: StudyInput): SelectionResult {
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
  let considered = 0

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
      // Nominal and low line for every candidate; the hot winding at low line only where it could
      // still change the verdict (a cold motor that already falls short stays short when hot).
      const nominal = solveOperatingPoint(row.prepared, load, supply)
      const lowLine = solveOperatingPoint(row.prepared, load, lowSupply)
      const lowLineGood = lowLine.status === 'running' && !lowLine.crawl && (lowLine.flowM3s ?? 0) >= requiredFlow
      const hotPoint = row.hotPrepared && lowLineGood ? solveOperatingPoint(row.hotPrepared, load, lowSupply) : undefined
      const worstFlow = Math.min(lowLine.flowM3s ?? 0, hotPoint?.flowM3s ?? Number.POSITIVE_INFINITY)
      const worstRuns = lowLine.status === 'running' && !lowLine.crawl && (!hotPoint || (hotPoint.status === 'running' && !hotPoint.crawl))
      const meetsDuty = nominal.status === 'running' && !nominal.crawl && worstRuns && worstFlow >= requiredFlow
      const nominalFlow = nominal.flowM3s ?? 0
      const nominalMeets = nominal.status === 'running' && !nominal.crawl && nominalFlow >= requiredFlow
      const tier = nominal.status !== 'running' ? 4 : nominal.crawl ? 3 : meetsDuty ? 0 : nominalMeets ? 1 : 2

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
      if (nominalMeets && !meetsDuty) {
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
      const candidate: Candidate = {
        rank: 0,
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
        score: 0,
      }
      candidate.score = scoreOf(tier, candidate, input.duty)
      scored.push({ candidate, tier, rows: { prepared: row.prepared } })
    }
  }

  scored.sort((a, b) => b.candidate.score - a.candidate.score || a.candidate.partNumber.localeCompare(b.candidate.partNumber) || a.candidate.tap.localeCompare(b.candidate.tap))
  scored.forEach((item, index) => {
    item.candidate.rank = index + 1
  })

  const charted = scored.slice(0, CHART_CANDIDATES)
  const curves: CandidateCurves[] = charted.map((item) => ({
    variantId: item.candidate.variantId,
    partNumber: item.candidate.partNumber,
    tap: item.candidate.tap,
    motorNominal: sampleMotor(item.rows.prepared, supply),
    motorLowLine: sampleMotor(item.rows.prepared, lowSupply),
  }))
  const fastestSync = Math.max(syncRpm(2, supply.hz) / 2, ...scored.map((item) => syncRpm(item.candidate.poles, supply.hz)))

  return {
    densityKgM3: fanLoad.density ?? fanLoad.fan.refDensity,
    systemK: fanLoad.system.k,
    considered,
    excluded: [...excluded.entries()].map(([reason, count]) => ({ reason, count })).sort((a, b) => b.count - a.count),
    candidates: scored.slice(0, CANDIDATE_LIMIT).map((item) => item.candidate),
    candidateTotal: scored.length,
    curves,
    loadCurve: sampleLoad(load, fastestSync),
  }
}

export { TIER_LABEL }
