// The catalogue CSV's column set (docs/catalogue-csv.md): one row per variant, its family's
// columns repeated on each row, units in the column names. Cells are read into the shapes of the
// shared contracts (FamilySpec, VariantSpec) and written back the same way for diffs and the template.
import type { FamilySpec, VariantSpec } from '../../shared/contracts/catalogue.contract'

export type CellKind = 'text' | 'number' | 'integer' | 'boolean' | 'list'

/** `required`: the cell must hold a value; `optional`: empty means null; `default`: empty means the contract's default. */
export type CellPresence = 'required' | 'optional' | 'default'

type VariantField = Exclude<keyof VariantSpec, 'familyCode'>
type FamilyField = Exclude<keyof FamilySpec, 'code'>

export interface VariantColumn {
  name: string
  field: VariantField
  kind: CellKind
  presence: CellPresence
  example: string
  help: string
}

export interface FamilyColumn {
  name: string
  field: FamilyField
  kind: 'text'
  example: string
  help: string
}

export const FAMILY_CODE_COLUMN = 'family_code'
export const PART_NUMBER_COLUMN = 'part_number'
/** Speed taps share one cell, separated by this (the comma is the CSV's own delimiter). */
export const LIST_SEPARATOR = '|'

/** Family columns after family_code; empty cells keep what the catalogue (or another row) says. */
export const FAMILY_COLUMNS: FamilyColumn[] = [
  { name: 'family_name', field: 'name', kind: 'text', example: 'Ashcombe SP-84 shaded-pole', help: 'needed for a new family' },
  { name: 'family_type', field: 'type', kind: 'text', example: 'shaded-pole', help: 'shaded-pole or psc; needed for a new family, cannot change' },
  { name: 'family_description', field: 'description', kind: 'text', example: 'Open-frame shaded-pole motors for bath fans', help: 'free text' },
  { name: 'family_lifecycle', field: 'lifecycle', kind: 'text', example: 'active', help: 'active, not-for-new-designs or discontinued' },
]

