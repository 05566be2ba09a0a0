// Reads a fan curve pasted from a spreadsheet or uploaded as a CSV file, in the browser: columns
// flow, static pressure, shaft power, in units the user picks or the header names. Every refusal
// names its line and column so the user can fix the source.
import { computed, ref, shallowRef } from 'vue'
import { toSI, type FanPoint } from '@shared/engineering'
import { parseFanCurveFile } from '@/api/admin-catalogue.api'

export const CSV_FLOW_UNITS = ['m3/h', 'm3/s', 'L/s', 'CFM'] as const
export const CSV_PRESSURE_UNITS = ['Pa', 'inH2O', 'mmH2O'] as const
export const CSV_POWER_UNITS = ['W', 'kW', 'hp'] as const
export type CsvFlowUnit = (typeof CSV_FLOW_UNITS)[number]
export type CsvPressureUnit = (typeof CSV_PRESSURE_UNITS)[number]
export type CsvPowerUnit = (typeof CSV_POWER_UNITS)[number]
export type FanCsvColumn = 'flow' | 'pressure' | 'power'

export interface FanCsvUnits {
  flow: CsvFlowUnit
  pressure: CsvPressureUnit
  power: CsvPowerUnit
}

export interface FanCsvRowError {
  /** 1-based line of the text. */
  line: number
  column?: FanCsvColumn
  message: string
}

export interface FanCsvResult {
  /** Points in SI (m3/s, Pa, W), in the order of the text. */
  points: FanPoint[]
  errors: FanCsvRowError[]
  /** The units used: the header's where it named them, else the chosen ones. */
  units: FanCsvUnits
  /** Which units came from the header. */
  unitsFromHeader: FanCsvColumn[]
  /** Reference speed if a line such as "speed 1550 r/min" or "# rpm = 1550" gave one. */
  refRpm: number | null
}

export const MAX_FAN_CSV_BYTES = 200_000

