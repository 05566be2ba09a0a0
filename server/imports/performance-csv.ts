// Reads a performance file for one variant, tap and supply: either measured torque-speed points
// (rpm, torque, current, input W) or equivalent-circuit values (parameter,value rows), checks them
// and hands back a motor model the engineering core accepts. Pure: no database.
import { parse } from 'csv-parse/sync'
import { z } from 'zod'
import { motorModelSchema } from '../../shared/contracts/catalogue.contract'
import type { PerformanceRowError, TorqueUploadUnit } from '../../shared/contracts/import.contract'
import { EngineeringInputError, syncRpm, toSI, validateMotor, type MotorModel } from '../../shared/engineering'

export const MIN_CURVE_POINTS = 6
/**
 * The curve must end within this fraction of synchronous speed, with torque about zero there (at
 * most this fraction of the curve's peak). Common practice for no-load test data; no standard cited.
 */
export const SYNC_TOLERANCE = 0.05

export interface PerformanceTarget {
  poles: number
  volts: number
  hz: number
  type: 'shaded-pole' | 'psc'
  /** Unit for a plain "torque" column. */
  torqueUnit?: TorqueUploadUnit
}

export type PerformanceParse =
  | { ok: true; motor: MotorModel; readAs: 'curve' | 'circuit'; torqueUnit: TorqueUploadUnit | null; warnings: string[] }
  | { ok: false; errors: PerformanceRowError[] }

const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i

function normalise(cell: string): string {
  return cell.trim().toLowerCase().replace(/[\s.()[\]/·-]+/g, '_').replace(/_+/g, '_').replace(/^_|_$/g, '')
}

const SPEED_NAMES = new Set(['rpm', 'speed_rpm', 'speed_r_min', 'speed', 'n_rpm'])
const TORQUE_UNITS: [RegExp, TorqueUploadUnit][] = [
  [/^torque_(nm|n_m)$/, 'N m'],
  [/^torque_(ozin|oz_in)$/, 'oz-in'],
  [/^torque_(lbin|lb_in|lbfin|lbf_in)$/, 'lb-in'],
]
const CURRENT_NAMES = new Set(['current_a', 'current', 'amps', 'i_a'])
const INPUT_NAMES = new Set(['input_w', 'input_power_w', 'input', 'power_in_w', 'watts_in', 'p_in_w'])

/** Circuit parameters: file name -> where it goes. */
const CIRCUIT_PARAMETERS: Record<string, { key: string; aux?: true; label: string }> = {
  r1_ohm: { key: 'r1', label: 'main stator resistance r1' },
  x1_ohm: { key: 'x1', label: 'main stator leakage reactance x1' },
  r2_ohm: { key: 'r2', label: 'rotor resistance r2' },
  x2_ohm: { key: 'x2', label: 'rotor leakage reactance x2' },
  xm_ohm: { key: 'xm', label: 'magnetising reactance xm' },
  core_loss_w: { key: 'coreLossW', label: 'core loss' },
  friction_w: { key: 'frictionW', label: 'friction and windage' },
  aux_r_ohm: { key: 'r', aux: true, label: 'auxiliary winding resistance' },
  aux_x_ohm: { key: 'x', aux: true, label: 'auxiliary winding reactance' },
  aux_turns_ratio: { key: 'turnsRatio', aux: true, label: 'turns ratio a' },
  capacitor_uf: { key: 'capacitorUf', aux: true, label: 'run capacitor' },
}
export const CIRCUIT_PARAMETER_NAMES = Object.keys(CIRCUIT_PARAMETERS)

const infoRowsSchema = z.array(z.object({ record: z.array(z.string()), info: z.object({ lines: z.number() }) }))

function readRecords(text: string): { records: string[][]; lineOf: number[] } | PerformanceRowError {
  try {
    const raw: unknown = parse(text, {
      bom: true,
      skip_empty_lines: true,
      relax_column_count: true,
      trim: true,
      comment: '#',
      info: true,
    })
    // With `info` csv-parse hands back { record, info } objects; its typings do not say so.
    const rows = infoRowsSchema.parse(raw)
    return { records: rows.map((r) => r.record), lineOf: rows.map((r) => r.info.lines) }
  } catch (error) {
    return { line: null, column: null, message: `the file is not readable CSV: ${error instanceof Error ? error.message : String(error)}` }
  }
}

function coreError(error: unknown): PerformanceRowError {
  if (error instanceof EngineeringInputError) return { line: null, column: error.field, message: `the engineering core refuses it: ${error.message}` }
  return { line: null, column: null, message: error instanceof Error ? error.message : String(error) }
}