export const VARIANT_COLUMNS: VariantColumn[] = [
  { name: 'name', field: 'name', kind: 'text', presence: 'required', example: 'SP-84 4-pole 120 V 60 Hz 9 W', help: 'the variant name buyers see' },
  { name: 'poles', field: 'poles', kind: 'integer', presence: 'required', example: '4', help: '2, 4, 6 or 8' },
  { name: 'rated_voltage_v', field: 'ratedVolts', kind: 'number', presence: 'required', example: '120', help: 'volts' },
  { name: 'rated_frequency_hz', field: 'ratedHz', kind: 'integer', presence: 'required', example: '60', help: '50 or 60' },
  { name: 'dual_frequency', field: 'dualFrequency', kind: 'boolean', presence: 'default', example: 'no', help: 'yes when also rated on the other of 50/60 Hz' },
  { name: 'rated_output_w', field: 'ratedOutputW', kind: 'number', presence: 'required', example: '9', help: 'shaft output, watts' },
  { name: 'rated_speed_rpm', field: 'ratedRpm', kind: 'number', presence: 'required', example: '1550', help: 'r/min at rated load' },
  { name: 'rated_current_a', field: 'ratedCurrentA', kind: 'number', presence: 'required', example: '0.42', help: 'amperes' },
  { name: 'rated_input_w', field: 'ratedInputW', kind: 'number', presence: 'required', example: '38', help: 'watts' },
  { name: 'locked_rotor_torque_nm', field: 'lockedRotorTorqueNm', kind: 'number', presence: 'required', example: '0.035', help: 'N m' },
  { name: 'breakdown_torque_nm', field: 'breakdownTorqueNm', kind: 'number', presence: 'required', example: '0.07', help: 'N m' },
  { name: 'frame_diameter_mm', field: 'frameDiameterMm', kind: 'number', presence: 'required', example: '84', help: 'mm' },
  { name: 'stack_length_mm', field: 'stackLengthMm', kind: 'number', presence: 'required', example: '20', help: 'mm' },
  { name: 'shaft_diameter_mm', field: 'shaftDiameterMm', kind: 'number', presence: 'required', example: '6', help: 'mm' },
  { name: 'shaft_length_mm', field: 'shaftLengthMm', kind: 'number', presence: 'required', example: '30', help: 'mm' },
  { name: 'mounting', field: 'mounting', kind: 'text', presence: 'required', example: 'through-bolt', help: 'stud, through-bolt, flange, bracket, resilient-ring or belly-band' },
  { name: 'rotation', field: 'rotation', kind: 'text', presence: 'required', example: 'ccw', help: 'cw or ccw' },
  { name: 'rotation_viewed_from', field: 'rotationViewedFrom', kind: 'text', presence: 'required', example: 'shaft-end', help: 'shaft-end or lead-end' },
  { name: 'other_rotation_available', field: 'otherRotationAvailable', kind: 'boolean', presence: 'required', example: 'no', help: 'yes or no' },
  { name: 'enclosure', field: 'enclosure', kind: 'text', presence: 'required', example: 'open', help: 'open, air-over or totally-enclosed' },
  { name: 'insulation_class', field: 'insulationClass', kind: 'text', presence: 'required', example: 'B', help: 'IEC 60085 class: A, E, B, F or H' },
  { name: 'protection', field: 'protection', kind: 'text', presence: 'required', example: 'impedance', help: 'impedance, auto-reset, manual-reset or none' },
  { name: 'max_ambient_c', field: 'maxAmbientC', kind: 'number', presence: 'required', example: '40', help: 'degrees Celsius' },
  { name: 'capacitor_uf', field: 'capacitorUf', kind: 'number', presence: 'optional', example: '', help: 'run capacitor, microfarads; PSC only' },
  { name: 'capacitor_vac', field: 'capacitorVac', kind: 'number', presence: 'optional', example: '', help: 'capacitor voltage rating, volts AC; PSC only' },
  { name: 'copper_mass_g', field: 'copperMassG', kind: 'integer', presence: 'required', example: '95', help: 'grams of winding copper (for the metal surcharge)' },
  { name: 'weight_g', field: 'weightG', kind: 'integer', presence: 'required', example: '620', help: 'grams' },
  { name: 'moq', field: 'moq', kind: 'integer', presence: 'default', example: '500', help: 'minimum order quantity; empty means 100' },
  { name: 'lead_time_days', field: 'leadTimeDays', kind: 'integer', presence: 'default', example: '42', help: 'days; empty means 42' },
  { name: 'lifecycle', field: 'lifecycle', kind: 'text', presence: 'default', example: 'active', help: 'active, not-for-new-designs or discontinued; empty means active' },
  { name: 'speed_taps', field: 'speedTaps', kind: 'list', presence: 'required', example: 'high', help: 'tap names separated by |, e.g. high|medium|low' },
]

/** Every column in template order. */
export const CATALOGUE_COLUMNS: string[] = [FAMILY_CODE_COLUMN, ...FAMILY_COLUMNS.map((c) => c.name), PART_NUMBER_COLUMN, ...VARIANT_COLUMNS.map((c) => c.name)]

const columnByVariantField = new Map<string, string>(VARIANT_COLUMNS.map((c) => [c.field, c.name]))
const columnByFamilyField = new Map<string, string>(FAMILY_COLUMNS.map((c) => [c.field, c.name]))

/** The CSV column of a contract field, for error reports ("ratedVolts" -> "rated_voltage_v"). */
export function columnOfVariantField(field: string): string {
  if (field === 'partNumber') return PART_NUMBER_COLUMN
  if (field === 'familyCode') return FAMILY_CODE_COLUMN
  return columnByVariantField.get(field) ?? field
}

export function columnOfFamilyField(field: string): string {
  if (field === 'code') return FAMILY_CODE_COLUMN
  return columnByFamilyField.get(field) ?? field
}

/** A stored or parsed value as the CSV writes it, so diffs read like the file. */
export function formatCell(value: unknown): string {
  if (value === null || value === undefined) return ''
  if (typeof value === 'boolean') return value ? 'yes' : 'no'
  if (Array.isArray(value)) return value.map(String).join(LIST_SEPARATOR)
  return String(value)
}

/** Quotes a cell when the CSV needs it (RFC 4180). */
export function csvCell(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value
}

export function csvLine(cells: string[]): string {
  return cells.map(csvCell).join(',')
}
