// Fan-curve CSV in the browser: pasted text is read here with the shared reader, an uploaded file
// by the server's route, which runs the same reader. This file keeps the study screen's names for
// the reader's units, result and limits.
import { computed, ref, shallowRef } from 'vue'
import {
  FAN_FLOW_UNITS,
  FAN_POWER_UNITS,
  FAN_PRESSURE_UNITS,
  MAX_FAN_CSV_BYTES,
  type FanCsvRowProblem,
  type FanCsvUnitChoice,
  type FanCurveParseResult,
} from '@shared/contracts/import.contract'
import { parseFanCurveCsv } from '@shared/imports/fan-curve-csv'
import { parseFanCurveFile } from '@/api/admin-catalogue.api'

export const CSV_FLOW_UNITS = FAN_FLOW_UNITS
export const CSV_PRESSURE_UNITS = FAN_PRESSURE_UNITS
export const CSV_POWER_UNITS = FAN_POWER_UNITS
export { MAX_FAN_CSV_BYTES }
export type CsvFlowUnit = FanCsvUnitChoice['flow']
export type CsvPressureUnit = FanCsvUnitChoice['pressure']
export type CsvPowerUnit = FanCsvUnitChoice['power']
export type FanCsvColumn = NonNullable<FanCsvRowProblem['column']>
export type FanCsvUnits = FanCsvUnitChoice
export type FanCsvRowError = FanCsvRowProblem
export type FanCsvResult = FanCurveParseResult

/** Parses fan-curve text; never throws: a bad line becomes an error naming it. */
export const parseFanCsv = parseFanCurveCsv

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
    // every buyer's upload goes through; pasted text stays in the browser. Both run the shared reader.
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
