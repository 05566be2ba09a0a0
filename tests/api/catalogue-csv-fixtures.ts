// Catalogue CSV rows for the import tests, in the documented column set (docs/catalogue-csv.md).
import { CATALOGUE_COLUMNS } from '../../server/imports/catalogue-columns'

/** A shaded-pole variant row in the documented column set; `cells` overrides single columns. */
export function variantRow(family: string, partNumber: string, cells: Record<string, string> = {}): Record<string, string> {
  return {
    family_code: family,
    family_name: `Test family ${family}`,
    family_type: 'shaded-pole',
    family_description: 'Open-frame shaded-pole motors for tests',
    family_lifecycle: 'active',
    part_number: partNumber,
    name: `Shaded-pole test motor ${partNumber}`,
    poles: '4',
    rated_voltage_v: '120',
    rated_frequency_hz: '60',
    dual_frequency: 'no',
    rated_output_w: '9',
    rated_speed_rpm: '1550',
    rated_current_a: '0.42',
    rated_input_w: '38',
    locked_rotor_torque_nm: '0.035',
    breakdown_torque_nm: '0.07',
    frame_diameter_mm: '84',
    stack_length_mm: '20',
    shaft_diameter_mm: '6',
    shaft_length_mm: '30',
    mounting: 'through-bolt',
    rotation: 'ccw',
    rotation_viewed_from: 'shaft-end',
    other_rotation_available: 'no',
    enclosure: 'open',
    insulation_class: 'B',
    protection: 'impedance',
    max_ambient_c: '40',
    capacitor_uf: '',
    capacitor_vac: '',
    copper_mass_g: '95',
    weight_g: '620',
    moq: '500',
    lead_time_days: '42',
    lifecycle: 'active',
    speed_taps: 'high',
    ...cells,
  }
}

export function csvOf(rows: Record<string, string>[], columns: string[] = CATALOGUE_COLUMNS): string {
  const quote = (value: string) => (/[",\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value)
  return [columns.join(','), ...rows.map((row) => columns.map((c) => quote(row[c] ?? '')).join(','))].join('\n') + '\n'
}

