/**
 * Spinwright engineering core: public API. Pure TypeScript, SI units inside, speeds in r/min.
 * See docs/engineering.md for the methods and their sources.
 */
export * from './types'
export { EngineeringInputError } from './errors'
export { syncRpm, slipOf, radPerSecond, validateSupply } from './speed'
export { Pchip } from './pchip'
export { validateMotor, prepareMotor, isPreparedMotor, evaluateMotor, type PreparedMotor, type BoundMotor } from './motor'
export { FIXED_LOSS_KNEE } from './machine'
export { validateLoad, prepareLoad, isPreparedLoad, evaluateLoad, type PreparedLoad } from './load'
export { solveOperatingPoint, solveBound, tabulateScan, validateSolveOptions } from './solver'
export {
  FLOW_FACTORS,
  PRESSURE_FACTORS,
  TORQUE_FACTORS,
  POWER_FACTORS,
  toSI,
  fromSI,
  convert,
  quantityOf,
  type FlowUnit,
  type PressureUnit,
  type TorqueUnit,
  type PowerUnit,
  type EngineeringUnit,
  type Quantity,
} from './units'
export {
  toleranceAnalysis,
  hotResistance,
  hotMotor,
  COPPER_CONSTANT,
  type HotWinding,
  type ToleranceOptions,
  type ToleranceCase,
  type ToleranceCaseName,
  type ToleranceResult,
} from './tolerance'
export { capacitorSweep, balancingCapacitor, balancedAtDuty, type CapacitorRow, type BalancingResult } from './capacitor'
export {
  airPowerW,
  systemEfficiency,
  breakdownTorque,
  breakdownMargin,
  temperatureRiseByResistance,
  energyCost,
  dutyFigures,
  type Breakdown,
  type BreakdownMargin,
  type ResistanceRise,
  type EnergyInput,
  type EnergyCost,
  type DutyFigures,
} from './derived'
export { INSULATION_CLASSES, insulationClass, insulationMarginK, type InsulationClass } from './insulation'
export { shadedPoleRotation, efficiencyWarnings, TYPICAL_EFFICIENCY, type MotorType, type Rotation } from './motor-types'
