// Reads a catalogue CSV (csv-parse) into contract-checked family and variant specs, and plans it
// against a snapshot of the catalogue: rows to add, to change (field by field), unchanged, refused.
// Pure: no database; the import service supplies the snapshot and writes the plan.
import { parse } from 'csv-parse/sync'
import {
  familySpecSchema,
  lifecycleSchema,
  motorTypeSchema,
  variantSpecSchema,
  type FamilySpec,
  type VariantSpec,
} from '../../shared/contracts/catalogue.contract'
import type { ImportFamilyPlan, ImportFieldChange, ImportRowError, ImportRowPlan } from '../../shared/contracts/import.contract'
import {
  CATALOGUE_COLUMNS,
  FAMILY_CODE_COLUMN,
  FAMILY_COLUMNS,
  LIST_SEPARATOR,
  PART_NUMBER_COLUMN,
  VARIANT_COLUMNS,
  columnOfVariantField,
  formatCell,
  type VariantColumn,
} from './catalogue-columns'

const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i
const TRUE_WORDS = new Set(['yes', 'y', 'true', '1'])
const FALSE_WORDS = new Set(['no', 'n', 'false', '0'])

export interface FamilyCells {
  name?: string
  type?: string
  description?: string
  lifecycle?: string
}

export interface ParsedRow {
  /** Spreadsheet row number: the header is row 1. */
  row: number
  familyCode: string
  partNumber: string
  name: string
  family: FamilyCells
  /** Set when every variant cell passed the contract. */
  variant: VariantSpec | null
  errors: ImportRowError[]
}

export interface ParsedFile {
  fileErrors: string[]
  rows: ParsedRow[]
}

function readCell(column: VariantColumn, raw: string, row: number, errors: ImportRowError[]): unknown {
  const text = raw.trim()
  if (text === '') {
    if (column.presence === 'required') errors.push({ row, column: column.name, message: 'is empty; a value is required' })
    return column.presence === 'optional' ? null : undefined
  }
  switch (column.kind) {
    case 'text':
      return text
    case 'number':
    case 'integer': {
      if (!NUMBER.test(text)) {
        errors.push({ row, column: column.name, message: `"${text}" is not a number (use a point for decimals, no units or thousands separators)` })
        return undefined
      }
      const value = Number(text)
      if (column.kind === 'integer' && !Number.isInteger(value)) {
        errors.push({ row, column: column.name, message: `"${text}" must be a whole number` })
        return undefined
      }
      return value
    }
    case 'boolean': {
      const word = text.toLowerCase()
      if (TRUE_WORDS.has(word)) return true
      if (FALSE_WORDS.has(word)) return false
      errors.push({ row, column: column.name, message: `"${text}" is not yes or no` })
      return undefined
    }
    case 'list':
      return text.split(LIST_SEPARATOR).map((item) => item.trim()).filter(Boolean)
  }
}

/** Checks the header: every column of the set, once, and nothing else. */
function headerErrors(header: string[]): string[] {
  const errors: string[] = []
  const seen = new Set<string>()
  const twice = new Set<string>()
  for (const cell of header) {
    if (seen.has(cell)) twice.add(cell)
    seen.add(cell)
  }
  const known = new Set(CATALOGUE_COLUMNS)
  const unknown = header.filter((cell) => !known.has(cell))
  const missing = CATALOGUE_COLUMNS.filter((column) => !seen.has(column))
  if (missing.length) errors.push(`missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')}`)
  if (unknown.length) errors.push(`unknown column${unknown.length > 1 ? 's' : ''}: ${unknown.map((c) => (c === '' ? '(blank)' : c)).join(', ')} (download the template for the column set)`)
  if (twice.size) errors.push(`column${twice.size > 1 ? 's' : ''} given twice: ${[...twice].join(', ')}`)
  return errors
}

