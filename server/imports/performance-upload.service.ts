// Performance data upload: preview checks the file for one variant, tap and supply and samples the
// new and the current curves; commit replaces the current row (the old one stays as history,
// current = false), bumps the catalogue revision and writes an audit entry, in one transaction.
import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import { z } from 'zod'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { motorModelSchema, performanceSourceSchema } from '../../shared/contracts/catalogue.contract'
import type { CurveSample, PerformanceCommitResult, PerformancePreview, PerformanceRowError, PerformanceUploadFields } from '../../shared/contracts/import.contract'
import { evaluateMotor, prepareMotor, syncRpm, type MotorModel } from '../../shared/engineering'
import { AuditEntry, CatalogueRevision, ImportBatch, MotorPerformance, MotorVariant } from '../db/entities'
import { AppError, ConflictError, NotFoundError, ValidationError } from '../http/errors'
import { bumpCatalogueRevision } from '../services/catalogue.service'
import { sha256 } from './catalogue-import.service'
import { parsePerformanceCsv } from './performance-csv'

const SAMPLES = 41

/** The refusal of a performance file: 400 with every problem listed. */
export class PerformanceFileError extends AppError {
  constructor(readonly problems: PerformanceRowError[]) {
    const fields: Record<string, string> = {}
    for (const p of problems) {
      const key = p.line !== null ? `line ${p.line}${p.column ? ` (${p.column})` : ''}` : (p.column ?? 'file')
      fields[key] ??= p.message
    }
    super(400, 'performance_file_invalid', `The file has ${problems.length} problem${problems.length === 1 ? '' : 's'}; nothing was changed`, fields)
  }
}

const planSchema = z.object({
  variantId: z.string(),
  partNumber: z.string(),
  tap: z.string(),
  volts: z.number(),
  hz: z.number(),
  source: performanceSourceSchema,
  referenceTempC: z.number(),
  motor: motorModelSchema,
  replacesId: z.string().nullable(),
  readAs: z.enum(['curve', 'circuit']),
  torqueUnit: z.enum(['N m', 'oz-in', 'lb-in']).nullable(),
  warnings: z.array(z.string()),
})
type PerformancePlan = z.infer<typeof planSchema>

/** The motor over 0..n_s on the stated supply, for the chart. */
export function sampleCurve(motor: MotorModel, volts: number, hz: number, poles: number): CurveSample[] {
  const prepared = prepareMotor(motor)
  const ns = syncRpm(poles, hz)
  const top = motor.model === 'curve' ? Math.min(ns, motor.points[motor.points.length - 1]?.rpm ?? ns) : ns * 0.999
  const samples: CurveSample[] = []
  for (let i = 0; i < SAMPLES; i += 1) {
    const rpm = (top * i) / (SAMPLES - 1)
    const e = evaluateMotor(prepared, { volts, hz }, rpm)
    samples.push({ rpm, torqueNm: e.shaftTorqueNm, currentA: e.currentA ?? null, inputW: e.inputW ?? null })
  }
  return samples
}

export class PerformanceUploadService {
  constructor(private readonly dataSource: DataSource) {}

