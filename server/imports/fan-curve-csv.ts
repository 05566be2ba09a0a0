// The fan-curve CSV reader of duty studies, on the server (csv-parse): columns flow, static
// pressure, shaft power in units the header names or the buyer picks; a "# 1550 r/min" line gives
// the reference speed. Every refusal names its line and column, in the shape the study screen shows.
import { parse } from 'csv-parse/sync'
import type { FanCsvRowProblem, FanCsvUnitChoice, FanCurveParseResult } from '../../shared/contracts/import.contract'
import { toSI } from '../../shared/engineering'

type Column = 'flow' | 'pressure' | 'power'

const FLOW_ALIASES: [RegExp, FanCsvUnitChoice['flow']][] = [
  [/m\s*(3|³|\^3)\s*\/\s*(h|hr|hour)\b|\bcmh\b/, 'm3/h'],
  [/m\s*(3|³|\^3)\s*\/\s*(s|sec)\b/, 'm3/s'],
  [/\bl\s*\/\s*s\b|\blps\b/, 'L/s'],
  [/\bcfm\b|ft\s*(3|³|\^3)\s*\/\s*min/, 'CFM'],
]
const PRESSURE_ALIASES: [RegExp, FanCsvUnitChoice['pressure']][] = [
  [/mm\s*\.?\s*(h2o|w\.?\s*[gc]\.?|water)/, 'mmH2O'],
  [/in(ch(es)?)?\s*\.?\s*(h2o|w\.?\s*[gc]\.?|water)|"\s*w\.?\s*[gc]|\biwc\b|\biwg\b/, 'inH2O'],
  [/\bpa\b|pascal/, 'Pa'],
]
const POWER_ALIASES: [RegExp, FanCsvUnitChoice['power']][] = [
  [/\bkw\b/, 'kW'],
  [/\bb?hp\b/, 'hp'],
  [/\bw\b|watts?\b/, 'W'],
]
const LABEL: Record<Column, string> = { flow: 'flow', pressure: 'static pressure', power: 'shaft power' }

function columnOf(cell: string): Column | undefined {
  const c = cell.toLowerCase()
  if (/static|pressure|\bps\b|\bsp\b|\bp_?s\b/.test(c)) return 'pressure'
  if (/power|shaft|watt|\bbhp\b|\bkw\b|\bp_?sh/.test(c)) return 'power'
  if (/flow|volume|air|\bq\b|cfm|m3|m³/.test(c)) return 'flow'
  return undefined
}

function unitIn<T>(cell: string, aliases: [RegExp, T][]): T | undefined {
  const c = cell.toLowerCase()
  const bracket = /[([]([^)\]]*)[)\]]/.exec(c)?.[1]
  for (const text of bracket !== undefined ? [bracket, c] : [c]) {
    for (const [pattern, unit] of aliases) if (pattern.test(text)) return unit
  }
  return undefined
}

function detectDelimiter(lines: string[]): string {
  const sample = lines.slice(0, 5).join('\n')
  if (sample.includes('\t')) return '\t'
  if (sample.includes(';')) return ';'
  if (sample.includes(',')) {
    const line = lines[0] ?? ''
    if (/\d,\d/.test(line) && /\s/.test(line.trim()) && !/,\s/.test(line)) return ' '
    return ','
  }
  return ' '
}

function parseNumber(cell: string, decimalComma: boolean): number | undefined {
  let text = cell.replace(/\s/g, '')
  if (text === '') return undefined
  if (decimalComma) text = text.replace(/\.(?=\d{3}(\D|$))/g, '').replace(',', '.')
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(text)) return undefined
  const value = Number(text)
  return Number.isFinite(value) ? value : undefined
}

function toWatts(value: number, unit: FanCsvUnitChoice['power']): number {
  return unit === 'kW' ? value * 1000 : toSI(value, unit)
}

/** Splits the data lines with csv-parse; whitespace-separated text becomes tab-separated first. */
function cellsOf(lines: { content: string; line: number }[], delimiter: string): { cells: string[]; line: number }[] {
  const body = lines.map((l) => (delimiter === ' ' ? l.content.trim().split(/\s+/).join('\t') : l.content)).join('\n')
  const records: string[][] = parse(body, { delimiter: delimiter === ' ' ? '\t' : delimiter, relax_column_count: true, relax_quotes: true, trim: true, skip_empty_lines: false })
  return records.map((cells, i) => ({ cells, line: lines[i]?.line ?? i + 1 }))
}

