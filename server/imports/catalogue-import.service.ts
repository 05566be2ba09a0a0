// Catalogue CSV import: preview stores the file (with its SHA-256) as a batch and reports the plan;
// commit re-reads exactly that file and writes the plan in one transaction, refusing if the
// catalogue moved on since the preview. Nothing is written by a preview except the batch row.
import { createHash } from 'node:crypto'
import { In, type DataSource, type EntityManager } from 'typeorm'
import type { z } from 'zod'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { enclosureSchema, insulationClassSchema, mountingSchema, protectionSchema, type VariantSpec } from '../../shared/contracts/catalogue.contract'
import type { ImportCommitResult, ImportPreview } from '../../shared/contracts/import.contract'
import { AuditEntry, CatalogueRevision, ImportBatch, MotorFamily, MotorVariant } from '../db/entities'
import { AppError, ConflictError, NotFoundError } from '../http/errors'
import { bumpCatalogueRevision } from '../services/catalogue.service'
import { CATALOGUE_COLUMNS, FAMILY_COLUMNS, VARIANT_COLUMNS, csvLine } from './catalogue-columns'
import { familyPlansForPreview, parseCatalogueCsv, planCatalogueImport, type CataloguePlan, type CatalogueSnapshot } from './catalogue-csv'

/** Rows per INSERT: fast, and well inside max_allowed_packet. */
const CHUNK = 250

export function sha256(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex')
}

/** The downloadable template: the header and one example row. */
export function catalogueTemplateCsv(): string {
  const example: Record<string, string> = {
    family_code: 'SP84',
    part_number: 'SP84-4-120-60-09',
    ...Object.fromEntries(FAMILY_COLUMNS.map((c) => [c.name, c.example])),
    ...Object.fromEntries(VARIANT_COLUMNS.map((c) => [c.name, c.example])),
  }
  return `${csvLine(CATALOGUE_COLUMNS)}\r\n${csvLine(CATALOGUE_COLUMNS.map((c) => example[c] ?? ''))}\r\n`
}

/** A stored code read back through its contract enum (the contract checked it on the way in). */
function stored<S extends z.ZodType>(schema: S, value: unknown): z.infer<S> {
  const result = schema.safeParse(value)
  if (!result.success) throw new Error(`catalogue holds ${String(value)}, which the contract no longer accepts`)
  return result.data
}

function variantSpecOf(variant: MotorVariant, familyCode: string): VariantSpec {
  return {
    partNumber: variant.partNumber,
    familyCode,
    name: variant.name,
    poles: variant.poles,
    ratedVolts: variant.ratedVolts,
    ratedHz: variant.ratedHz === 50 ? 50 : 60,
    dualFrequency: variant.dualFrequency,
    ratedOutputW: variant.ratedOutputW,
    ratedRpm: variant.ratedRpm,
    ratedCurrentA: variant.ratedCurrentA,
    ratedInputW: variant.ratedInputW,
    lockedRotorTorqueNm: variant.lockedRotorTorqueNm,
    breakdownTorqueNm: variant.breakdownTorqueNm,
    frameDiameterMm: variant.frameDiameterMm,
    stackLengthMm: variant.stackLengthMm,
    shaftDiameterMm: variant.shaftDiameterMm,
    shaftLengthMm: variant.shaftLengthMm,
    mounting: stored(mountingSchema, variant.mounting),
    rotation: variant.rotation,
    rotationViewedFrom: variant.rotationViewedFrom,
    otherRotationAvailable: variant.otherRotationAvailable,
    enclosure: stored(enclosureSchema, variant.enclosure),
    insulationClass: stored(insulationClassSchema, variant.insulationClass),
    protection: stored(protectionSchema, variant.protection),
    maxAmbientC: variant.maxAmbientC,
    capacitorUf: variant.capacitorUf,
    capacitorVac: variant.capacitorVac,
    copperMassG: variant.copperMassG,
    weightG: variant.weightG,
    moq: variant.moq,
    leadTimeDays: variant.leadTimeDays,
    lifecycle: variant.lifecycle,
    speedTaps: variant.speedTaps,
  }
}

async function snapshotOf(manager: EntityManager): Promise<CatalogueSnapshot> {
  const families = await manager.find(MotorFamily)
  const codeById = new Map(families.map((f) => [f.id, f.code]))
  const variants = await manager.find(MotorVariant)
  return {
    families: new Map(families.map((f) => [f.code, { id: f.id, code: f.code, name: f.name, type: f.type, description: f.description, lifecycle: f.lifecycle }])),
    variants: new Map(variants.map((v) => [v.partNumber, { id: v.id, spec: variantSpecOf(v, codeById.get(v.familyId) ?? '') }])),
  }
}

