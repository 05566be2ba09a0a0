// Contracts of the admin's uploads: catalogue CSV import (preview, commit), performance data
// upload, datasheets, and the fan-curve CSV reader that buyers' duty studies use.
import { z } from 'zod'
import { motorModelSchema, performanceSourceSchema, variantSpecSchema } from './catalogue.contract'

// ---------------------------------------------------------------- catalogue import
/** One problem of a row: spreadsheet row number (the header is row 1), the column, the reason. */
export interface ImportRowError {
  row: number
  column: string | null
  message: string
}

/** One field that the import would change: CSV column, the value now and the value in the file. */
export interface ImportFieldChange {
  column: string
  from: string
  to: string
}

export type ImportRowAction = 'add' | 'change' | 'unchanged' | 'error'

export interface ImportRowPlan {
  row: number
  partNumber: string
  familyCode: string
  name: string
  action: ImportRowAction
  changes: ImportFieldChange[]
  errors: ImportRowError[]
}

export interface ImportFamilyPlan {
  code: string
  action: 'add' | 'change'
  changes: ImportFieldChange[]
}

export interface ImportPreview {
  batchId: string
  fileName: string
  fileSha256: string
  catalogueRevision: number
  status: ImportBatchStatus
  createdAt: string
  /** Problems with the file as a whole (columns missing or unknown, empty file). */
  fileErrors: string[]
  counts: { rows: number; add: number; change: number; unchanged: number; error: number; familiesAdded: number; familiesChanged: number }
  /** Every row that is added, changed or refused; unchanged rows only by count and part number. */
  rows: ImportRowPlan[]
  unchangedPartNumbers: string[]
  families: ImportFamilyPlan[]
  /** True when nothing blocks the commit (no errors and something to write). */
  committable: boolean
}

export const IMPORT_BATCH_STATUSES = ['previewed', 'committed'] as const
export type ImportBatchStatus = (typeof IMPORT_BATCH_STATUSES)[number]

export interface ImportCommitResult {
  batchId: string
  added: number
  changed: number
  unchanged: number
  familiesAdded: number
  familiesChanged: number
  catalogueRevision: number
}

export const batchParamsSchema = z.object({ id: z.uuid({ error: 'not a batch id' }) })

// ---------------------------------------------------------------- performance upload
export const TORQUE_UPLOAD_UNITS = ['N m', 'oz-in', 'lb-in'] as const
export type TorqueUploadUnit = (typeof TORQUE_UPLOAD_UNITS)[number]

const formNumber = (label: string) =>
  z.preprocess((value) => (typeof value === 'string' && value.trim() !== '' ? Number(value) : value), z.number({ error: `${label} must be a number` }).finite().positive({ error: `${label} must be above 0` }))

/** The form fields sent with a performance CSV (multipart text fields). */
export const performanceUploadFieldsSchema = z.object({
  partNumber: variantSpecSchema.shape.partNumber,
  tap: z.string().trim().min(1, { error: 'choose a speed tap' }).max(20),
  volts: formNumber('volts'),
  hz: formNumber('Hz'),
  source: performanceSourceSchema.default('measured'),
  /** Torque unit when the header does not name one. */
  torqueUnit: z.enum(TORQUE_UPLOAD_UNITS).optional(),
  referenceTempC: z.preprocess((value) => (typeof value === 'string' && value.trim() !== '' ? Number(value) : value === '' ? undefined : value), z.number().finite().min(-40).max(200).default(25)),
})
export type PerformanceUploadFields = z.infer<typeof performanceUploadFieldsSchema>

export interface CurveSample {
  rpm: number
  torqueNm: number
  currentA: number | null
  inputW: number | null
}

export interface PerformancePreview {
  batchId: string
  partNumber: string
  tap: string
  volts: number
  hz: number
  source: z.infer<typeof performanceSourceSchema>
  referenceTempC: number
  motor: z.infer<typeof motorModelSchema>
  synchronousRpm: number
  /** How the file was read: 'curve' points or 'circuit' values; torque unit used for points. */
  readAs: 'curve' | 'circuit'
  torqueUnit: TorqueUploadUnit | null
  /** The new data and the data it replaces (null when there is none), sampled over 0..n_s. */
  newCurve: CurveSample[]
  currentCurve: CurveSample[] | null
  currentPerformanceId: string | null
  warnings: string[]
  createdAt: string
}

export interface PerformanceCommitResult {
  batchId: string
  performanceId: string
  replacedId: string | null
  catalogueRevision: number
}

/** A refused performance file: every problem with its line and column. */
export interface PerformanceRowError {
  line: number | null
  column: string | null
  message: string
}

// ---------------------------------------------------------------- datasheets
export const DATASHEET_MAX_BYTES = 10 * 1024 * 1024

export const datasheetTargetSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('family'), code: z.string().trim().min(1).max(24) }),
  z.object({ kind: z.literal('variant'), partNumber: z.string().trim().min(1).max(40) }),
])

export const datasheetListQuerySchema = z.object({
  familyCode: z.string().trim().min(1).max(24).optional(),
  partNumber: z.string().trim().min(1).max(40).optional(),
})

export interface AdminDatasheetRow {
  id: string
  originalName: string
  sizeBytes: number
  uploadedAt: string
  uploadedBy: string | null
  familyCode: string | null
  partNumber: string | null
}

// ---------------------------------------------------------------- fan-curve CSV
export const FAN_FLOW_UNITS = ['m3/h', 'm3/s', 'L/s', 'CFM'] as const
export const FAN_PRESSURE_UNITS = ['Pa', 'inH2O', 'mmH2O'] as const
export const FAN_POWER_UNITS = ['W', 'kW', 'hp'] as const
export const MAX_FAN_CSV_BYTES = 200_000

export const fanCsvUnitsSchema = z.object({
  flow: z.enum(FAN_FLOW_UNITS).default('m3/h'),
  pressure: z.enum(FAN_PRESSURE_UNITS).default('Pa'),
  power: z.enum(FAN_POWER_UNITS).default('W'),
})
export type FanCsvUnitChoice = z.infer<typeof fanCsvUnitsSchema>

/** JSON form of POST /api/v1/fan-curves/parse (the multipart form carries the same fields). */
export const fanCurveParseBodySchema = fanCsvUnitsSchema.extend({
  text: z.string().max(MAX_FAN_CSV_BYTES, { error: 'the text is longer than 200 kB; a fan curve needs only a few rows' }).optional(),
})

export interface FanCsvRowProblem {
  /** 1-based line of the text. */
  line: number
  column?: 'flow' | 'pressure' | 'power'
  message: string
}

export interface FanCurveParseResult {
  points: { flowM3s: number; staticPa: number; shaftW: number }[]
  errors: FanCsvRowProblem[]
  units: FanCsvUnitChoice
  unitsFromHeader: ('flow' | 'pressure' | 'power')[]
  refRpm: number | null
}
