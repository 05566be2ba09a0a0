import { LRUCache } from 'lru-cache'
import type { DataSource, EntityManager } from 'typeorm'
import type { Page } from '../../shared/contracts/admin.contract'
import type {
  CatalogueFacets,
  DemoFan as DemoFanDto,
  InsulationClassCode,
  MotorType,
  VariantDetail,
  VariantListQuery,
  VariantRow,
} from '../../shared/contracts/catalogue.contract'
import { catalogueSource, prepareEntry, type CatalogueEntry, type CatalogueSource, type SourceVariant } from '../../shared/selection/run-selection'
import { CatalogueRevision, Datasheet, DemoFan, MotorPerformance, MotorVariant } from '../db/entities'
import { NotFoundError } from '../http/errors'
import type { MotorModel } from '../../shared/engineering'

function escapeLike(term: string): string {
  return term.replace(/[\\%_]/g, '\\$&')
}

export function toVariantRow(variant: MotorVariant): VariantRow {
  return {
    id: variant.id,
    partNumber: variant.partNumber,
    name: variant.name,
    familyCode: variant.family.code,
    familyName: variant.family.name,
    type: variant.type,
    poles: variant.poles,
    ratedVolts: variant.ratedVolts,
    ratedHz: variant.ratedHz,
    dualFrequency: variant.dualFrequency,
    ratedOutputW: variant.ratedOutputW,
    ratedRpm: variant.ratedRpm,
    ratedInputW: variant.ratedInputW,
    ratedCurrentA: variant.ratedCurrentA,
    frameDiameterMm: variant.frameDiameterMm,
    insulationClass: insulationCode(variant.insulationClass),
    protection: protectionCode(variant.protection),
    lifecycle: variant.lifecycle,
    speedTaps: variant.speedTaps,
  }
}

function insulationCode(value: string): InsulationClassCode {
  switch (value) {
    case 'A':
    case 'E':
    case 'B':
    case 'F':
    case 'H':
      return value
    default:
      throw new Error(`unknown insulation class ${value} in the catalogue`)
  }
}

function protectionCode(value: string): VariantRow['protection'] {
  switch (value) {
    case 'impedance':
    case 'auto-reset':
    case 'manual-reset':
    case 'none':
      return value
    default:
      throw new Error(`unknown protection ${value} in the catalogue`)
  }
}

/** Revision bumps made by this process; a catalogue service re-reads the revision after one. */
let localBumps = 0

/**
 * Raises the catalogue revision inside the caller's transaction. This process's caches re-read the
 * revision on their next request; other processes within REVISION_TTL_MS.
 */
export async function bumpCatalogueRevision(manager: EntityManager): Promise<void> {
  await manager.increment(CatalogueRevision, { id: 1 }, 'revision', 1)
  localBumps += 1
}

/**
 * How long a read revision is trusted before it is read again. Every catalogue answer (list
 * pages, variant pages, facets, the solver's catalogue) is cached under the revision it was
 * built at, so a change made through another app process shows within this time.
 */
export const REVISION_TTL_MS = 1000
/** Catalogue answers kept (list pages with their filters, variant pages, facets). */
const ANSWERS_KEPT = 2000

export class CatalogueService {
  /** The catalogue as loaded at a revision, and its solver-ready form once a run in this thread asked for it. */
  private cache: LoadedCatalogue | undefined
  private loading: Promise<LoadedCatalogue> | undefined
  private revisionRead: { revision: number; at: number; bumps: number } | undefined
  /** Answers keyed by revision and request; shared objects, so callers must not change them. */
  private readonly answers = new LRUCache<string, object>({ max: ANSWERS_KEPT })

  constructor(private readonly dataSource: DataSource) {}

  /** The catalogue revision, read again after REVISION_TTL_MS or a bump in this process. */
  async currentRevision(): Promise<number> {
    const read = this.revisionRead
    const now = Date.now()
    if (read && now - read.at < REVISION_TTL_MS && read.bumps === localBumps) return read.revision
    const bumps = localBumps
    const revision = await this.revision()
    this.revisionRead = { revision, at: now, bumps }
    return revision
  }

