// The one fan-curve CSV reader of duty studies, run by the server (POST /api/v1/fan-curves/parse)
// and by the study screen (pasted text): columns flow, static pressure, shaft power, in units the
// header names or the buyer picks; a line such as "# 1550 r/min" gives the reference speed. Every
// refusal names its line (and column where there is one), in the shape the study screen shows.
//
// Pure TypeScript with its own cell splitter: csv-parse needs Node's global Buffer, and its browser
// build carries a bundled Buffer shim of some 120 kB, too much for a reader of a few dozen rows.
import type { FanCsvRowProblem, FanCsvUnitChoice, FanCurveParseResult } from '../contracts/import.contract'
import { toSI } from '../engineering/units'

type Column = NonNullable<FanCsvRowProblem['column']>

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

/** Cells of one line, or why the line cannot be cut into cells. */
export type CsvRowSplit = { cells: string[] } | { problem: string }

const isBlank = (ch: string | undefined): boolean => ch !== undefined && /\s/.test(ch)

/**
 * Cuts one line into cells after RFC 4180: a cell may be quoted, a quote inside it is written
 * twice, and the delimiter inside quotes is text. Blanks around a cell are dropped; a quote inside
 * an unquoted cell is kept as text (spreadsheets write 2" that way). Delimiter ' ' means any run
 * of blanks. A fan curve has no cell that spans lines, so each line is one row.
 */
export function splitCsvRow(line: string, delimiter: string): CsvRowSplit {
  const blanks = delimiter === ' '
  const text = blanks ? line.trim() : line
  const atDelimiter = (i: number): boolean => (blanks ? isBlank(text[i]) : text[i] === delimiter)
  const cells: string[] = []
  let i = 0
  for (;;) {
    while (i < text.length && !atDelimiter(i) && isBlank(text[i])) i++
    if (text[i] === '"') {
      let value = ''
      i++
      for (;;) {
        const quote = text.indexOf('"', i)
        if (quote < 0) return { problem: `cell ${cells.length + 1} opens a quote that is not closed on its line` }
        value += text.slice(i, quote)
        i = quote + 1
        if (text[i] !== '"') break
        value += '"'
        i++
      }
      while (i < text.length && !atDelimiter(i) && isBlank(text[i])) i++
      if (i < text.length && !atDelimiter(i)) return { problem: `cell ${cells.length + 1} goes on after its closing quote (write a quote inside a quoted cell as "")` }
      cells.push(value)
    } else {
      const start = i
      while (i < text.length && !atDelimiter(i)) i++
      cells.push(text.slice(start, i).trim())
    }
    if (i >= text.length) return { cells }
    if (blanks) while (isBlank(text[i])) i++
    else i++
  }
}

function columnOf(cell: string): Column | undefined {
  const c = cell.toLowerCase()
  if (/static|pressure|\bps\b|\bsp\b|\bp_?s\b/.test(c)) return 'pressure'
  if (/power|shaft|watt|\bbhp\b|\bkw\b|\bp_?sh/.test(c)) return 'power'
  if (/flow|volume|air|\bq\b|cfm|m3|m³/.test(c)) return 'flow'
  return undefined
}

function unitIn<T>(cell: string, aliases: [RegExp, T][]): T | undefined {
  const c = cell.toLowerCase()
  // Prefer the text inside brackets ("Flow (CFM)"), else the whole cell.
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
    // "0,5 120,0" style decimal commas with blanks between columns: the blanks are the delimiter.
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

/**
 * Parses fan-curve text; never throws on bad input: a bad line becomes a problem naming it.
 * Points come back in SI (m3/s, Pa, W) in the order of the text; `units` are the header's where it
 * named them (listed in `unitsFromHeader`), else the chosen ones.
 */
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
  const rows: { cells: string[]; line: number }[] = []
  for (const { content, line } of data) {
    const split = splitCsvRow(content, delimiter)
    if ('problem' in split) {
      // Cells cannot be told apart on this line, so no column below it can be trusted either.
      errors.push({ line, message: `the text is not readable CSV: ${split.problem}` })
      return { points, errors, units, unitsFromHeader, refRpm }
    }
    rows.push({ cells: split.cells, line })
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