/** Parses fan-curve text; never throws on bad input: a bad line becomes a problem naming it. */
export function parseFanCurveCsv(text: string, chosen: FanCsvUnitChoice): FanCurveParseResult {
  const units: FanCsvUnitChoice = { ...chosen }
  const unitsFromHeader: Column[] = []
  const errors: FanCsvRowProblem[] = []
  const points: FanCurveParseResult['points'] = []
  let refRpm: number | null = null

  const numbered = text
    .replace(/^\uFEFF/, '')
    .split(/\r\n|\r|\n/)
    .map((content, index) => ({ content, line: index + 1 }))
    .filter((l) => l.content.trim() !== '')
  const data: typeof numbered = []
  for (const entry of numbered) {
    const speed = /(?:r\/min|rpm|speed)\D{0,12}?(\d+(?:\.\d+)?)|(\d+(?:\.\d+)?)\s*(?:r\/min|rpm)/i.exec(entry.content)
    const isComment = /^\s*(#|\/\/)/.test(entry.content)
    const cellCount = entry.content.split(/[,;\t]/).filter((cell) => cell.trim() !== '').length
    if (speed && (isComment || (cellCount <= 2 && columnOf(entry.content.replace(speed[0], '')) === undefined))) {
      refRpm = Number(speed[1] ?? speed[2])
      continue
    }
    if (!isComment) data.push(entry)
  }
  if (data.length === 0) {
    errors.push({ line: 1, message: 'there is nothing to read: paste rows of flow, static pressure and shaft power' })
    return { points, errors, units, unitsFromHeader, refRpm }
  }
  const delimiter = detectDelimiter(data.map((d) => d.content))
  const decimalComma = delimiter !== ','
  let rows: { cells: string[]; line: number }[]
  try {
    rows = cellsOf(data, delimiter)
  } catch (error) {
    errors.push({ line: 1, message: `the text is not readable CSV: ${error instanceof Error ? error.message : String(error)}` })
    return { points, errors, units, unitsFromHeader, refRpm }
  }
  let order: Column[] = ['flow', 'pressure', 'power']
  const first = rows[0]
  if (first && first.cells.some((cell) => cell !== '' && parseNumber(cell, decimalComma) === undefined)) {
    rows.shift()
    const named = first.cells.map(columnOf)
    if (named.every((c) => c !== undefined) && new Set(named).size === named.length) order = named.filter((c) => c !== undefined)
    first.cells.forEach((cell, index) => {
      const column = order[index]
      if (column === 'flow') {
        const unit = unitIn(cell, FLOW_ALIASES)
        if (unit) { units.flow = unit; unitsFromHeader.push('flow') }
      } else if (column === 'pressure') {
        const unit = unitIn(cell, PRESSURE_ALIASES)
        if (unit) { units.pressure = unit; unitsFromHeader.push('pressure') }
      } else if (column === 'power') {
        const unit = unitIn(cell, POWER_ALIASES)
        if (unit) { units.power = unit; unitsFromHeader.push('power') }
      }
    })
    if (!order.includes('power')) errors.push({ line: first.line, message: 'the header has no shaft power column: Spinwright needs it to know the torque the fan takes' })
  }
  let previousFlow = -Infinity
  for (const { cells, line } of rows) {
    if (cells.length < 3) {
      errors.push({ line, message: `expected 3 columns (flow, static pressure, shaft power), found ${cells.length}` })
      continue
    }
    const values: Partial<Record<Column, number>> = {}
    let bad = false
    order.forEach((column, index) => {
      const cell = cells[index] ?? ''
      const value = parseNumber(cell, decimalComma)
      if (value === undefined) {
        errors.push({ line, column, message: cell === '' ? `${LABEL[column]} is empty` : `${LABEL[column]} "${cell}" is not a number` })
        bad = true
      } else if (value < 0) {
        errors.push({ line, column, message: `${LABEL[column]} cannot be negative` })
        bad = true
      } else values[column] = value
    })
    const flowM3s = values.flow === undefined ? undefined : toSI(values.flow, units.flow)
    if (flowM3s !== undefined) {
      if (!(flowM3s > previousFlow)) {
        errors.push({ line, column: 'flow', message: 'flow must rise from row to row' })
        bad = true
      }
      previousFlow = flowM3s
    }
    if (bad || flowM3s === undefined || values.pressure === undefined || values.power === undefined) continue
    points.push({ flowM3s, staticPa: toSI(values.pressure, units.pressure), shaftW: toWatts(values.power, units.power) })
  }
  if (points.length < 3 && errors.length === 0) errors.push({ line: rows[rows.length - 1]?.line ?? 1, message: 'give at least 3 points of the fan curve' })
  return { points, errors, units, unitsFromHeader, refRpm }
}