  private async answer<T extends object>(key: string, build: () => Promise<T>): Promise<T> {
    const full = `${await this.currentRevision()}|${key}`
    const hit = this.answers.get(full)
    if (hit) return hit as T
    const value = await build()
    this.answers.set(full, value)
    return value
  }

  listVariants(query: VariantListQuery): Promise<Page<VariantRow>> {
    return this.answer(`list|${JSON.stringify(query)}`, () => this.queryVariants(query))
  }

  getVariant(partNumber: string): Promise<VariantDetail> {
    return this.answer(`variant|${partNumber}`, () => this.queryVariant(partNumber))
  }

  facets(): Promise<CatalogueFacets> {
    return this.answer('facets', () => this.queryFacets())
  }

  private async queryVariants(query: VariantListQuery): Promise<Page<VariantRow>> {
    const builder = this.dataSource
      .getRepository(MotorVariant)
      .createQueryBuilder('variant')
      .innerJoinAndSelect('variant.family', 'family')
    if (query.search) {
      const words = query.search.split(/\s+/).filter(Boolean).slice(0, 6)
      words.forEach((word, index) => builder.andWhere(`variant.searchText LIKE :w${index}`, { [`w${index}`]: `%${escapeLike(word)}%` }))
    }
    if (query.type?.length) builder.andWhere('variant.type IN (:...types)', { types: query.type })
    if (query.poles?.length) builder.andWhere('variant.poles IN (:...poles)', { poles: query.poles })
    if (query.supply?.length) {
      const clauses = query.supply.map((supply, index) => {
        const [volts, hz] = supply.split('-').map(Number)
        builder.setParameter(`sv${index}`, volts)
        builder.setParameter(`sh${index}`, hz)
        return `(variant.ratedVolts = :sv${index} AND (variant.ratedHz = :sh${index} OR variant.dualFrequency = 1))`
      })
      builder.andWhere(`(${clauses.join(' OR ')})`)
    }
    if (query.minOutputW !== undefined) builder.andWhere('variant.ratedOutputW >= :minOut', { minOut: query.minOutputW })
    if (query.maxOutputW !== undefined) builder.andWhere('variant.ratedOutputW <= :maxOut', { maxOut: query.maxOutputW })
    if (query.maxFrameMm !== undefined) builder.andWhere('variant.frameDiameterMm <= :maxFrame', { maxFrame: query.maxFrameMm })
    if (query.protection?.length) builder.andWhere('variant.protection IN (:...protections)', { protections: query.protection })
    if (query.insulation?.length) builder.andWhere('variant.insulationClass IN (:...classes)', { classes: query.insulation })
    if (query.lifecycle?.length) builder.andWhere('variant.lifecycle IN (:...lifecycles)', { lifecycles: query.lifecycle })
    const direction = query.order === 'desc' ? 'DESC' : 'ASC'
    builder.orderBy(`variant.${query.sort}`, direction)
    if (query.sort !== 'partNumber') builder.addOrderBy('variant.partNumber', 'ASC')
    // limit/offset, not skip/take: the family join is many-to-one, so no distinct-id pre-query is needed.
    builder.offset((query.page - 1) * query.pageSize).limit(query.pageSize)
    const [rows, total] = await builder.getManyAndCount()
    return { items: rows.map(toVariantRow), total, page: query.page, pageSize: query.pageSize }
  }

