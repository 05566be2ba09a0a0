// Price lists and the copper index as the admin maintains them. A price list is edited under an
// optimistic lock on its version (header and entry edits alike: a list is priced as a whole); the
// copper index only ever gains values, each with the date from which it applies.
import { In, LessThan, type DataSource, type EntityManager } from 'typeorm'
import type {
  AdminPriceListEntryRow,
  AdminPriceListRow,
  CopperIndexBody,
  CopperIndexHistory,
  CopperIndexValue,
  CopyPriceListBody,
  Page,
  PriceListEntriesQuery,
  PriceListEntryBody,
  PriceListEntryUpdated,
  PriceListHeaderBody,
} from '../../shared/contracts/admin.contract'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { addDays, compareIsoDates, isCurrencyCode, utcToday, validatePriceList, type PriceList, type PricingError } from '../../shared/pricing'
import { AccountTerms, CopperIndexRecord, MotorVariant, PriceListEntryRecord, PriceListRecord, User } from '../db/entities'
import { AppError, ConflictError, NotFoundError, ValidationError } from '../http/errors'
import { changesBetween, recordAudit } from './admin-audit.service'

function likeTerm(value: string): string {
  return `%${value.replace(/[\\%_]/g, '\\$&')}%`
}

function staleList(): ConflictError {
  return new ConflictError('Someone changed this price list after you opened it; reload to see their changes', 'stale_version')
}

/** Pricing-rule errors named by our request fields (`priceList.validTo` -> `validTo`). */
function fieldsOf(errors: PricingError[]): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const error of errors) {
    const key = error.field
      .replace(/^priceList\.entries\[0\]\./, '')
      .replace(/^priceList\./, '')
      .replace(/\[(\d+)\]/g, '.$1')
      .replace('tierDiscountBp.oem_contract', 'tierDiscountBp.oem')
    fields[key] ??= error.message
  }
  return fields
}

/** The shared pricing rules' view of a list header (with at most one entry), for validatePriceList. */
function asPriceList(record: Pick<PriceListRecord, 'id' | 'currency' | 'validFrom' | 'validTo' | 'baseCopperIndexPerKg' | 'copperCreditBelowBase' | 'tierDiscountBp' | 'options'>, entries: PriceList['entries'] = []): PriceList {
  if (!isCurrencyCode(record.currency)) throw new ValidationError({ currency: `unknown currency ${record.currency}` })
  return {
    id: record.id,
    currency: record.currency,
    validFrom: record.validFrom,
    validTo: record.validTo,
    baseCopperIndexPerKg: record.baseCopperIndexPerKg,
    copperCreditBelowBase: record.copperCreditBelowBase,
    tierDiscountBp: { oem_contract: record.tierDiscountBp.oem, distributor: record.tierDiscountBp.distributor },
    entries,
    options: record.options,
  }
}

