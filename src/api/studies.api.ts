import type { RunResult, StudyInput, StudyRecord, StudyRunRecord, StudySummary } from '@shared/contracts/study.contract'
import type { Page } from '@shared/contracts/admin.contract'
import type { UnitSystem } from '@shared/contracts/auth.contract'
import { http } from './http'

/** Runs a study without saving it (anonymous visitors too; no prices). */
export async function previewRun(input: StudyInput): Promise<RunResult> {
  return (await http.post<RunResult>('/v1/studies/preview-run', { input })).data
}

export async function listStudies(params: { page?: number; pageSize?: number; search?: string } = {}): Promise<Page<StudySummary>> {
  return (await http.get<Page<StudySummary>>('/v1/studies', { params })).data
}

export async function createStudy(input: StudyInput): Promise<StudyRecord> {
  return (await http.post<StudyRecord>('/v1/studies', { input })).data
}

export async function getStudy(id: string): Promise<StudyRecord> {
  return (await http.get<StudyRecord>(`/v1/studies/${encodeURIComponent(id)}`)).data
}

/** Saves new inputs; `version` is the one the editor loaded (a stale one answers 409). */
export async function updateStudy(id: string, input: StudyInput, version: number): Promise<StudyRecord> {
  return (await http.put<StudyRecord>(`/v1/studies/${encodeURIComponent(id)}`, { input, version })).data
}

export async function deleteStudy(id: string): Promise<void> {
  await http.delete(`/v1/studies/${encodeURIComponent(id)}`)
}

/** Runs the saved study on the current catalogue and stores the run (with changes since the last one). */
export async function runStudy(id: string): Promise<StudyRunRecord> {
  return (await http.post<StudyRunRecord>(`/v1/studies/${encodeURIComponent(id)}/runs`, {})).data
}

export async function getRun(studyId: string, runId: string): Promise<StudyRunRecord> {
  return (await http.get<StudyRunRecord>(`/v1/studies/${encodeURIComponent(studyId)}/runs/${encodeURIComponent(runId)}`)).data
}

export function runCsvUrl(studyId: string, runId: string, units: UnitSystem): string {
  return `/api/v1/studies/${encodeURIComponent(studyId)}/runs/${encodeURIComponent(runId)}/export.csv?units=${units}`
}

export async function shareStudy(id: string): Promise<StudyRecord> {
  return (await http.post<StudyRecord>(`/v1/studies/${encodeURIComponent(id)}/share`, {})).data
}

export async function unshareStudy(id: string): Promise<StudyRecord> {
  return (await http.delete<StudyRecord>(`/v1/studies/${encodeURIComponent(id)}/share`)).data
}

export async function getSharedStudy(token: string): Promise<StudyRecord & { latestRun: StudyRunRecord | null }> {
  return (await http.get<StudyRecord & { latestRun: StudyRunRecord | null }>(`/v1/shared/studies/${encodeURIComponent(token)}`)).data
}