  private async queryVariant(partNumber: string): Promise<VariantDetail> {
    const variant = await this.dataSource.getRepository(MotorVariant).findOne({ where: { partNumber }, relations: { family: true } })
    if (!variant) throw new NotFoundError('Motor')
    const performance = await this.dataSource
      .getRepository(MotorPerformance)
      .find({ where: { variantId: variant.id, current: true }, order: { hz: 'ASC', volts: 'ASC', tap: 'ASC' } })
    // The variant's own datasheets and its family's.
    const datasheets = await this.dataSource
      .getRepository(Datasheet)
      .find({ where: [{ variantId: variant.id }, { familyId: variant.familyId }], order: { createdAt: 'DESC' } })
    return {
      ...toVariantRow(variant),
      ratedCurrentA: variant.ratedCurrentA,
      lockedRotorTorqueNm: variant.lockedRotorTorqueNm,
      breakdownTorqueNm: variant.breakdownTorqueNm,
      stackLengthMm: variant.stackLengthMm,
      shaftDiameterMm: variant.shaftDiameterMm,
      shaftLengthMm: variant.shaftLengthMm,
      mounting: mountingCode(variant.mounting),
      rotation: variant.rotation,
      rotationViewedFrom: variant.rotationViewedFrom,
      otherRotationAvailable: variant.otherRotationAvailable,
      enclosure: enclosureCode(variant.enclosure),
      maxAmbientC: variant.maxAmbientC,
      capacitorUf: variant.capacitorUf,
      capacitorVac: variant.capacitorVac,
      copperMassG: variant.copperMassG,
      weightG: variant.weightG,
      moq: variant.moq,
      leadTimeDays: variant.leadTimeDays,
      familyDescription: variant.family.description,
      performance: performance.map((row) => ({
        id: row.id,
        tap: row.tap,
        volts: row.volts,
        hz: row.hz,
        source: row.source,
        referenceTempC: row.referenceTempC,
        motor: row.motor,
        createdAt: row.createdAt.toISOString(),
      })),
      datasheets: datasheets.map((sheet) => ({ id: sheet.id, originalName: sheet.originalName, sizeBytes: sheet.sizeBytes, uploadedAt: sheet.createdAt.toISOString() })),
      updatedAt: variant.updatedAt.toISOString(),
    }
  }

  private async queryFacets(): Promise<CatalogueFacets> {
    const supplies: { volts: number; hz: number; isDual: number; count: string }[] = await this.dataSource.query(
      'SELECT ratedVolts AS volts, ratedHz AS hz, dualFrequency AS isDual, COUNT(*) AS count FROM motor_variant GROUP BY ratedVolts, ratedHz, dualFrequency ORDER BY ratedVolts, ratedHz',
    )
    const merged = new Map<string, { volts: number; hz: number; count: number }>()
    for (const row of supplies) {
      const hzList = Number(row.isDual) ? [50, 60] : [Number(row.hz)]
      for (const hz of hzList) {
        const key = `${row.volts}-${hz}`
        const item = merged.get(key) ?? { volts: Number(row.volts), hz, count: 0 }
        item.count += Number(row.count)
        merged.set(key, item)
      }
    }
    const frames: { frame: number }[] = await this.dataSource.query('SELECT DISTINCT frameDiameterMm AS frame FROM motor_variant ORDER BY frame')
    const range: { min: number | null; max: number | null }[] = await this.dataSource.query('SELECT MIN(ratedOutputW) AS min, MAX(ratedOutputW) AS max FROM motor_variant')
    return {
      supplies: [...merged.values()].sort((a, b) => a.volts - b.volts || a.hz - b.hz),
      frames: frames.map((row) => Number(row.frame)),
      outputRangeW: { min: Number(range[0]?.min ?? 0), max: Number(range[0]?.max ?? 0) },
    }
  }

  async demoFans(): Promise<DemoFanDto[]> {
    const fans = await this.dataSource.getRepository(DemoFan).find({ order: { code: 'ASC' } })
    return fans.map((fan) => ({ ...fan }))
  }

  async revision(): Promise<number> {
    const row = await this.dataSource.getRepository(CatalogueRevision).findOneBy({ id: 1 })
    return row?.revision ?? 0
  }

  /**
   * Every variant with its current performance rows as stored, cached per revision: what the
   * worker pool takes (each worker prepares its share), and cheap to hold.
   */
  async catalogueSources(): Promise<LoadedCatalogue> {
    const revision = await this.currentRevision()
    if (this.cache?.revision === revision) return this.cache
    this.loading ??= this.load(revision).finally(() => {
      this.loading = undefined
    })
    return this.loading
  }

