/**
 * Public data types of the engineering core. SI units throughout (N m, W, Pa, m3/s, kg/m3, V, Hz,
 * ohm, uF for capacitors); speeds in r/min.
 */

/** The mains the motor runs on. */
export interface Supply {
  volts: number
  hz: number
}

/** One measured point of a motor curve at rated volts and Hz (shaft torque). */
export interface CurvePoint {
  rpm: number
  torqueNm: number
  currentA?: number
  inputW?: number
}

/**
 * A motor known by its measured speed-torque curve at rated volts and Hz. Points run from
 * standstill (rpm 0) upwards in strictly increasing speed, not above synchronous speed; currentA
 * and inputW are given on every point or on none.
 */
export interface CurveMotor {
  model: 'curve'
  poles: number
  ratedVolts: number
  ratedHz: number
  points: CurvePoint[]
}

/** The auxiliary (capacitor) winding of a PSC motor: its own r and x, N_aux / N_main, run capacitor. */
export interface AuxWinding {
  r: number
  x: number
  turnsRatio: number
  capacitorUf: number
}

/**
 * A motor known by its equivalent circuit (double-revolving-field model), per the main winding:
 * r1 x1 stator, r2 x2 rotor referred to the main winding, xm magnetising; reactances at ratedHz.
 * With `aux` it is a PSC motor; without it runs on the main winding alone.
 */
export interface CircuitMotor {
  model: 'circuit'
  poles: number
  ratedHz: number
  r1: number
  x1: number
  r2: number
  x2: number
  xm: number
  coreLossW?: number
  frictionW?: number
  aux?: AuxWinding
}

export type MotorModel = CurveMotor | CircuitMotor

export interface TorquePoint {
  rpm: number
  torqueNm: number
}

/** A load known by its torque against speed (from rpm 0; held at the last value beyond the table). */
export interface TorqueLoad {
  kind: 'torque'
  points: TorquePoint[]
}

export interface FanPoint {
  flowM3s: number
  staticPa: number
  shaftW: number
}

/** A fan curve at refRpm and refDensity, from shut-off (flow 0) in strictly increasing flow. */
export interface FanCurve {
  refRpm: number
  refDensity: number
  points: FanPoint[]
}

/** System resistance p = offsetPa + k Q^2 at the operating density. */
export interface SystemCurve {
  k: number
  offsetPa?: number
}

export interface FanLoad {
  kind: 'fan'
  fan: FanCurve
  system: SystemCurve
  /** Operating air density in kg/m3; default the fan curve's reference density. */
  density?: number
}

export type Load = TorqueLoad | FanLoad

/** The motor at one speed. Optional figures appear where the motor's data allow them. */
export interface MotorEvaluation {
  rpm: number
  slip: number
  shaftTorqueNm: number
  /** Circuit models: (forward - backward air-gap power) / synchronous angular speed. */
  airGapTorqueNm?: number
  /** Line current (main + auxiliary for a PSC motor). */
  currentA?: number
  powerFactor?: number
  inputW?: number
  outputW?: number
  efficiency?: number
  /** Circuit models: the power flows behind the figures above. */
  forwardAirGapW?: number
  backwardAirGapW?: number
  statorCopperW?: number
  rotorCopperW?: number
  /** Circuit PSC models: main and auxiliary winding current magnitudes. */
  mainCurrentA?: number
  auxCurrentA?: number
  /** |I_backward| / |I_forward|, 0 for a perfectly balanced two-phase operation. */
  unbalance?: number
  /** Curve models: the speed lies beyond the last measured point. */
  extrapolated?: boolean
}

/** What the load does at one speed. */
export interface LoadEvaluation {
  rpm: number
  torqueNm: number
  shaftW: number
  flowM3s?: number
  staticPa?: number
  /** Fan: the operating point lies left of the fan's pressure peak (stall region). */
  fanStall?: boolean
  /** Fan: the fan cannot overcome the system's offset pressure at this speed; it runs at shut-off. */
  fanNoFlow?: boolean
  /** Torque table: the speed lies beyond the last point (torque held). */
  extrapolated?: boolean
}

export type OperatingStatus = 'running' | 'no-start'

export interface SolveOptions {
  /**
   * Speed the motor accelerates from, default 0. Set it to the switch-over speed to study a
   * capacitor-start motor on its main winding after the start switch opens.
   */
  startRpm?: number
  /** Root tolerance in r/min, default 1e-6 of synchronous speed. */
  tolRpm?: number
}

/** The steady running point (or the reason there is none). Never contains NaN. */
export interface OperatingPoint {
  status: OperatingStatus
  /** Steady speed; for 'no-start' the start speed (0 unless options.startRpm). */
  rpm: number
  slip: number
  syncRpm: number
  shaftTorqueNm: number
  loadTorqueNm: number
  airGapTorqueNm?: number
  currentA?: number
  powerFactor?: number
  inputW?: number
  /** Shaft output of the motor at the point (0 at standstill). */
  outputW: number
  efficiency?: number
  flowM3s?: number
  staticPa?: number
  fanShaftW?: number
  fanStall?: boolean
  fanNoFlow?: boolean
  /**
   * Running, but trapped below a faster point the motor could hold if it got past a torque dip
   * (a crawl, e.g. a shaded-pole motor in its third-harmonic dip).
   */
  crawl: boolean
  /**
   * The point sits on a jump in load torque: a fan at the speed where it breaks through its
   * system's offset pressure. Motor and load torque differ there; expect hunting in service.
   */
  loadJump?: boolean
  /** Motor curve or load table used beyond its last point. */
  extrapolated: boolean
  /** Motor and load torque at the start speed. */
  startingTorqueNm: number
  loadStartingTorqueNm: number
  /** Motor evaluations the solve cost (the final full evaluation included). */
  evaluations: number
}