async function revisionOf(manager: EntityManager, lock = false): Promise<number> {
  const row = await manager.findOne(CatalogueRevision, { where: { id: 1 }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) })
  return row?.revision ?? 0
}

function searchTextOf(spec: VariantSpec, familyName: string): string {
  return `${spec.partNumber} ${spec.name} ${spec.familyCode} ${familyName}`.toUpperCase().slice(0, 400)
}

function variantColumns(spec: VariantSpec, familyId: string, familyType: 'shaded-pole' | 'psc', familyName: string) {
  const { familyCode: _familyCode, ...rest } = spec
  return { ...rest, familyId, type: familyType, searchText: searchTextOf(spec, familyName) }
}

function previewOf(batch: ImportBatch, plan: CataloguePlan): ImportPreview {
  const count = (action: string) => plan.rows.filter((r) => r.action === action).length
  const counts = {
    rows: plan.rows.length,
    add: count('add'),
    change: count('change'),
    unchanged: count('unchanged'),
    error: plan.errorCount,
    familiesAdded: plan.families.filter((f) => f.action === 'add').length,
    familiesChanged: plan.families.filter((f) => f.action === 'change').length,
  }
  const writes = counts.add + counts.change + counts.familiesAdded + counts.familiesChanged
  return {
    batchId: batch.id,
    fileName: batch.fileName,
    fileSha256: batch.fileSha256,
    catalogueRevision: batch.catalogueRevision,
    status: batch.status,
    createdAt: batch.createdAt.toISOString(),
    fileErrors: plan.fileErrors,
    counts,
    rows: plan.rows.filter((r) => r.action !== 'unchanged'),
    unchangedPartNumbers: plan.rows.filter((r) => r.action === 'unchanged').map((r) => r.partNumber),
    families: familyPlansForPreview(plan),
    committable: batch.status === 'previewed' && plan.fileErrors.length === 0 && plan.errorCount === 0 && writes > 0,
  }
}

export class CatalogueImportService {
  constructor(private readonly dataSource: DataSource) {}

  /** Reads and plans the file; stores it as a batch; writes nothing to the catalogue. */
  async preview(fileName: string, text: string, user: SessionUser): Promise<ImportPreview> {
    const { plan, revision } = await this.dataSource.transaction('REPEATABLE READ', async (manager) => ({
      revision: await revisionOf(manager),
      plan: planCatalogueImport(parseCatalogueCsv(text), await snapshotOf(manager)),
    }))
    const repository = this.dataSource.getRepository(ImportBatch)
    const batch = await repository.save(
      repository.create({
        kind: 'catalogue',
        status: 'previewed',
        fileName: fileName.slice(0, 255),
        fileSha256: sha256(text),
        content: text,
        plan: { rows: plan.rows.length, errors: plan.errorCount },
        catalogueRevision: revision,
        createdById: user.id,
        committedAt: null,
      }),
    )
    return previewOf(batch, plan)
  }

  /** The preview of a stored batch, planned again against today's catalogue. */
  async get(batchId: string): Promise<ImportPreview> {
    const batch = await this.dataSource.getRepository(ImportBatch).findOneBy({ id: batchId, kind: 'catalogue' })
    if (!batch) throw new NotFoundError('Import batch')
    const plan = planCatalogueImport(parseCatalogueCsv(batch.content), await snapshotOf(this.dataSource.manager))
    return previewOf(batch, plan)
  }

