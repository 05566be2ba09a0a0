// Display units follow the signed-in user's preference (SI or US customary); inside, all is SI.
import { computed } from 'vue'
import { fromSI, toSI, type FlowUnit, type PressureUnit, type TorqueUnit, type PowerUnit } from '@shared/engineering'
import { useSessionStore } from '@/stores/session.store'
import type { UnitSystem } from '@shared/contracts/auth.contract'

export interface UnitSet {
  flow: FlowUnit
  pressure: PressureUnit
  torque: TorqueUnit
  power: PowerUnit
}

export const UNIT_SETS: Record<UnitSystem, UnitSet> = {
  si: { flow: 'm3/h', pressure: 'Pa', torque: 'N m', power: 'W' },
  us: { flow: 'CFM', pressure: 'inH2O', torque: 'oz-in', power: 'W' },
}

const LABELS: Record<string, string> = { 'm3/h': 'm³/h', 'm3/s': 'm³/s', 'N m': 'N·m', inH2O: 'in wg' }

export function unitLabel(unit: string): string {
  return LABELS[unit] ?? unit
}

/** Sensible decimals for a display value. */
export function round(value: number, unit: string): string {
  if (!Number.isFinite(value)) return '–'
  const decimals = unit === 'inH2O' ? 3 : unit === 'N m' ? 3 : unit === 'oz-in' || unit === 'lb-in' ? 1 : Math.abs(value) < 10 ? 2 : Math.abs(value) < 100 ? 1 : 0
  return value.toLocaleString('en-US', { minimumFractionDigits: decimals, maximumFractionDigits: decimals })
}

export function useUnits() {
  const session = useSessionStore()
  const system = computed<UnitSystem>(() => session.units)
  const set = computed(() => UNIT_SETS[system.value])

  return {
    system,
    set,
    flow: (m3s: number) => fromSI(m3s, set.value.flow),
    pressure: (pa: number) => fromSI(pa, set.value.pressure),
    torque: (nm: number) => fromSI(nm, set.value.torque),
    toFlowSI: (value: number) => toSI(value, set.value.flow),
    toPressureSI: (value: number) => toSI(value, set.value.pressure),
    formatFlow: (m3s: number) => `${round(fromSI(m3s, set.value.flow), set.value.flow)} ${unitLabel(set.value.flow)}`,
    formatPressure: (pa: number) => `${round(fromSI(pa, set.value.pressure), set.value.pressure)} ${unitLabel(set.value.pressure)}`,
    formatTorque: (nm: number) => `${round(fromSI(nm, set.value.torque), set.value.torque)} ${unitLabel(set.value.torque)}`,
    formatPower: (w: number) => `${round(w, 'W')} W`,
  }
}