/** Parses the CSV text and checks every row with the shared contracts; never throws on bad input. */
export function parseCatalogueCsv(text: string): ParsedFile {
  let records: string[][]
  try {
    records = parse(text, { bom: true, skip_empty_lines: true, relax_column_count: true, trim: false })
  } catch (error) {
    return { fileErrors: [`the file is not readable CSV: ${error instanceof Error ? error.message : String(error)}`], rows: [] }
  }
  const header = records[0]?.map((cell) => cell.trim().toLowerCase())
  if (!header || header.every((cell) => cell === '')) return { fileErrors: ['the file is empty: the first line must name the columns (download the template)'], rows: [] }
  const fileErrors = headerErrors(header)
  if (fileErrors.length) return { fileErrors, rows: [] }
  if (records.length < 2) return { fileErrors: ['the file has a header but no rows'], rows: [] }

  const index = new Map(header.map((name, i) => [name, i]))
  const rows: ParsedRow[] = []
  for (let r = 1; r < records.length; r += 1) {
    const record = records[r] ?? []
    const row = r + 1
    const cell = (name: string): string => (record[index.get(name) ?? -1] ?? '').trim()
    const errors: ImportRowError[] = []
    if (record.length !== header.length) {
      errors.push({ row, column: null, message: `has ${record.length} cells, the header has ${header.length}` })
    }
    const family: FamilyCells = {}
    for (const column of FAMILY_COLUMNS) {
      const value = cell(column.name)
      if (value !== '') family[column.field] = value
    }
    const values: Record<string, unknown> = { partNumber: cell(PART_NUMBER_COLUMN), familyCode: cell(FAMILY_CODE_COLUMN) }
    for (const column of VARIANT_COLUMNS) {
      const value = readCell(column, cell(column.name), row, errors)
      if (value !== undefined) values[column.field] = value
    }
    let variant: VariantSpec | null = null
    const failedColumns = new Set(errors.map((e) => e.column))
    const result = variantSpecSchema.safeParse(values)
    if (result.success) variant = errors.length ? null : result.data
    else {
      for (const issue of result.error.issues) {
        const column = columnOfVariantField(String(issue.path[0] ?? ''))
        if (failedColumns.has(column)) continue
        failedColumns.add(column)
        errors.push({ row, column, message: issue.message })
      }
      variant = null
    }
    rows.push({ row, familyCode: cell(FAMILY_CODE_COLUMN), partNumber: cell(PART_NUMBER_COLUMN), name: cell('name'), family, variant, errors })
  }
  return { fileErrors, rows }
}

// ---------------------------------------------------------------- planning against the catalogue
export interface FamilySnapshot {
  id: string
  code: string
  name: string
  type: 'shaded-pole' | 'psc'
  description: string
  lifecycle: FamilySpec['lifecycle']
}

/** A stored variant in contract shape, with its row id. */
export interface VariantSnapshot {
  id: string
  spec: VariantSpec
}

export interface CatalogueSnapshot {
  families: Map<string, FamilySnapshot>
  variants: Map<string, VariantSnapshot>
}

export interface PlannedFamily {
  code: string
  action: 'add' | 'change' | 'unchanged'
  /** Existing row id (change, unchanged). */
  id: string | null
  spec: FamilySpec
  changes: ImportFieldChange[]
}

export interface PlannedVariant {
  row: number
  action: 'add' | 'change' | 'unchanged'
  id: string | null
  spec: VariantSpec
  changes: ImportFieldChange[]
}

export interface CataloguePlan {
  fileErrors: string[]
  rows: ImportRowPlan[]
  families: PlannedFamily[]
  variants: PlannedVariant[]
  errorCount: number
}

function diff(pairs: [string, unknown, unknown][]): ImportFieldChange[] {
  const changes: ImportFieldChange[] = []
  for (const [column, before, after] of pairs) {
    const from = formatCell(before)
    const to = formatCell(after)
    if (from !== to) changes.push({ column, from, to })
  }
  return changes
}

/** Resolves each family from its rows and the catalogue; records refusals on the rows. */
function planFamilies(parsed: ParsedRow[], snapshot: CatalogueSnapshot): Map<string, PlannedFamily | null> {
  const byCode = new Map<string, ParsedRow[]>()
  for (const row of parsed) {
    if (row.familyCode === '') continue
    const list = byCode.get(row.familyCode) ?? []
    list.push(row)
    byCode.set(row.familyCode, list)
  }
  const planned = new Map<string, PlannedFamily | null>()
  for (const [code, rows] of byCode) {
    const merged: FamilyCells = {}
    let conflict = false
    for (const row of rows) {
      for (const column of FAMILY_COLUMNS) {
        const value = row.family[column.field]
        if (value === undefined) continue
        const earlier = merged[column.field]
        if (earlier === undefined) merged[column.field] = value
        else if (earlier !== value) {
          row.errors.push({ row: row.row, column: column.name, message: `family ${code} is described differently on another row ("${earlier}" there, "${value}" here)` })
          conflict = true
        }
      }
    }
    const existing = snapshot.families.get(code)
    const first = rows[0]
    if (!first) continue
    if (!existing && (merged.name === undefined || merged.type === undefined)) {
      for (const row of rows) {
        row.errors.push({ row: row.row, column: FAMILY_CODE_COLUMN, message: `unknown family ${code}: it is not in the catalogue; fill family_name and family_type to create it` })
      }
      planned.set(code, null)
      continue
    }
    const candidate = {
      code,
      name: merged.name ?? existing?.name,
      type: merged.type ?? existing?.type,
      description: merged.description ?? existing?.description ?? '',
      lifecycle: merged.lifecycle ?? existing?.lifecycle ?? 'active',
    }
    const result = familySpecSchema.safeParse(candidate)
    if (!result.success) {
      const columns: Record<string, string> = { code: FAMILY_CODE_COLUMN, name: 'family_name', type: 'family_type', description: 'family_description', lifecycle: 'family_lifecycle' }
      for (const issue of result.error.issues) {
        const field = String(issue.path[0] ?? '')
        const column = columns[field] ?? field
        const hint = field === 'type' ? ` (${motorTypeSchema.options.join(' or ')})` : field === 'lifecycle' ? ` (${lifecycleSchema.options.join(', ')})` : ''
        for (const row of rows) row.errors.push({ row: row.row, column, message: `${issue.message}${hint}` })
      }
      planned.set(code, null)
      continue
    }
    const spec = result.data
    if (existing && existing.type !== spec.type) {
      for (const row of rows) {
        if (row.family.type !== undefined) row.errors.push({ row: row.row, column: 'family_type', message: `family ${code} is ${existing.type} in the catalogue; an import cannot change a family's type` })
      }
      planned.set(code, null)
      continue
    }
    if (conflict) {
      planned.set(code, null)
      continue
    }
    const changes = existing
      ? diff([
          ['family_name', existing.name, spec.name],
          ['family_description', existing.description, spec.description],
          ['family_lifecycle', existing.lifecycle, spec.lifecycle],
        ])
      : []
    planned.set(code, { code, action: existing ? (changes.length ? 'change' : 'unchanged') : 'add', id: existing?.id ?? null, spec, changes })
  }
  return planned
}

