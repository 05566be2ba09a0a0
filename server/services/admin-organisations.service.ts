// Customer organisations and their account terms: tier, currency, price list, assigned sales
// engineer and negotiated discount overrides. The maker's own organisation is listed, not edited.
import { In, IsNull, type DataSource, type EntityManager } from 'typeorm'
import type {
  AccountOverrideDto,
  AdminOrganisationRow,
  OrganisationListQuery,
  OrganisationUpdateBody,
  Page,
  SalesEngineerOption,
} from '../../shared/contracts/admin.contract'
import { organisationBodySchema } from '../../shared/contracts/admin.contract'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { AccountTerms, MotorVariant, Organisation, PriceListRecord, User } from '../db/entities'
import { AppError, ConflictError, NotFoundError, ValidationError } from '../http/errors'
import { changesBetween, recordAudit } from './admin-audit.service'

function likeTerm(value: string): string {
  return `%${value.replace(/[\\%_]/g, '\\$&')}%`
}

function nameTaken(name: string): AppError {
  const message = `An organisation called ${name} already exists`
  return new AppError(409, 'name_taken', message, { name: message })
}

type ParsedBody = ReturnType<typeof organisationBodySchema.parse>
type StoredOverride = AccountTerms['overrides'][number]

export class AdminOrganisationService {
  constructor(private readonly dataSource: DataSource) {}

  async list(query: OrganisationListQuery): Promise<Page<AdminOrganisationRow>> {
    const builder = this.dataSource
      .getRepository(Organisation)
      .createQueryBuilder('organisation')
      // The maker first (first value of the enum), then customers by name.
      .orderBy('organisation.kind', 'ASC')
      .addOrderBy('organisation.name', 'ASC')
      .skip((query.page - 1) * query.pageSize)
      .take(query.pageSize)
    if (query.kind) builder.andWhere('organisation.kind = :kind', { kind: query.kind })
    if (query.search) builder.andWhere('organisation.name LIKE :term', { term: likeTerm(query.search) })
    const [organisations, total] = await builder.getManyAndCount()
    return { items: await this.rows(this.dataSource.manager, organisations), total, page: query.page, pageSize: query.pageSize }
  }

  async get(id: string, manager: EntityManager = this.dataSource.manager): Promise<AdminOrganisationRow> {
    const organisation = await manager.findOneBy(Organisation, { id })
    if (!organisation) throw new NotFoundError('Organisation')
    const [row] = await this.rows(manager, [organisation])
    if (!row) throw new NotFoundError('Organisation')
    return row
  }

  /** Enabled sales engineers of the maker, for the assignment menu. */
  async salesEngineers(): Promise<SalesEngineerOption[]> {
    const users = await this.dataSource.getRepository(User).find({ where: { role: 'sales', disabledAt: IsNull() }, order: { name: 'ASC' } })
    return users.map((user) => ({ id: user.id, name: user.name, email: user.email, discountLimitBp: user.discountLimitBp }))
  }

  async create(actor: SessionUser, body: ParsedBody): Promise<AdminOrganisationRow> {
    return this.dataSource.transaction(async (manager) => {
      if (await manager.existsBy(Organisation, { name: body.name })) throw nameTaken(body.name)
      await this.checkTerms(manager, body)
      const overrides = await this.resolveOverrides(manager, body.overrides)
      const organisation = await manager.save(manager.create(Organisation, { name: body.name, kind: 'customer', tier: body.tier, currency: body.currency }))
      await manager.insert(AccountTerms, { organisationId: organisation.id, priceListId: body.priceListId, salesEngineerId: body.salesEngineerId, overrides, version: 1 })
      await recordAudit(manager, actor, 'organisation', organisation.id, 'created', {
        name: organisation.name,
        tier: organisation.tier,
        currency: organisation.currency,
        priceListId: body.priceListId,
        salesEngineerId: body.salesEngineerId,
        overrides,
      })
      return this.get(organisation.id, manager)
    })
  }

  /** Saves the organisation and its terms together; `version` is the terms' version the editor loaded. */
  async update(actor: SessionUser, id: string, body: ParsedBody & Pick<OrganisationUpdateBody, 'version'>): Promise<AdminOrganisationRow> {
    return this.dataSource.transaction(async (manager) => {
      const organisation = await manager.findOneBy(Organisation, { id })
      if (!organisation) throw new NotFoundError('Organisation')
      if (organisation.kind !== 'customer') throw new ConflictError('The maker’s own organisation has no account terms to edit', 'not_a_customer')
      const terms = await manager.findOne(AccountTerms, { where: { organisationId: id }, lock: { mode: 'pessimistic_write' } })
      if (!terms || terms.version !== body.version) {
        throw new ConflictError('Someone changed this organisation after you opened it; reload to see their changes', 'stale_version')
      }
      const clash = await manager.findOneBy(Organisation, { name: body.name })
      if (clash && clash.id !== id) throw nameTaken(body.name)
      await this.checkTerms(manager, body)
      const overrides = await this.resolveOverrides(manager, body.overrides)
      const organisationChanges = changesBetween(organisation, { name: body.name, tier: body.tier, currency: body.currency })
      const termChanges = changesBetween(terms, { priceListId: body.priceListId, salesEngineerId: body.salesEngineerId, overrides })
      const changes = { ...organisationChanges, ...termChanges }
      if (!Object.keys(changes).length) return this.get(id, manager)
      if (Object.keys(organisationChanges).length) await manager.update(Organisation, { id }, { name: body.name, tier: body.tier, currency: body.currency })
      // Any change moves the terms' version on, so a second editor of the same account gets a 409.
      await manager
        .createQueryBuilder()
        .update(AccountTerms)
        .set({ priceListId: body.priceListId, salesEngineerId: body.salesEngineerId, overrides, version: () => 'version + 1' })
        .where('organisationId = :id', { id })
        .execute()
      await recordAudit(manager, actor, 'organisation', id, 'updated', { name: body.name, changes })
      return this.get(id, manager)
    })
  }

