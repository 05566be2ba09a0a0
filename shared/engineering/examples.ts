/**
 * Invented example data (Ashcombe Motor Works demo range) used by the specs, the benchmark and the
 * CLI cases. Not real products; the numbers are shaped like small fan motors.
 */
import type { CircuitMotor, CurveMotor, FanLoad } from './types'

/** 4-pole 50 Hz shaded-pole motor, about 10 W, with the usual torque dip near a third of n_s. */
export const shadedPoleCurve: CurveMotor = {
  model: 'curve',
  poles: 4,
  ratedVolts: 230,
  ratedHz: 50,
  points: [
    { rpm: 0, torqueNm: 0.06, currentA: 0.29, inputW: 38 },
    { rpm: 150, torqueNm: 0.058, currentA: 0.288, inputW: 37.6 },
    { rpm: 300, torqueNm: 0.05, currentA: 0.286, inputW: 37 },
    { rpm: 450, torqueNm: 0.04, currentA: 0.284, inputW: 36.4 },
    { rpm: 600, torqueNm: 0.05, currentA: 0.281, inputW: 36 },
    { rpm: 800, torqueNm: 0.066, currentA: 0.276, inputW: 35.3 },
    { rpm: 1000, torqueNm: 0.078, currentA: 0.27, inputW: 34.5 },
    { rpm: 1150, torqueNm: 0.08, currentA: 0.263, inputW: 33.4 },
    { rpm: 1250, torqueNm: 0.07, currentA: 0.257, inputW: 32.2 },
    { rpm: 1350, torqueNm: 0.045, currentA: 0.25, inputW: 30.5 },
    { rpm: 1450, torqueNm: 0.015, currentA: 0.243, inputW: 28.6 },
    { rpm: 1500, torqueNm: 0, currentA: 0.24, inputW: 27.8 },
  ],
}

/** 4-pole 50 Hz PSC fan motor, about 40 W, 3 uF run capacitor. */
export const pscCircuit: CircuitMotor = {
  model: 'circuit',
  poles: 4,
  ratedHz: 50,
  r1: 28,
  x1: 22,
  r2: 42,
  x2: 20,
  xm: 420,
  coreLossW: 4,
  frictionW: 2,
  aux: { r: 55, x: 30, turnsRatio: 1.35, capacitorUf: 3 },
}

/** Small axial fan, curve at 1500 r/min and 1.2 kg/m3, with a stall dip left of its peak. */
export const axialFan: FanLoad = {
  kind: 'fan',
  fan: {
    refRpm: 1500,
    refDensity: 1.2,
    points: [
      { flowM3s: 0, staticPa: 60, shaftW: 7 },
      { flowM3s: 0.05, staticPa: 48, shaftW: 7.6 },
      { flowM3s: 0.1, staticPa: 52, shaftW: 8.6 },
      { flowM3s: 0.15, staticPa: 45, shaftW: 9.4 },
      { flowM3s: 0.2, staticPa: 30, shaftW: 9.8 },
      { flowM3s: 0.25, staticPa: 12, shaftW: 9.9 },
      { flowM3s: 0.28, staticPa: 0, shaftW: 9.7 },
    ],
  },
  system: { k: 900 },
}

/** Blower for the PSC motor, curve at 1500 r/min, on a duct with a 20 Pa offset (a filter and damper). */
export const blowerFan: FanLoad = {
  kind: 'fan',
  fan: {
    refRpm: 1500,
    refDensity: 1.2,
    points: [
      { flowM3s: 0, staticPa: 220, shaftW: 18 },
      { flowM3s: 0.04, staticPa: 230, shaftW: 24 },
      { flowM3s: 0.08, staticPa: 215, shaftW: 30 },
      { flowM3s: 0.12, staticPa: 180, shaftW: 35 },
      { flowM3s: 0.16, staticPa: 125, shaftW: 38 },
      { flowM3s: 0.2, staticPa: 55, shaftW: 39 },
      { flowM3s: 0.23, staticPa: 0, shaftW: 38 },
    ],
  },
  system: { k: 6000, offsetPa: 20 },
}