  /** Applies a previewed batch in one transaction; any failure leaves the catalogue as it was. */
  async commit(batchId: string, user: SessionUser): Promise<ImportCommitResult> {
    return this.dataSource.transaction(async (manager) => {
      const batch = await manager.findOne(ImportBatch, { where: { id: batchId, kind: 'catalogue' }, lock: { mode: 'pessimistic_write' } })
      if (!batch) throw new NotFoundError('Import batch')
      if (batch.status === 'committed') throw new ConflictError('This import was committed already; upload the file again to compare it with the catalogue', 'batch_committed')
      if (sha256(batch.content) !== batch.fileSha256) throw new Error(`import batch ${batch.id}: stored file does not match its hash`)
      // Locking the revision row orders concurrent catalogue writers behind this commit.
      const revision = await revisionOf(manager, true)
      if (revision !== batch.catalogueRevision) {
        throw new ConflictError('The catalogue changed since this preview; upload the file again to see the changes against the current catalogue', 'batch_stale')
      }
      const plan = planCatalogueImport(parseCatalogueCsv(batch.content), await snapshotOf(manager))
      if (plan.fileErrors.length || plan.errorCount) {
        throw new AppError(422, 'batch_has_errors', `The file has ${plan.fileErrors.length + plan.errorCount} problem(s); fix them and upload it again. Nothing was written`)
      }

      const familyIds = new Map<string, { id: string; type: 'shaded-pole' | 'psc'; name: string }>()
      const newFamilies = plan.families.filter((f) => f.action === 'add')
      for (let i = 0; i < newFamilies.length; i += CHUNK) {
        const chunk = newFamilies.slice(i, i + CHUNK).map((f) => manager.create(MotorFamily, { ...f.spec }))
        await manager.insert(MotorFamily, chunk)
      }
      for (const family of plan.families) {
        if (family.action === 'change' && family.id) {
          await manager
            .createQueryBuilder()
            .update(MotorFamily)
            .set({ name: family.spec.name, description: family.spec.description, lifecycle: family.spec.lifecycle, version: () => 'version + 1' })
            .where('id = :id', { id: family.id })
            .execute()
        }
      }
      const codes = plan.families.map((f) => f.code)
      const written = codes.length ? await manager.find(MotorFamily, { where: { code: In(codes) } }) : []
      for (const family of written) familyIds.set(family.code, { id: family.id, type: family.type, name: family.name })
      const familyOf = (code: string) => {
        const family = familyIds.get(code)
        if (!family) throw new Error(`import batch ${batch.id}: family ${code} missing after its insert`)
        return family
      }

      const added = plan.variants.filter((v) => v.action === 'add')
      for (let i = 0; i < added.length; i += CHUNK) {
        const chunk = added.slice(i, i + CHUNK).map((v) => {
          const family = familyOf(v.spec.familyCode)
          return manager.create(MotorVariant, variantColumns(v.spec, family.id, family.type, family.name))
        })
        await manager.insert(MotorVariant, chunk)
      }
      const changed = plan.variants.filter((v) => v.action === 'change')
      for (const variant of changed) {
        if (!variant.id) continue
        const family = familyOf(variant.spec.familyCode)
        await manager
          .createQueryBuilder()
          .update(MotorVariant)
          .set({ ...variantColumns(variant.spec, family.id, family.type, family.name), version: () => 'version + 1' })
          .where('id = :id', { id: variant.id })
          .execute()
      }
      // A renamed family changes the search text of all its variants, also those not in the file.
      const renamed = plan.families.filter((f) => f.action === 'change' && f.changes.some((c) => c.column === 'family_name')).map((f) => f.id)
      if (renamed.length) {
        await manager.query(
          "UPDATE motor_variant v JOIN motor_family f ON f.id = v.familyId SET v.searchText = LEFT(UPPER(CONCAT_WS(' ', v.partNumber, v.name, f.code, f.name)), 400) WHERE f.id IN (?)",
          [renamed],
        )
      }

      const writes = added.length + changed.length + newFamilies.length + plan.families.filter((f) => f.action === 'change').length
      if (writes > 0) await bumpCatalogueRevision(manager)
      const newRevision = await revisionOf(manager)
      await manager.update(ImportBatch, { id: batch.id }, { status: 'committed', committedAt: new Date() })
      const result: ImportCommitResult = {
        batchId: batch.id,
        added: added.length,
        changed: changed.length,
        unchanged: plan.variants.filter((v) => v.action === 'unchanged').length,
        familiesAdded: newFamilies.length,
        familiesChanged: plan.families.filter((f) => f.action === 'change').length,
        catalogueRevision: newRevision,
      }
      await manager.save(AuditEntry, {
        actorId: user.id,
        actorEmail: user.email,
        entity: 'catalogue',
        entityId: batch.id,
        action: 'import-commit',
        detail: {
          fileName: batch.fileName,
          fileSha256: batch.fileSha256,
          ...result,
          // The part numbers, capped so one audit row stays small.
          addedPartNumbers: added.slice(0, 200).map((v) => v.spec.partNumber),
          changedPartNumbers: changed.slice(0, 200).map((v) => v.spec.partNumber),
        },
      })
      return result
    })
  }
}