/** Variant rules that need the family or other variants: capacitor data belongs to PSC motors only. */
function crossChecks(row: ParsedRow, variant: VariantSpec, family: FamilySpec): void {
  if (family.type === 'psc') {
    if (variant.capacitorUf === null) row.errors.push({ row: row.row, column: 'capacitor_uf', message: 'a PSC motor needs its run capacitor in microfarads' })
    if (variant.capacitorVac === null) row.errors.push({ row: row.row, column: 'capacitor_vac', message: "a PSC motor needs its capacitor's voltage rating" })
  } else {
    if (variant.capacitorUf !== null) row.errors.push({ row: row.row, column: 'capacitor_uf', message: 'a shaded-pole motor has no run capacitor; leave it empty' })
    if (variant.capacitorVac !== null) row.errors.push({ row: row.row, column: 'capacitor_vac', message: 'a shaded-pole motor has no run capacitor; leave it empty' })
  }
  if (new Set(variant.speedTaps).size !== variant.speedTaps.length) row.errors.push({ row: row.row, column: 'speed_taps', message: 'names a tap twice' })
}

function variantChanges(before: VariantSpec, after: VariantSpec): ImportFieldChange[] {
  const pairs: [string, unknown, unknown][] = [[FAMILY_CODE_COLUMN, before.familyCode, after.familyCode]]
  for (const column of VARIANT_COLUMNS) pairs.push([column.name, before[column.field], after[column.field]])
  return diff(pairs)
}

export function planCatalogueImport(parsedFile: ParsedFile, snapshot: CatalogueSnapshot): CataloguePlan {
  const parsed = parsedFile.rows
  const firstRowOf = new Map<string, number>()
  for (const row of parsed) {
    if (row.partNumber === '') continue
    const first = firstRowOf.get(row.partNumber)
    if (first !== undefined) row.errors.push({ row: row.row, column: PART_NUMBER_COLUMN, message: `part number ${row.partNumber} is also on row ${first}; give each variant one row` })
    else firstRowOf.set(row.partNumber, row.row)
  }
  const families = planFamilies(parsed, snapshot)
  const variants: PlannedVariant[] = []
  const rows: ImportRowPlan[] = []
  let errorCount = 0
  for (const row of parsed) {
    const family = families.get(row.familyCode)
    if (row.variant && family) crossChecks(row, row.variant, family.spec)
    if (row.errors.length || !row.variant || !family) {
      // A family refused on another row also blocks this one.
      if (row.errors.length === 0) row.errors.push({ row: row.row, column: FAMILY_CODE_COLUMN, message: `family ${row.familyCode} has problems on another row` })
      errorCount += 1
      rows.push({ row: row.row, partNumber: row.partNumber, familyCode: row.familyCode, name: row.name, action: 'error', changes: [], errors: row.errors })
      continue
    }
    const existing = snapshot.variants.get(row.variant.partNumber)
    const changes = existing ? variantChanges(existing.spec, row.variant) : []
    const action = existing ? (changes.length ? 'change' : 'unchanged') : 'add'
    variants.push({ row: row.row, action, id: existing?.id ?? null, spec: row.variant, changes })
    rows.push({ row: row.row, partNumber: row.partNumber, familyCode: row.familyCode, name: row.name, action, changes, errors: [] })
  }
  const familyPlans = [...families.values()].filter((f): f is PlannedFamily => f !== null)
  return { fileErrors: parsedFile.fileErrors, rows, families: familyPlans, variants, errorCount }
}

export function familyPlansForPreview(plan: CataloguePlan): ImportFamilyPlan[] {
  return plan.families.flatMap((f) => (f.action === 'unchanged' ? [] : [{ code: f.code, action: f.action, changes: f.changes }]))
}