export class AdminPricingService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly today: () => string = () => utcToday(),
  ) {}

  async listPriceLists(query: { page: number; pageSize: number; search?: string }): Promise<Page<AdminPriceListRow>> {
    const builder = this.dataSource
      .getRepository(PriceListRecord)
      .createQueryBuilder('list')
      .orderBy('list.validFrom', 'DESC')
      .addOrderBy('list.code', 'ASC')
      .skip((query.page - 1) * query.pageSize)
      .take(query.pageSize)
    if (query.search) builder.andWhere('(list.code LIKE :term OR list.name LIKE :term)', { term: likeTerm(query.search) })
    const [lists, total] = await builder.getManyAndCount()
    return { items: await this.listRows(this.dataSource.manager, lists), total, page: query.page, pageSize: query.pageSize }
  }

  async getPriceList(id: string, manager: EntityManager = this.dataSource.manager): Promise<AdminPriceListRow> {
    const list = await manager.findOneBy(PriceListRecord, { id })
    if (!list) throw new NotFoundError('Price list')
    const [row] = await this.listRows(manager, [list])
    if (!row) throw new NotFoundError('Price list')
    return row
  }

  async listEntries(id: string, query: PriceListEntriesQuery): Promise<Page<AdminPriceListEntryRow>> {
    if (!(await this.dataSource.getRepository(PriceListRecord).existsBy({ id }))) throw new NotFoundError('Price list')
    const builder = this.dataSource
      .getRepository(PriceListEntryRecord)
      .createQueryBuilder('entry')
      .innerJoin(MotorVariant, 'variant', 'variant.id = entry.variantId')
      .select(['entry.id AS id', 'entry.variantId AS variantId', 'variant.partNumber AS partNumber', 'variant.name AS variantName'])
      .addSelect(['entry.unitPrice AS unitPrice', 'entry.breaks AS breaks', 'entry.moq AS moq', 'entry.leadTimeDays AS leadTimeDays'])
      .where('entry.priceListId = :id', { id })
      .orderBy('variant.partNumber', 'ASC')
      .offset((query.page - 1) * query.pageSize)
      .limit(query.pageSize)
    if (query.search) builder.andWhere('(variant.partNumber LIKE :term OR variant.name LIKE :term)', { term: likeTerm(query.search) })
    const total = await builder.clone().offset(undefined).limit(undefined).getCount()
    const rows = await builder.getRawMany<Record<string, unknown>>()
    return { items: rows.map((row) => this.entryFromRaw(row)), total, page: query.page, pageSize: query.pageSize }
  }

  async updateHeader(actor: SessionUser, id: string, body: PriceListHeaderBody): Promise<AdminPriceListRow> {
    return this.dataSource.transaction(async (manager) => {
      const list = await manager.findOneBy(PriceListRecord, { id })
      if (!list) throw new NotFoundError('Price list')
      const next = { name: body.name, validFrom: body.validFrom, validTo: body.validTo, baseCopperIndexPerKg: body.baseCopperIndexPerKg, copperCreditBelowBase: body.copperCreditBelowBase, tierDiscountBp: body.tierDiscountBp }
      const errors = validatePriceList(asPriceList({ ...list, ...next }))
      if (errors.length) throw new ValidationError(fieldsOf(errors))
      const changes = changesBetween(list, next)
      await this.bumpVersion(manager, id, body.version, next)
      if (Object.keys(changes).length) await recordAudit(manager, actor, 'price_list', id, 'updated', { code: list.code, changes })
      return this.getPriceList(id, manager)
    })
  }

  async updateEntry(actor: SessionUser, listId: string, entryId: string, body: PriceListEntryBody): Promise<PriceListEntryUpdated> {
    return this.dataSource.transaction(async (manager) => {
      const list = await manager.findOneBy(PriceListRecord, { id: listId })
      if (!list) throw new NotFoundError('Price list')
      const entry = await manager.findOneBy(PriceListEntryRecord, { id: entryId, priceListId: listId })
      if (!entry) throw new NotFoundError('Price list entry')
      const next = { unitPrice: body.unitPrice, breaks: body.breaks, moq: body.moq, leadTimeDays: body.leadTimeDays }
      const errors = validatePriceList(asPriceList(list, [{ variantId: entry.variantId, ...next }]))
      if (errors.length) throw new ValidationError(fieldsOf(errors))
      const changes = changesBetween(entry, next)
      const version = await this.bumpVersion(manager, listId, body.version)
      await manager.update(PriceListEntryRecord, { id: entryId }, next)
      const variant = await manager.findOneBy(MotorVariant, { id: entry.variantId })
      if (Object.keys(changes).length) {
        await recordAudit(manager, actor, 'price_list', listId, 'entry-updated', { code: list.code, entryId, partNumber: variant?.partNumber ?? null, changes })
      }
      return {
        entry: { id: entry.id, variantId: entry.variantId, partNumber: variant?.partNumber ?? '', variantName: variant?.name ?? '', ...next },
        version,
      }
    })
  }

  /** A new list with the source's header, options and every entry, under a new code and validity. */
  async copyPriceList(actor: SessionUser, sourceId: string, body: CopyPriceListBody): Promise<AdminPriceListRow> {
    return this.dataSource.transaction(async (manager) => {
      const source = await manager.findOneBy(PriceListRecord, { id: sourceId })
      if (!source) throw new NotFoundError('Price list')
      if (await manager.existsBy(PriceListRecord, { code: body.code })) {
        const message = `A price list with code ${body.code} already exists`
        throw new AppError(409, 'code_taken', message, { code: message })
      }
      const header = {
        code: body.code,
        name: body.name,
        currency: source.currency,
        validFrom: body.validFrom,
        validTo: body.validTo,
        baseCopperIndexPerKg: source.baseCopperIndexPerKg,
        copperCreditBelowBase: source.copperCreditBelowBase,
        tierDiscountBp: source.tierDiscountBp,
        options: source.options,
      }
      const errors = validatePriceList(asPriceList({ ...header, id: 'new' }))
      if (errors.length) throw new ValidationError(fieldsOf(errors))
      const copy = await manager.save(manager.create(PriceListRecord, header))
      // Copied in the database: a list holds an entry per variant (hundreds of rows).
      await manager.query(
        'INSERT INTO `price_list_entry` (`id`, `priceListId`, `variantId`, `unitPrice`, `breaks`, `moq`, `leadTimeDays`) SELECT UUID(), ?, `variantId`, `unitPrice`, `breaks`, `moq`, `leadTimeDays` FROM `price_list_entry` WHERE `priceListId` = ?',
        [copy.id, source.id],
      )
      const entryCount = await manager.countBy(PriceListEntryRecord, { priceListId: copy.id })
      await recordAudit(manager, actor, 'price_list', copy.id, 'copied', { code: copy.code, from: { id: source.id, code: source.code }, validFrom: copy.validFrom, validTo: copy.validTo, entryCount })
      return this.getPriceList(copy.id, manager)
    })
  }

  async copperHistory(currency: string): Promise<CopperIndexHistory> {
    const records = await this.dataSource.getRepository(CopperIndexRecord).find({ where: { currency }, order: { effectiveFrom: 'DESC', createdAt: 'DESC' } })
    const creatorIds = [...new Set(records.flatMap((record) => (record.createdById ? [record.createdById] : [])))]
    const creators = creatorIds.length ? await this.dataSource.getRepository(User).findBy({ id: In(creatorIds) }) : []
    const emailBy = new Map(creators.map((user) => [user.id, user.email]))
    const history: CopperIndexValue[] = records.map((record) => ({
      id: record.id,
      currency: record.currency,
      valuePerKg: record.valuePerKg,
      effectiveFrom: record.effectiveFrom,
      createdBy: record.createdById ? (emailBy.get(record.createdById) ?? null) : null,
      createdAt: record.createdAt.toISOString(),
    }))
    const today = this.today()
    return { currency, current: history.find((value) => compareIsoDates(value.effectiveFrom, today) <= 0) ?? null, history }
  }

  /**
   * Adds a value from `effectiveFrom` on. Values are never edited: a correction is a new value with
   * a later date. Backdating is refused, so quotes already priced keep the index they were given.
   */
  async addCopperValue(actor: SessionUser, body: CopperIndexBody): Promise<CopperIndexHistory> {
    const today = this.today()
    if (compareIsoDates(body.effectiveFrom, today) < 0) {
      throw new ValidationError({ effectiveFrom: `the index cannot be changed in the past; use ${today} or later` })
    }
    await this.dataSource.transaction(async (manager) => {
      // Serialises additions per currency so two admins cannot both take the same date.
      await manager.find(CopperIndexRecord, { where: { currency: body.currency }, lock: { mode: 'pessimistic_write' } })
      if (await manager.existsBy(CopperIndexRecord, { currency: body.currency, effectiveFrom: body.effectiveFrom })) {
        const message = `A ${body.currency} value from ${body.effectiveFrom} already exists; values are kept as history, add one with a later date`
        throw new AppError(409, 'date_taken', message, { effectiveFrom: message })
      }
      const before = await manager.findOne(CopperIndexRecord, { where: { currency: body.currency, effectiveFrom: LessThan(addDays(body.effectiveFrom, 1)) }, order: { effectiveFrom: 'DESC' } })
      const record = await manager.save(manager.create(CopperIndexRecord, { currency: body.currency, valuePerKg: body.valuePerKg, effectiveFrom: body.effectiveFrom, createdById: actor.id }))
      await recordAudit(manager, actor, 'copper_index', record.id, 'value-added', {
        currency: body.currency,
        effectiveFrom: body.effectiveFrom,
        valuePerKg: { before: before?.valuePerKg ?? null, after: body.valuePerKg },
      })
    })
    return this.copperHistory(body.currency)
  }

  /** Moves the list's version on if it is still `expected`; a stale editor gets 409. */
  private async bumpVersion(manager: EntityManager, id: string, expected: number, set: Partial<PriceListRecord> = {}): Promise<number> {
    const result = await manager
      .createQueryBuilder()
      .update(PriceListRecord)
      .set({ ...set, version: () => 'version + 1' })
      .where('id = :id AND version = :version', { id, version: expected })
      .execute()
    if (!result.affected) throw staleList()
    return expected + 1
  }

  private entryFromRaw(row: Record<string, unknown>): AdminPriceListEntryRow {
    const breaks = typeof row.breaks === 'string' ? JSON.parse(row.breaks) : row.breaks
    return {
      id: String(row.id),
      variantId: String(row.variantId),
      partNumber: String(row.partNumber),
      variantName: String(row.variantName),
      unitPrice: Number(row.unitPrice),
      breaks: Array.isArray(breaks) ? breaks : [],
      moq: Number(row.moq),
      leadTimeDays: Number(row.leadTimeDays),
    }
  }

  private async listRows(manager: EntityManager, lists: PriceListRecord[]): Promise<AdminPriceListRow[]> {
    if (!lists.length) return []
    const ids = lists.map((list) => list.id)
    const entryCounts = await manager
      .getRepository(PriceListEntryRecord)
      .createQueryBuilder('entry')
      .select('entry.priceListId', 'id')
      .addSelect('COUNT(*)', 'count')
      .where('entry.priceListId IN (:...ids)', { ids })
      .groupBy('entry.priceListId')
      .getRawMany<{ id: string; count: string }>()
    const accountCounts = await manager
      .getRepository(AccountTerms)
      .createQueryBuilder('terms')
      .select('terms.priceListId', 'id')
      .addSelect('COUNT(*)', 'count')
      .where('terms.priceListId IN (:...ids)', { ids })
      .groupBy('terms.priceListId')
      .getRawMany<{ id: string; count: string }>()
    const entriesBy = new Map(entryCounts.map((row) => [row.id, Number(row.count)]))
    const accountsBy = new Map(accountCounts.map((row) => [row.id, Number(row.count)]))
    return lists.map((list) => ({
      id: list.id,
      code: list.code,
      name: list.name,
      currency: list.currency,
      validFrom: list.validFrom,
      validTo: list.validTo,
      baseCopperIndexPerKg: list.baseCopperIndexPerKg,
      copperCreditBelowBase: list.copperCreditBelowBase,
      tierDiscountBp: list.tierDiscountBp,
      entryCount: entriesBy.get(list.id) ?? 0,
      accountCount: accountsBy.get(list.id) ?? 0,
      version: list.version,
      updatedAt: list.updatedAt.toISOString(),
    }))
  }
}