  /** The same catalogue prepared for the solver (in this thread), built on first use per revision. */
  async solverCatalogue(): Promise<{ revision: number; entries: CatalogueEntry[] }> {
    const cache = await this.catalogueSources()
    cache.prepared ??= cache.sources.map((source) => prepareSource(source))
    return { revision: cache.revision, entries: cache.prepared }
  }

  /** One variant's entry prepared for the solver (a quote line's duty point), or undefined. */
  async solverEntry(partNumber: string): Promise<CatalogueEntry | undefined> {
    const { sources } = await this.catalogueSources()
    const source = sources.find((item) => item.partNumber === partNumber)
    return source ? prepareSource(source) : undefined
  }

  /**
   * The catalogue as the solver takes it, in two plain queries of the columns it reads: building
   * entities for every variant and row (TypeORM's hydration) took as long again and held the
   * event loop for a second at 20,000 variants.
   */
  private async load(revision: number): Promise<LoadedCatalogue> {
    const variants: SourceVariantRow[] = await this.dataSource.query(
      `SELECT id, partNumber, name, type, poles, ratedOutputW, frameDiameterMm, mounting, enclosure, rotation, rotationViewedFrom,
              otherRotationAvailable, insulationClass, protection, maxAmbientC, lifecycle
       FROM motor_variant ORDER BY partNumber`,
    )
    const rows: SourcePerformanceRow[] = await this.dataSource.query('SELECT id, variantId, tap, volts, hz, referenceTempC, motor FROM motor_performance WHERE current = 1')
    const byVariant = new Map<string, CatalogueSource>()
    const sources: CatalogueSource[] = variants.map((variant) => {
      const source = catalogueSource(variant.id, { ...variant, poles: Number(variant.poles), otherRotationAvailable: Boolean(Number(variant.otherRotationAvailable)) }, variant.type, insulationCode(variant.insulationClass))
      byVariant.set(variant.id, source)
      return source
    })
    for (const row of rows) {
      const motor: MotorModel = typeof row.motor === 'string' ? JSON.parse(row.motor) : row.motor
      byVariant.get(row.variantId)?.performance.push({ id: row.id, tap: row.tap, volts: Number(row.volts), hz: Number(row.hz), referenceTempC: Number(row.referenceTempC), motor })
    }
    this.cache = { revision, sources }
    return this.cache
  }
}

/** A motor_variant row as load() selects it (MariaDB answers booleans and tinyints as numbers). */
type SourceVariantRow = Omit<SourceVariant, 'otherRotationAvailable' | 'poles'> & {
  id: string
  type: MotorType
  insulationClass: string
  poles: number | string
  otherRotationAvailable: number | string | boolean
}

/** A motor_performance row as load() selects it (the JSON column may come as text). */
interface SourcePerformanceRow {
  id: string
  variantId: string
  tap: string
  volts: number
  hz: number
  referenceTempC: number
  motor: MotorModel | string
}

interface LoadedCatalogue {
  revision: number
  sources: CatalogueSource[]
  /** The solver-ready form, once a run in this thread asked for it. */
  prepared?: CatalogueEntry[]
}

/** prepareEntry() with refused rows logged (data that the core refuses is left out of selection). */
function prepareSource(source: CatalogueSource): CatalogueEntry {
  return prepareEntry(source, (row, error) => console.error(`performance ${row.id} of ${source.partNumber} skipped: ${error instanceof Error ? error.message : String(error)}`))
}

function mountingCode(value: string): VariantDetail['mounting'] {
  switch (value) {
    case 'stud':
    case 'through-bolt':
    case 'flange':
    case 'bracket':
    case 'resilient-ring':
    case 'belly-band':
      return value
    default:
      throw new Error(`unknown mounting ${value}`)
  }
}

function enclosureCode(value: string): VariantDetail['enclosure'] {
  switch (value) {
    case 'open':
    case 'air-over':
    case 'totally-enclosed':
      return value
    default:
      throw new Error(`unknown enclosure ${value}`)
  }
}