  private async checkTerms(manager: EntityManager, body: ParsedBody): Promise<void> {
    const fields: Record<string, string> = {}
    const list = await manager.findOneBy(PriceListRecord, { id: body.priceListId })
    if (!list) fields.priceListId = 'no such price list'
    else if (list.currency !== body.currency) fields.priceListId = `${list.code} is in ${list.currency}; the account is in ${body.currency}`
    if (body.salesEngineerId) {
      const engineer = await manager.findOneBy(User, { id: body.salesEngineerId })
      if (!engineer || engineer.role !== 'sales') fields.salesEngineerId = 'choose a sales engineer'
      else if (engineer.disabledAt) fields.salesEngineerId = `${engineer.name} is disabled`
    }
    if (Object.keys(fields).length) throw new ValidationError(fields)
  }

  private async resolveOverrides(manager: EntityManager, overrides: ParsedBody['overrides']): Promise<StoredOverride[]> {
    const partNumbers = overrides.flatMap((item) => (item.partNumber ? [item.partNumber.toUpperCase()] : []))
    const variants = partNumbers.length ? await manager.find(MotorVariant, { where: { partNumber: In(partNumbers) }, select: { id: true, partNumber: true } }) : []
    const byPart = new Map(variants.map((variant) => [variant.partNumber.toUpperCase(), variant.id]))
    const fields: Record<string, string> = {}
    const resolved: StoredOverride[] = []
    overrides.forEach((item, index) => {
      if (!item.partNumber) return void resolved.push({ discountBp: item.discountBp })
      const variantId = byPart.get(item.partNumber.toUpperCase())
      if (!variantId) fields[`overrides.${index}.partNumber`] = `no motor ${item.partNumber} in the catalogue`
      else resolved.push({ variantId, discountBp: item.discountBp })
    })
    if (Object.keys(fields).length) throw new ValidationError(fields)
    return resolved
  }

  private async rows(manager: EntityManager, organisations: Organisation[]): Promise<AdminOrganisationRow[]> {
    if (!organisations.length) return []
    const ids = organisations.map((organisation) => organisation.id)
    const terms = await manager.findBy(AccountTerms, { organisationId: In(ids) })
    const termsBy = new Map(terms.map((item) => [item.organisationId, item]))
    const listIds = [...new Set(terms.map((item) => item.priceListId))]
    const lists = listIds.length ? await manager.find(PriceListRecord, { where: { id: In(listIds) }, select: { id: true, code: true, currency: true } }) : []
    const listBy = new Map(lists.map((list) => [list.id, list]))
    const engineerIds = [...new Set(terms.flatMap((item) => (item.salesEngineerId ? [item.salesEngineerId] : [])))]
    const engineers = engineerIds.length ? await manager.findBy(User, { id: In(engineerIds) }) : []
    const engineerBy = new Map(engineers.map((user) => [user.id, user]))
    const variantIds = [...new Set(terms.flatMap((item) => item.overrides.flatMap((o) => (o.variantId ? [o.variantId] : []))))]
    const variants = variantIds.length ? await manager.find(MotorVariant, { where: { id: In(variantIds) }, select: { id: true, partNumber: true } }) : []
    const partBy = new Map(variants.map((variant) => [variant.id, variant.partNumber]))
    const counts = await manager
      .getRepository(User)
      .createQueryBuilder('user')
      .select('user.organisationId', 'organisationId')
      .addSelect('COUNT(*)', 'count')
      .where('user.organisationId IN (:...ids)', { ids })
      .groupBy('user.organisationId')
      .getRawMany<{ organisationId: string; count: string }>()
    const countBy = new Map(counts.map((row) => [row.organisationId, Number(row.count)]))
    return organisations.map((organisation) => {
      const term = termsBy.get(organisation.id)
      const list = term ? listBy.get(term.priceListId) : undefined
      const engineer = term?.salesEngineerId ? engineerBy.get(term.salesEngineerId) : undefined
      const overrides: AccountOverrideDto[] = (term?.overrides ?? []).map((o) => ({
        variantId: o.variantId ?? null,
        partNumber: o.variantId ? (partBy.get(o.variantId) ?? null) : null,
        discountBp: o.discountBp,
      }))
      return {
        id: organisation.id,
        name: organisation.name,
        kind: organisation.kind,
        tier: organisation.tier,
        currency: organisation.currency,
        userCount: countBy.get(organisation.id) ?? 0,
        priceList: list ? { id: list.id, code: list.code, currency: list.currency } : null,
        salesEngineer: engineer ? { id: engineer.id, name: engineer.name, email: engineer.email } : null,
        overrides,
        version: term?.version ?? null,
        createdAt: organisation.createdAt.toISOString(),
      }
    })
  }
}
