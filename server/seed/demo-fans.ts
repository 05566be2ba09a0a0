// Invented demo fans of the Ashcombe scenario, with curves shaped like their kinds of fan.
// Curves are at refRpm and 1.2 kg/m3 (standard air), from shut-off to just past free delivery.
import type { DemoFan } from '../../shared/contracts/catalogue.contract'

export interface DemoFanSeed extends Omit<DemoFan, 'id'> {
  /**
   * The speed at which the fan gives its suggested duty: the duty is the fan-law image of one
   * reference-curve point at this speed (Q ~ n, p ~ n^2), so it lies on the fan's own curve at the
   * speed such an appliance typically runs, below the fan's rated (reference) speed.
   */
  dutyRpm: number
  /** The reference-curve point that the duty is the image of. */
  dutyFromRefFlowM3s: number
}

/** The duty that a reference-curve point becomes at `dutyRpm` by the fan laws. */
function dutyAt(points: DemoFan['points'], refRpm: number, refFlow: number, dutyRpm: number): DemoFan['suggestedDuty'] {
  const p = points.find((point) => point.flowM3s === refFlow)
  if (!p) throw new Error(`no reference point at ${refFlow} m3/s`)
  const r = dutyRpm / refRpm
  return { flowM3s: Math.round(p.flowM3s * r * 1e5) / 1e5, staticPa: Math.round(p.staticPa * r * r * 10) / 10 }
}

function fan(spec: Omit<DemoFanSeed, 'suggestedDuty'>): DemoFanSeed {
  return { ...spec, suggestedDuty: dutyAt(spec.points, spec.refRpm, spec.dutyFromRefFlowM3s, spec.dutyRpm) }
}

export const DEMO_FANS: DemoFanSeed[] = [
  fan({
    code: 'RH-BLOWER-A',
    name: 'Larkspur-style range-hood blower, forward-curved wheel 180 mm',
    application: 'Range hood (kitchen extract), single-inlet forward-curved centrifugal blower',
    refRpm: 1500,
    refDensity: 1.2,
    // Forward-curved: pressure falls at first, recovers to a peak (the stall dip lies left of it),
    // then falls to free delivery; shaft power rises with flow (overloading characteristic).
    points: [
      { flowM3s: 0, staticPa: 290, shaftW: 30 },
      { flowM3s: 0.02, staticPa: 272, shaftW: 36 },
      { flowM3s: 0.04, staticPa: 262, shaftW: 43 },
      { flowM3s: 0.06, staticPa: 281, shaftW: 51 },
      { flowM3s: 0.08, staticPa: 272, shaftW: 59 },
      { flowM3s: 0.1, staticPa: 245, shaftW: 66 },
      { flowM3s: 0.12, staticPa: 201, shaftW: 73 },
      { flowM3s: 0.14, staticPa: 146, shaftW: 79 },
      { flowM3s: 0.16, staticPa: 82, shaftW: 84 },
      { flowM3s: 0.185, staticPa: 0, shaftW: 88 },
    ],
    dutyRpm: 1100,
    dutyFromRefFlowM3s: 0.1,
  }),
  fan({
    code: 'BATH-CF-A',
    name: 'Bath and utility exhaust fan, small centrifugal wheel 100 mm',
    application: 'Bath / utility-room exhaust, ceiling-mounted, 100 mm duct',
    refRpm: 1550,
    refDensity: 1.2,
    points: [
      { flowM3s: 0, staticPa: 165, shaftW: 6 },
      { flowM3s: 0.005, staticPa: 160, shaftW: 7 },
      { flowM3s: 0.01, staticPa: 153, shaftW: 8 },
      { flowM3s: 0.015, staticPa: 143, shaftW: 9 },
      { flowM3s: 0.02, staticPa: 130, shaftW: 10 },
      { flowM3s: 0.025, staticPa: 113, shaftW: 10.8 },
      { flowM3s: 0.03, staticPa: 92, shaftW: 11.4 },
      { flowM3s: 0.035, staticPa: 66, shaftW: 11.8 },
      { flowM3s: 0.04, staticPa: 36, shaftW: 12 },
      { flowM3s: 0.045, staticPa: 0, shaftW: 12 },
    ],
    dutyRpm: 1200,
    dutyFromRefFlowM3s: 0.025,
  }),
  fan({
    code: 'EVAP-AX-200',
    name: 'Refrigeration evaporator fan, 200 mm five-blade axial',
    application: 'Refrigerator / display-case evaporator, axial through the coil',
    refRpm: 1450,
    refDensity: 1.2,
    // Axial: shut-off pressure, a stall dip, a local peak, then the stable falling branch; shaft
    // power highest near shut-off, as is usual for axial fans.
    points: [
      { flowM3s: 0, staticPa: 54, shaftW: 8.6 },
      { flowM3s: 0.02, staticPa: 44, shaftW: 8.1 },
      { flowM3s: 0.04, staticPa: 39, shaftW: 7.7 },
      { flowM3s: 0.06, staticPa: 42, shaftW: 7.6 },
      { flowM3s: 0.08, staticPa: 36, shaftW: 7.7 },
      { flowM3s: 0.1, staticPa: 25, shaftW: 7.6 },
      { flowM3s: 0.12, staticPa: 11, shaftW: 7.2 },
      { flowM3s: 0.135, staticPa: 0, shaftW: 6.8 },
    ],
    dutyRpm: 1300,
    dutyFromRefFlowM3s: 0.1,
  }),
  fan({
    code: 'COND-AX-250',
    name: 'Condenser fan, 250 mm four-blade axial',
    application: 'Refrigeration condensing unit, axial through the condenser coil',
    refRpm: 1500,
    refDensity: 1.2,
    points: [
      { flowM3s: 0, staticPa: 72, shaftW: 21 },
      { flowM3s: 0.04, staticPa: 60, shaftW: 20 },
      { flowM3s: 0.08, staticPa: 52, shaftW: 19.2 },
      { flowM3s: 0.12, staticPa: 56, shaftW: 19.4 },
      { flowM3s: 0.16, staticPa: 48, shaftW: 19.8 },
      { flowM3s: 0.2, staticPa: 35, shaftW: 19.6 },
      { flowM3s: 0.24, staticPa: 18, shaftW: 18.6 },
      { flowM3s: 0.27, staticPa: 0, shaftW: 17.5 },
    ],
    dutyRpm: 1350,
    dutyFromRefFlowM3s: 0.2,
  }),
]
