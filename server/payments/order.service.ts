// Sales orders: made when a deposit is paid (inside the webhook's transaction), listed for sales and
// for the buyer's organisation, confirmed by sales (the quote then becomes 'ordered').
import { In, type DataSource, type EntityManager } from 'typeorm'
import type { Page } from '../../shared/contracts/admin.contract'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import type { OrderListQuery, OrderRecord, OrderSummary } from '../../shared/contracts/payment.contract'
import { AuditEntry, QuoteAcceptance, QuoteRecordEntity, SalesOrder } from '../db/entities'
import { ConflictError, NotFoundError } from '../http/errors'

const isStaff = (user: SessionUser) => user.role === 'admin' || user.role === 'sales'

export interface NewOrder {
  quote: QuoteRecordEntity
  revision: string
  total: number
  depositPaid: number
  purchaseOrderRef: string
  at: Date
}


export class OrderService {
  constructor(private readonly dataSource: DataSource) {}

  /**
   * Next order number of the year, SO-<year>-<5 digits>. The locking read on the newest number
   * serialises concurrent creators; a collision that still slips through (two first orders of a
   * year) fails on the unique index or as a deadlock, and the caller's transaction is retried.
   */
  async nextNumber(manager: EntityManager, year: number): Promise<string> {
    const prefix = `SO-${year}-`
    const newest = await manager
      .getRepository(SalesOrder)
      .createQueryBuilder('o')
      .select('o.number', 'number')
      .where('o.number LIKE :prefix', { prefix: `${prefix}%` })
      // Length first, so a sixth digit (past 99 999 orders a year) still sorts last.
      .orderBy('LENGTH(o.number)', 'DESC')
      .addOrderBy('o.number', 'DESC')
      .limit(1)
      .setLock('pessimistic_write')
      .getRawOne<{ number: string }>()
    const last = newest ? Number.parseInt(newest.number.slice(prefix.length), 10) : 0
    return `${prefix}${String((Number.isFinite(last) ? last : 0) + 1).padStart(5, '0')}`
  }

  /** Creates the order record of a paid deposit, inside the caller's transaction. */
  async createForPaidDeposit(manager: EntityManager, input: NewOrder): Promise<SalesOrder> {
    const repository = manager.getRepository(SalesOrder)
    const number = await this.nextNumber(manager, input.at.getUTCFullYear())
    return repository.save(
      repository.create({
        number,
        quoteId: input.quote.id,
        revision: input.revision,
        organisationId: input.quote.organisationId,
        total: input.total,
        depositPaid: input.depositPaid,
        currency: input.quote.currency,
        purchaseOrderRef: input.purchaseOrderRef,
        confirmedAt: null,
      }),
    )
  }

  async list(user: SessionUser, query: OrderListQuery): Promise<Page<OrderSummary>> {
    const builder = this.dataSource.getRepository(SalesOrder).createQueryBuilder('o')
    if (!isStaff(user)) builder.andWhere('o.organisationId = :org', { org: user.organisation.id })
    if (query.status === 'confirmed') builder.andWhere('o.confirmedAt IS NOT NULL')
    if (query.status === 'awaiting-confirmation') builder.andWhere('o.confirmedAt IS NULL')
    const [orders, total] = await builder
      .orderBy('o.createdAt', 'DESC')
      .addOrderBy('o.number', 'DESC')
      .skip((query.page - 1) * query.pageSize)
      .take(query.pageSize)
      .getManyAndCount()
    const quotes = await this.quotesOf(orders)
    return {
      items: orders.flatMap((order) => {
        const quote = quotes.get(order.quoteId)
        return quote ? [toSummary(order, quote)] : []
      }),
      total,
      page: query.page,
      pageSize: query.pageSize,
    }
  }

  async get(user: SessionUser, id: string): Promise<OrderRecord> {
    const order = await this.dataSource.getRepository(SalesOrder).findOne({ where: { id } })
    if (!order || !canSee(user, order)) throw new NotFoundError('Order')
    return this.record(order)
  }

  /** Sales confirms a deposit-paid order: the quote becomes 'ordered'. */
  async confirm(user: SessionUser, id: string): Promise<OrderRecord> {
    const order = await this.dataSource.transaction(async (manager) => {
      const found = await manager.getRepository(SalesOrder).findOne({ where: { id } })
      if (!found || !canSee(user, found)) throw new NotFoundError('Order')
      // Same lock order as the payment webhook: the quote row first.
      const quote = await manager.getRepository(QuoteRecordEntity).findOne({ where: { id: found.quoteId }, lock: { mode: 'pessimistic_write' } })
      const order = await manager.getRepository(SalesOrder).findOne({ where: { id }, lock: { mode: 'pessimistic_write' } })
      if (!quote || !order) throw new NotFoundError('Order')
      if (order.confirmedAt !== null || quote.state === 'ordered') {
        throw new ConflictError(`Order ${order.number} is already confirmed`, 'order_already_confirmed')
      }
      if (quote.state !== 'deposit-paid') {
        throw new ConflictError(`The quote of order ${order.number} is ${quote.state}; only a deposit-paid quote can be confirmed as ordered`, 'quote_not_deposit_paid')
      }
      const at = new Date()
      order.confirmedAt = at
      await manager.getRepository(SalesOrder).save(order)
      quote.state = 'ordered'
      await manager.getRepository(QuoteRecordEntity).save(quote)
      await manager.getRepository(AuditEntry).insert({
        actorId: user.id,
        actorEmail: user.email,
        entity: 'sales_order',
        entityId: order.id,
        action: 'order.confirmed',
        detail: { number: order.number, quoteId: quote.id },
      })
      return order
    })
    return this.record(order)
  }

  private async record(order: SalesOrder): Promise<OrderRecord> {
    const quote = (await this.quotesOf([order])).get(order.quoteId)
    if (!quote) throw new NotFoundError('Order')
    const acceptance = await this.dataSource.getRepository(QuoteAcceptance).findOne({ where: { quoteId: order.quoteId } })
    return {
      ...toSummary(order, quote),
      quoteState: quote.state,
      acceptedByName: acceptance?.acceptedByName ?? null,
      salesEngineer: quote.salesEngineer ? { id: quote.salesEngineer.id, name: quote.salesEngineer.name } : null,
      balance: order.total - order.depositPaid,
    }
  }

  private async quotesOf(orders: SalesOrder[]): Promise<Map<string, QuoteRecordEntity>> {
    if (orders.length === 0) return new Map()
    const quotes = await this.dataSource.getRepository(QuoteRecordEntity).find({
      where: { id: In(orders.map((order) => order.quoteId)) },
      relations: { organisation: true, salesEngineer: true },
    })
    return new Map(quotes.map((quote) => [quote.id, quote]))
  }
}

function canSee(user: SessionUser, order: SalesOrder): boolean {
  return isStaff(user) || (user.role === 'buyer' && order.organisationId === user.organisation.id)
}

function toSummary(order: SalesOrder, quote: QuoteRecordEntity): OrderSummary {
  return {
    id: order.id,
    number: order.number,
    status: order.confirmedAt === null ? 'awaiting-confirmation' : 'confirmed',
    quoteId: order.quoteId,
    quoteNumber: quote.number,
    revision: order.revision,
    organisation: { id: quote.organisation.id, name: quote.organisation.name },
    purchaseOrderRef: order.purchaseOrderRef,
    total: order.total,
    depositPaid: order.depositPaid,
    currency: order.currency,
    createdAt: order.createdAt.toISOString(),
    confirmedAt: order.confirmedAt ? order.confirmedAt.toISOString() : null,
  }
}