function parseCircuit(records: string[][], lineOf: number[], target: PerformanceTarget): PerformanceParse {
  const errors: PerformanceRowError[] = []
  const main: Record<string, number> = {}
  const aux: Record<string, number> = {}
  const seen = new Set<string>()
  records.slice(1).forEach((record, i) => {
    const line = lineOf[i + 1] ?? null
    const name = normalise(record[0] ?? '')
    const raw = (record[1] ?? '').trim()
    const parameter = CIRCUIT_PARAMETERS[name]
    if (!parameter) {
      errors.push({ line, column: 'parameter', message: `unknown parameter "${record[0] ?? ''}"; known: ${CIRCUIT_PARAMETER_NAMES.join(', ')}` })
      return
    }
    if (seen.has(name)) errors.push({ line, column: 'parameter', message: `${name} is given twice` })
    seen.add(name)
    if (!NUMBER.test(raw)) {
      errors.push({ line, column: 'value', message: `${parameter.label}: "${raw}" is not a number` })
      return
    }
    const value = Number(raw)
    if (value < 0) errors.push({ line, column: 'value', message: `${parameter.label} cannot be negative` })
    ;(parameter.aux ? aux : main)[parameter.key] = value
  })
  for (const required of ['r1_ohm', 'x1_ohm', 'r2_ohm', 'x2_ohm', 'xm_ohm']) {
    if (!seen.has(required)) errors.push({ line: null, column: 'parameter', message: `${required} is missing` })
  }
  const auxNames = CIRCUIT_PARAMETER_NAMES.filter((n) => CIRCUIT_PARAMETERS[n]?.aux)
  const auxGiven = auxNames.filter((n) => seen.has(n))
  if (target.type === 'psc' && auxGiven.length < auxNames.length) {
    errors.push({ line: null, column: 'parameter', message: `a PSC motor needs its auxiliary winding and capacitor: ${auxNames.filter((n) => !seen.has(n)).join(', ')} missing` })
  }
  if (target.type === 'shaded-pole' && auxGiven.length > 0) {
    errors.push({ line: null, column: 'parameter', message: `a shaded-pole motor has no auxiliary winding; remove ${auxGiven.join(', ')}` })
  }
  if (errors.length) return { ok: false, errors }
  const candidate = { model: 'circuit', poles: target.poles, ratedHz: target.hz, ...main, ...(target.type === 'psc' ? { aux } : {}) }
  const checked = motorModelSchema.safeParse(candidate)
  if (!checked.success) return { ok: false, errors: checked.error.issues.map((issue) => ({ line: null, column: issue.path.join('.') || null, message: issue.message })) }
  try {
    return { ok: true, motor: validateMotor(checked.data), readAs: 'circuit', torqueUnit: null, warnings: [] }
  } catch (error) {
    return { ok: false, errors: [coreError(error)] }
  }
}

