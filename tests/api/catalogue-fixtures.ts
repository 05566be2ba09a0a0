// Small invented catalogue rows for API tests, built from the engineering core's example motors.
import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import { CatalogueRevision, MotorFamily, MotorPerformance, MotorVariant } from '../../server/db/entities'
import { pscCircuit, shadedPoleCurve } from '../../shared/engineering/examples'
import type { MotorModel } from '../../shared/engineering'
import type { StudyInput } from '../../shared/contracts/study.contract'
import { studyInputSchema } from '../../shared/contracts/study.contract'

export interface FixtureVariant {
  partNumber: string
  type: 'shaded-pole' | 'psc'
  volts: number
  hz: 50 | 60
  lifecycle?: 'active' | 'not-for-new-designs' | 'discontinued'
  frameDiameterMm?: number
  outputW?: number
  insulationClass?: string
  taps?: { tap: string; motor: MotorModel }[]
}

/** A lower speed tap of a PSC motor: more main turns, so higher impedances on the same supply. */
export function lowerTap(motor: typeof pscCircuit, factor: number): typeof pscCircuit {
  return { ...motor, r1: motor.r1 * factor, x1: motor.x1 * factor, xm: motor.xm * factor, r2: motor.r2 * factor, x2: motor.x2 * factor }
}

export async function insertVariants(dataSource: DataSource, prefix: string, variants: FixtureVariant[]): Promise<void> {
  await dataSource.transaction(async (manager) => {
    for (const spec of variants) {
      const family = await manager.save(
        manager.create(MotorFamily, { code: `F${randomUUID().slice(0, 8).toUpperCase()}`, name: `Family of ${spec.partNumber}`, type: spec.type, description: 'test family', lifecycle: 'active' }),
      )
      const taps = spec.taps ?? [{ tap: 'high', motor: spec.type === 'psc' ? pscCircuit : shadedPoleCurve }]
      const variant = await manager.save(
        manager.create(MotorVariant, {
          partNumber: `${prefix}-${spec.partNumber}`,
          familyId: family.id,
          name: `${spec.type === 'psc' ? 'PSC' : 'Shaded-pole'} test motor ${spec.partNumber}`,
          type: spec.type,
          poles: 4,
          ratedVolts: spec.volts,
          ratedHz: spec.hz,
          dualFrequency: false,
          ratedOutputW: spec.outputW ?? (spec.type === 'psc' ? 40 : 8),
          ratedRpm: spec.type === 'psc' ? 1380 : 1150,
          ratedCurrentA: 0.3,
          ratedInputW: spec.type === 'psc' ? 70 : 35,
          lockedRotorTorqueNm: 0.1,
          breakdownTorqueNm: 0.3,
          frameDiameterMm: spec.frameDiameterMm ?? (spec.type === 'psc' ? 120 : 84),
          stackLengthMm: 30,
          shaftDiameterMm: 8,
          shaftLengthMm: 40,
          mounting: 'through-bolt',
          rotation: 'ccw',
          rotationViewedFrom: 'shaft-end',
          otherRotationAvailable: spec.type === 'psc',
          enclosure: 'open',
          insulationClass: spec.insulationClass ?? 'B',
          protection: spec.type === 'psc' ? 'auto-reset' : 'impedance',
          maxAmbientC: 50,
          capacitorUf: spec.type === 'psc' ? 3 : null,
          capacitorVac: spec.type === 'psc' ? 370 : null,
          copperMassG: 300,
          weightG: 1500,
          lifecycle: spec.lifecycle ?? 'active',
          speedTaps: taps.map((tap) => tap.tap),
          searchText: `${prefix}-${spec.partNumber} test motor`,
        }),
      )
      for (const tap of taps) {
        await manager.insert(MotorPerformance, {
          variantId: variant.id,
          tap: tap.tap,
          volts: spec.volts,
          hz: spec.hz,
          model: tap.motor.model,
          source: 'fitted',
          referenceTempC: 25,
          motor: tap.motor,
          current: true,
        })
      }
    }
    await manager.increment(CatalogueRevision, { id: 1 }, 'revision', 1)
  })
}

/** A blower on a duct with a 20 Pa offset; duty 0.1 m3/s at 80 Pa on 230 V 50 Hz. */
export function blowerStudy(overrides: Partial<StudyInput> = {}): StudyInput {
  return studyInputSchema.parse({
    name: 'Blower on 230 V',
    fan: {
      source: 'curve',
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
    duty: { flowM3s: 0.1, staticPa: 80 },
    system: { offsetPa: 20 },
    supply: { volts: 230, hz: 50 },
    ambient: { temperatureC: 20, altitudeM: 0, densityKgM3: 1.2 },
    energy: {},
    constraints: {},
    tolerance: {},
    ...overrides,
  })
}
