// Seed step: writes the invented demo catalogue and demo fans (demo-catalogue.ts, demo-fans.ts) in
// bulk inserts, then bumps the catalogue revision so every app process reloads its prepared motors.
import { randomUUID } from 'node:crypto'
import type { EntityManager } from 'typeorm'
import { CatalogueRevision, DemoFan, MotorFamily, MotorPerformance, MotorVariant } from '../db/entities'
import { generateDemoCatalogue } from './demo-catalogue'
import { DEMO_FANS } from './demo-fans'

/** Rows per INSERT statement: large enough to be fast, small enough for max_allowed_packet. */
const CHUNK = 200

async function insertChunked<T extends object>(manager: EntityManager, target: new () => T, rows: T[]): Promise<void> {
  for (let i = 0; i < rows.length; i += CHUNK) await manager.insert(target, rows.slice(i, i + CHUNK))
}

/** Builds an entity instance from plain values (no `as`; TypeORM's create() does the same mapping). */
function entity<T extends object>(manager: EntityManager, target: new () => T, values: Partial<T>): T {
  return Object.assign(manager.create(target), values)
}

export async function seedDemoCatalogue(manager: EntityManager): Promise<void> {
  const { families, variants, performance } = generateDemoCatalogue()

  const familyRows = families.map((f) =>
    entity(manager, MotorFamily, { id: randomUUID(), code: f.code, name: f.name, type: f.type, description: f.description, lifecycle: f.lifecycle }),
  )
  const familyByCode = new Map(familyRows.map((f) => [f.code, f]))

  const variantRows = variants.map((v) => {
    const family = familyByCode.get(v.familyCode)
    if (!family) throw new Error(`demo variant ${v.partNumber}: family ${v.familyCode} missing`)
    const { familyCode: _familyCode, ...spec } = v
    return entity(manager, MotorVariant, {
      ...spec,
      id: randomUUID(),
      familyId: family.id,
      type: family.type,
      searchText: `${v.partNumber} ${v.name} ${family.code} ${family.name}`.toUpperCase().slice(0, 400),
    })
  })
  const variantIdByPart = new Map(variantRows.map((v) => [v.partNumber, v.id]))

  const performanceRows = performance.map((p) => {
    const variantId = variantIdByPart.get(p.partNumber)
    if (!variantId) throw new Error(`demo performance row: variant ${p.partNumber} missing`)
    return entity(manager, MotorPerformance, {
      id: randomUUID(),
      variantId,
      tap: p.tap,
      volts: p.volts,
      hz: p.hz,
      model: p.motor.model,
      source: p.source,
      referenceTempC: p.referenceTempC,
      motor: p.motor,
      current: true,
      createdById: null,
    })
  })

  const fanRows = DEMO_FANS.map((f) =>
    entity(manager, DemoFan, {
      id: randomUUID(),
      code: f.code,
      name: f.name,
      application: f.application,
      refRpm: f.refRpm,
      refDensity: f.refDensity,
      points: f.points,
      suggestedDuty: f.suggestedDuty,
    }),
  )

  await insertChunked(manager, MotorFamily, familyRows)
  await insertChunked(manager, MotorVariant, variantRows)
  await insertChunked(manager, MotorPerformance, performanceRows)
  await insertChunked(manager, DemoFan, fanRows)

  const revision = await manager.findOneBy(CatalogueRevision, { id: 1 })
  if (revision) await manager.update(CatalogueRevision, { id: 1 }, { revision: revision.revision + 1 })
  else await manager.insert(CatalogueRevision, { id: 1, revision: 1 })
}