function parseCurve(records: string[][], lineOf: number[], target: PerformanceTarget): PerformanceParse {
  const errors: PerformanceRowError[] = []
  const header = (records[0] ?? []).map(normalise)
  const speedAt = header.findIndex((h) => SPEED_NAMES.has(h))
  let torqueAt = -1
  let torqueUnit: TorqueUploadUnit | null = null
  header.forEach((h, i) => {
    for (const [pattern, unit] of TORQUE_UNITS) {
      if (pattern.test(h)) {
        torqueAt = i
        torqueUnit = unit
      }
    }
  })
  if (torqueAt < 0) {
    const plain = header.indexOf('torque')
    if (plain >= 0) {
      torqueAt = plain
      torqueUnit = target.torqueUnit ?? null
      if (!torqueUnit) errors.push({ line: lineOf[0] ?? 1, column: 'torque', message: 'the torque column names no unit: call it torque_Nm, torque_ozin or torque_lbin, or choose the unit on upload' })
    }
  }
  const currentAt = header.findIndex((h) => CURRENT_NAMES.has(h))
  const inputAt = header.findIndex((h) => INPUT_NAMES.has(h))
  if (speedAt < 0) errors.push({ line: lineOf[0] ?? 1, column: 'rpm', message: 'no speed column: name it rpm' })
  if (torqueAt < 0) errors.push({ line: lineOf[0] ?? 1, column: 'torque', message: 'no torque column: name it torque_Nm, torque_ozin or torque_lbin' })
  const known = new Set([speedAt, torqueAt, currentAt, inputAt])
  const extra = header.filter((_, i) => !known.has(i))
  if (extra.length) errors.push({ line: lineOf[0] ?? 1, column: null, message: `unknown column${extra.length > 1 ? 's' : ''}: ${extra.join(', ')} (expected rpm, torque_Nm, current_A, input_W)` })
  if (errors.length || !torqueUnit) return { ok: false, errors }
  const unit: TorqueUploadUnit = torqueUnit

  const points: { rpm: number; torqueNm: number; currentA?: number; inputW?: number }[] = []
  const read = (record: string[], at: number, line: number, column: string, label: string, nonNegative: boolean): number | undefined => {
    const raw = (record[at] ?? '').trim()
    if (raw === '') {
      errors.push({ line, column, message: `${label} is empty` })
      return undefined
    }
    if (!NUMBER.test(raw)) {
      errors.push({ line, column, message: `${label} "${raw}" is not a number` })
      return undefined
    }
    const value = Number(raw)
    if (nonNegative && value < 0) {
      errors.push({ line, column, message: `${label} cannot be negative` })
      return undefined
    }
    return value
  }
  let previous = -Infinity
  records.slice(1).forEach((record, i) => {
    const line = lineOf[i + 1] ?? i + 2
    const rpm = read(record, speedAt, line, 'rpm', 'speed', true)
    const torque = read(record, torqueAt, line, header[torqueAt] ?? 'torque', 'torque', false)
    const currentA = currentAt >= 0 ? read(record, currentAt, line, header[currentAt] ?? 'current', 'current', true) : undefined
    const inputW = inputAt >= 0 ? read(record, inputAt, line, header[inputAt] ?? 'input', 'input power', true) : undefined
    if (rpm !== undefined) {
      if (points.length === 0 && previous === -Infinity && rpm !== 0) errors.push({ line, column: 'rpm', message: 'the first point must be at standstill (rpm 0) so the starting torque is known' })
      else if (!(rpm > previous)) errors.push({ line, column: 'rpm', message: `speed must rise strictly from row to row (${rpm} after ${previous})` })
      previous = rpm
    }
    if (rpm === undefined || torque === undefined) return
    if ((currentAt >= 0 && currentA === undefined) || (inputAt >= 0 && inputW === undefined)) return
    points.push({ rpm, torqueNm: toSI(torque, unit), ...(currentA !== undefined ? { currentA } : {}), ...(inputW !== undefined ? { inputW } : {}) })
  })
  const lastLine = lineOf[lineOf.length - 1] ?? null
  if (records.length - 1 < MIN_CURVE_POINTS) errors.push({ line: lastLine, column: null, message: `give at least ${MIN_CURVE_POINTS} points from standstill to synchronous speed (found ${records.length - 1})` })
  if (errors.length) return { ok: false, errors }

  const ns = syncRpm(target.poles, target.hz)
  const last = points[points.length - 1]
  const peak = Math.max(...points.map((p) => Math.abs(p.torqueNm)))
  if (last) {
    if (last.rpm > ns) errors.push({ line: lastLine, column: 'rpm', message: `${last.rpm} r/min is above synchronous speed (${ns} r/min for ${target.poles} poles at ${target.hz} Hz)` })
    else if (last.rpm < ns * (1 - SYNC_TOLERANCE)) {
      errors.push({ line: lastLine, column: 'rpm', message: `the curve stops at ${last.rpm} r/min; carry it to within 5 % of synchronous speed (${Math.ceil(ns * (1 - SYNC_TOLERANCE))} to ${ns} r/min)` })
    }
    if (Math.abs(last.torqueNm) > SYNC_TOLERANCE * peak) {
      errors.push({ line: lastLine, column: header[torqueAt] ?? 'torque', message: `torque should be about zero near synchronous speed (at most 5 % of the peak ${peak.toPrecision(3)} N m); the last point has ${last.torqueNm.toPrecision(3)} N m` })
    }
  }
  if (errors.length) return { ok: false, errors }
  const candidate = { model: 'curve', poles: target.poles, ratedVolts: target.volts, ratedHz: target.hz, points }
  const checked = motorModelSchema.safeParse(candidate)
  if (!checked.success) return { ok: false, errors: checked.error.issues.map((issue) => ({ line: null, column: issue.path.join('.') || null, message: issue.message })) }
  try {
    const warnings = currentAt < 0 || inputAt < 0 ? ['without current and input watts the study can rank this tap by speed and airflow only'] : []
    return { ok: true, motor: validateMotor(checked.data), readAs: 'curve', torqueUnit: unit, warnings }
  } catch (error) {
    return { ok: false, errors: [coreError(error)] }
  }
}

/** Reads either form; the header decides: "parameter,value" means circuit values, else curve points. */
export function parsePerformanceCsv(text: string, target: PerformanceTarget): PerformanceParse {
  const read = readRecords(text)
  if (!('records' in read)) return { ok: false, errors: [read] }
  const { records, lineOf } = read
  const header = (records[0] ?? []).map(normalise)
  if (header.length === 0 || header.every((h) => h === '')) {
    return { ok: false, errors: [{ line: 1, column: null, message: 'the file is empty: the first line names the columns (rpm, torque_Nm, current_A, input_W) or reads parameter,value' }] }
  }
  if (header[0] === 'parameter' && header[1] === 'value') return parseCircuit(records, lineOf, target)
  return parseCurve(records, lineOf, target)
}
