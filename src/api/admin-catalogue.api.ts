// Admin catalogue uploads: CSV import, performance data, datasheets; and the server's fan-curve reader.
import type {
  AdminDatasheetRow,
  FanCsvUnitChoice,
  FanCurveParseResult,
  ImportCommitResult,
  ImportPreview,
  PerformanceCommitResult,
  PerformancePreview,
  TorqueUploadUnit,
} from '@shared/contracts/import.contract'
import { http } from './http'

export const CATALOGUE_TEMPLATE_URL = '/api/admin/catalogue/import/template.csv'

function form(file: File, fields: Record<string, string | undefined> = {}): FormData {
  const data = new FormData()
  for (const [key, value] of Object.entries(fields)) if (value !== undefined && value !== '') data.append(key, value)
  data.append('file', file, file.name)
  return data
}

export async function previewCatalogueImport(file: File): Promise<ImportPreview> {
  return (await http.post<ImportPreview>('/admin/catalogue/import', form(file), { timeout: 120_000 })).data
}

export async function commitCatalogueImport(batchId: string): Promise<ImportCommitResult> {
  return (await http.post<ImportCommitResult>(`/admin/catalogue/import/batches/${encodeURIComponent(batchId)}/commit`, {}, { timeout: 120_000 })).data
}

export interface PerformanceUploadInput {
  partNumber: string
  tap: string
  volts: number
  hz: number
  source: 'measured' | 'datasheet' | 'fitted'
  torqueUnit?: TorqueUploadUnit
  referenceTempC?: number
}

export async function previewPerformance(file: File, input: PerformanceUploadInput): Promise<PerformancePreview> {
  const fields = {
    partNumber: input.partNumber,
    tap: input.tap,
    volts: String(input.volts),
    hz: String(input.hz),
    source: input.source,
    torqueUnit: input.torqueUnit,
    referenceTempC: input.referenceTempC === undefined ? undefined : String(input.referenceTempC),
  }
  return (await http.post<PerformancePreview>('/admin/catalogue/performance', form(file, fields))).data
}

export async function commitPerformance(batchId: string): Promise<PerformanceCommitResult> {
  return (await http.post<PerformanceCommitResult>(`/admin/catalogue/performance/batches/${encodeURIComponent(batchId)}/commit`, {})).data
}

export async function listDatasheets(filter: { partNumber?: string; familyCode?: string } = {}): Promise<AdminDatasheetRow[]> {
  return (await http.get<{ items: AdminDatasheetRow[] }>('/admin/catalogue/datasheets', { params: filter })).data.items
}

export async function uploadDatasheet(file: File, target: { partNumber: string } | { familyCode: string }): Promise<AdminDatasheetRow> {
  return (await http.post<AdminDatasheetRow>('/admin/catalogue/datasheets', form(file, target), { timeout: 120_000 })).data
}

export async function deleteDatasheet(id: string): Promise<void> {
  await http.delete(`/admin/catalogue/datasheets/${encodeURIComponent(id)}`)
}

/** The server's reading of a fan-curve file (the same reader for every buyer's upload). */
export async function parseFanCurveFile(file: File, units: FanCsvUnitChoice): Promise<FanCurveParseResult> {
  return (await http.post<FanCurveParseResult>('/v1/fan-curves/parse', form(file, units))).data
}