  async preview(fileName: string, text: string, fields: PerformanceUploadFields, user: SessionUser): Promise<PerformancePreview> {
    const variant = await this.dataSource.getRepository(MotorVariant).findOneBy({ partNumber: fields.partNumber })
    if (!variant) throw new ValidationError({ partNumber: `no variant ${fields.partNumber} in the catalogue` })
    if (!variant.speedTaps.includes(fields.tap)) throw new ValidationError({ tap: `${fields.partNumber} has the taps ${variant.speedTaps.join(', ')}` })
    const hzAllowed = variant.dualFrequency ? [50, 60] : [variant.ratedHz]
    if (!hzAllowed.includes(fields.hz)) throw new ValidationError({ hz: `${fields.partNumber} is rated for ${hzAllowed.join(' and ')} Hz` })

    const parsed = parsePerformanceCsv(text, { poles: variant.poles, volts: fields.volts, hz: fields.hz, type: variant.type, torqueUnit: fields.torqueUnit })
    if (!parsed.ok) throw new PerformanceFileError(parsed.errors)
    const warnings = [...parsed.warnings]
    if (fields.volts !== variant.ratedVolts) warnings.push(`${fields.volts} V differs from the rated ${variant.ratedVolts} V: the data will be filed under ${fields.volts} V`)

    const current = await this.dataSource.getRepository(MotorPerformance).findOneBy({ variantId: variant.id, tap: fields.tap, volts: fields.volts, hz: fields.hz, current: true })
    const revision = await this.dataSource.getRepository(CatalogueRevision).findOneBy({ id: 1 })
    const plan: PerformancePlan = {
      variantId: variant.id,
      partNumber: variant.partNumber,
      tap: fields.tap,
      volts: fields.volts,
      hz: fields.hz,
      source: fields.source,
      referenceTempC: fields.referenceTempC,
      motor: parsed.motor,
      replacesId: current?.id ?? null,
      readAs: parsed.readAs,
      torqueUnit: parsed.torqueUnit,
      warnings,
    }
    const repository = this.dataSource.getRepository(ImportBatch)
    const batch = await repository.save(
      repository.create({
        kind: 'performance',
        status: 'previewed',
        fileName: fileName.slice(0, 255),
        fileSha256: sha256(text),
        content: text,
        plan,
        catalogueRevision: revision?.revision ?? 0,
        createdById: user.id,
        committedAt: null,
      }),
    )
    let currentCurve: CurveSample[] | null = null
    if (current) {
      try {
        currentCurve = sampleCurve(current.motor, current.volts, current.hz, variant.poles)
      } catch {
        warnings.push('the current data could not be drawn (the engineering core refuses it)')
      }
    }
    return {
      batchId: batch.id,
      partNumber: variant.partNumber,
      tap: plan.tap,
      volts: plan.volts,
      hz: plan.hz,
      source: plan.source,
      referenceTempC: plan.referenceTempC,
      motor: plan.motor,
      synchronousRpm: syncRpm(variant.poles, plan.hz),
      readAs: plan.readAs,
      torqueUnit: plan.torqueUnit,
      newCurve: sampleCurve(plan.motor, plan.volts, plan.hz, variant.poles),
      currentCurve,
      currentPerformanceId: plan.replacesId,
      warnings,
      createdAt: batch.createdAt.toISOString(),
    }
  }

  async commit(batchId: string, user: SessionUser): Promise<PerformanceCommitResult> {
    return this.dataSource.transaction(async (manager) => {
      const batch = await manager.findOne(ImportBatch, { where: { id: batchId, kind: 'performance' }, lock: { mode: 'pessimistic_write' } })
      if (!batch) throw new NotFoundError('Performance upload')
      if (batch.status === 'committed') throw new ConflictError('This upload was committed already', 'batch_committed')
      const plan = planSchema.parse(batch.plan)
      const current = await manager.findOne(MotorPerformance, {
        where: { variantId: plan.variantId, tap: plan.tap, volts: plan.volts, hz: plan.hz, current: true },
        lock: { mode: 'pessimistic_write' },
      })
      if ((current?.id ?? null) !== plan.replacesId) {
        throw new ConflictError('The data of this tap and supply changed since the preview; upload the file again', 'batch_stale')
      }
      if (current) await manager.update(MotorPerformance, { id: current.id }, { current: false })
      const performanceId = randomUUID()
      await manager.insert(MotorPerformance, {
        id: performanceId,
        variantId: plan.variantId,
        tap: plan.tap,
        volts: plan.volts,
        hz: plan.hz,
        model: plan.motor.model,
        source: plan.source,
        referenceTempC: plan.referenceTempC,
        motor: plan.motor,
        current: true,
        createdById: user.id,
      })
      await bumpCatalogueRevision(manager)
      await manager.update(ImportBatch, { id: batch.id }, { status: 'committed', committedAt: new Date() })
      await manager.save(AuditEntry, {
        actorId: user.id,
        actorEmail: user.email,
        entity: 'performance',
        entityId: performanceId,
        action: current ? 'replace' : 'add',
        detail: { partNumber: plan.partNumber, tap: plan.tap, volts: plan.volts, hz: plan.hz, model: plan.motor.model, replacedId: current?.id ?? null, batchId: batch.id, fileName: batch.fileName },
      })
      const revision = await manager.findOneBy(CatalogueRevision, { id: 1 })
      return { batchId: batch.id, performanceId, replacedId: current?.id ?? null, catalogueRevision: revision?.revision ?? 0 }
    })
  }
}