const FLOW_ALIASES: [RegExp, CsvFlowUnit][] = [
  [/m\s*(3|³|\^3)\s*\/\s*(h|hr|hour)\b|\bcmh\b/, 'm3/h'],
  [/m\s*(3|³|\^3)\s*\/\s*(s|sec)\b/, 'm3/s'],
  [/\bl\s*\/\s*s\b|\blps\b/, 'L/s'],
  [/\bcfm\b|ft\s*(3|³|\^3)\s*\/\s*min/, 'CFM'],
]
const PRESSURE_ALIASES: [RegExp, CsvPressureUnit][] = [
  [/mm\s*\.?\s*(h2o|w\.?\s*[gc]\.?|water)/, 'mmH2O'],
  [/in(ch(es)?)?\s*\.?\s*(h2o|w\.?\s*[gc]\.?|water)|"\s*w\.?\s*[gc]|\biwc\b|\biwg\b/, 'inH2O'],
  [/\bpa\b|pascal/, 'Pa'],
]
const POWER_ALIASES: [RegExp, CsvPowerUnit][] = [
  [/\bkw\b/, 'kW'],
  [/\bb?hp\b/, 'hp'],
  [/\bw\b|watts?\b/, 'W'],
]

function columnOf(cell: string): FanCsvColumn | undefined {
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

function splitLine(line: string, delimiter: string): string[] {
  if (delimiter === ' ') return line.trim().split(/\s+/)
  return line.split(delimiter).map((cell) => cell.trim().replace(/^"(.*)"$/, '$1'))
}

function detectDelimiter(lines: string[]): string {
  const sample = lines.slice(0, 5).join('\n')
  if (sample.includes('\t')) return '\t'
  if (sample.includes(';')) return ';'
  if (sample.includes(',')) {
    // "0,5 120,0" style decimal commas with blanks between columns: treat blanks as the delimiter.
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

function toWatts(value: number, unit: CsvPowerUnit): number {
  return unit === 'kW' ? value * 1000 : toSI(value, unit)
}

/** Parses fan-curve text; never throws: a bad line becomes an error naming it. */
export function parseFanCsv(text: string, chosen: FanCsvUnits): FanCsvResult {
  const units: FanCsvUnits = { ...chosen }
  const unitsFromHeader: FanCsvColumn[] = []
  const errors: FanCsvRowError[] = []
  const points: FanPoint[] = []
  let refRpm: number | null = null

  const all = text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/)
  const numbered = all.map((content, index) => ({ content, line: index + 1 })).filter((l) => l.content.trim() !== '')
  const data: typeof numbered = []
  for (const entry of numbered) {
    const speed = /(?:r\/min|rpm|speed)\D{0,12}?(\d+(?:\.\d+)?)|(\d+(?:\.\d+)?)\s*(?:r\/min|rpm)/i.exec(entry.content)
    const isComment = /^\s*(#|\/\/)/.test(entry.content)
    const cellCount = entry.content.split(/[,;\t]/).filter((cell) => cell.trim() !== '').length
    if (speed && (isComment || (cellCount <= 2 && columnOf(entry.content.replace(speed[0], '')) === undefined))) {
      refRpm = Number(speed[1] ?? speed[2])
      continue
    }
    if (isComment) continue
    data.push(entry)
  }
  if (data.length === 0) {
    errors.push({ line: 1, message: 'there is nothing to read: paste rows of flow, static pressure and shaft power' })
    return { points, errors, units, unitsFromHeader, refRpm }
  }

  const delimiter = detectDelimiter(data.map((d) => d.content))
  const decimalComma = delimiter !== ','
  let order: FanCsvColumn[] = ['flow', 'pressure', 'power']
  const first = data[0]
  if (first && splitLine(first.content, delimiter).some((cell) => cell !== '' && parseNumber(cell, decimalComma) === undefined)) {
    data.shift()
    const cells = splitLine(first.content, delimiter)
    const named = cells.map(columnOf)
    if (named.every((c) => c !== undefined) && new Set(named).size === named.length) order = named.filter((c) => c !== undefined)
    cells.forEach((cell, index) => {
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
    if (!order.includes('power')) {
      errors.push({ line: first.line, message: 'the header has no shaft power column: Spinwright needs it to know the torque the fan takes' })
    }
  }

  const label: Record<FanCsvColumn, string> = { flow: 'flow', pressure: 'static pressure', power: 'shaft power' }
  let previousFlow = -Infinity
  for (const { content, line } of data) {
    const cells = splitLine(content, delimiter)
    if (cells.length < 3) {
      errors.push({ line, message: `expected 3 columns (flow, static pressure, shaft power), found ${cells.length}` })
      continue
    }
    const values: Partial<Record<FanCsvColumn, number>> = {}
    let bad = false
    order.forEach((column, index) => {
      const cell = cells[index] ?? ''
      const value = parseNumber(cell, decimalComma)
      if (value === undefined) {
        errors.push({ line, column, message: cell === '' ? `${label[column]} is empty` : `${label[column]} "${cell}" is not a number` })
        bad = true
      } else if (value < 0) {
        errors.push({ line, column, message: `${label[column]} cannot be negative` })
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
  if (points.length < 3 && errors.length === 0) errors.push({ line: data[data.length - 1]?.line ?? 1, message: 'give at least 3 points of the fan curve' })
  return { points, errors, units, unitsFromHeader, refRpm }
}

/** Editor state for pasting or uploading a fan curve. */
export function useFanCsv(initial: FanCsvUnits) {
  const text = ref('')
  const units = ref<FanCsvUnits>({ ...initial })
  const fileName = ref<string | null>(null)
  const fileError = ref<string | null>(null)
  const result = shallowRef<FanCsvResult | null>(null)

  function parse(): FanCsvResult {
    result.value = parseFanCsv(text.value, units.value)
    return result.value
  }

  async function readFile(file: File): Promise<FanCsvResult | null> {
    fileError.value = null
    if (file.size > MAX_FAN_CSV_BYTES) {
      fileError.value = `${file.name} is larger than ${MAX_FAN_CSV_BYTES / 1000} kB; a fan curve needs only a few rows`
      return null
    }
    fileName.value = file.name
    text.value = await file.text()
    // An uploaded file is read by the server's parser (POST /api/v1/fan-curves/parse), the one
    // every buyer's upload goes through; pasted text stays in the browser. Same rules, same report.
    try {
      result.value = await parseFanCurveFile(file, units.value)
      return result.value
    } catch {
      return parse()
    }
  }

  const ok = computed(() => result.value !== null && result.value.errors.length === 0 && result.value.points.length >= 3)
  return { text, units, fileName, fileError, result, ok, parse, readFile }
}
