// Quote lifecycle: request -> drafting -> issued (numbered, frozen revisions) -> accepted; the
// deposit and order steps live in server/payments. Every amount is computed here with the pure
// rules of shared/pricing; nothing a client sends as a price is used.
import { randomUUID } from 'node:crypto'
import { mkdirSync, rmSync, writeFileSync } from 'node:fs'
import path from 'node:path'
import { In, LessThan, type DataSource, type EntityManager } from 'typeorm'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import type { Page } from '../../shared/contracts/admin.contract'
import type {
  Acceptance,
  LineDutyPoint,
  QuoteDocument,
  QuoteDraft,
  QuoteRecord,
  QuoteRequest,
  QuoteState,
  QuoteSummary,
  RevisionLine,
} from '../../shared/contracts/quote.contract'
import { DEFAULT_DRAFT_TERMS } from '../../shared/contracts/quote.contract'
import {
  addDays,
  formatQuoteNumber,
  isCurrencyCode,
  nextRevision,
  priceQuote,
  utcToday,
  type PriceList,
  type PricedQuote,
  type PricingError,
  type QuoteInput,
} from '../../shared/pricing'
import { runSelection } from '../../shared/selection/run-selection'
import { studyInputSchema } from '../../shared/contracts/study.contract'
import {
  AccountTerms,
  AuditEntry,
  CopperIndexRecord,
  DepositPayment,
  DutyStudy,
  MotorVariant,
  Organisation,
  PriceListEntryRecord,
  PriceListRecord,
  QuoteAcceptance,
  QuoteRecordEntity,
  QuoteRevisionRecord,
  QuoteSequence,
  SalesOrder,
  User,
} from '../db/entities'
import { AppError, ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../http/errors'
import type { CatalogueService } from './catalogue.service'

export const MAKER = {
  name: 'Ashcombe Motor Works',
  address: ['Unit 7, Kestrel Park', 'Dunmore, OH 43990', 'United States'],
  email: 'quotes@ashcombe.test',
}

/** Renders a revision's PDF; the documents module provides the real one. */
export type PdfRenderer = (doc: QuoteDocument) => Promise<Buffer>

/** Mail side effects of the lifecycle, written to the outbox inside the caller's transaction. */
export interface QuoteMailer {
  reminder?(manager: EntityManager, args: { doc: QuoteDocument; to: string[]; daysLeft: number; quoteId: string }): Promise<boolean>
  issued(manager: EntityManager, args: { doc: QuoteDocument; to: string[]; pdfPath: string; quoteId: string }): Promise<void>
  accepted(manager: EntityManager, args: { doc: QuoteDocument; to: string[]; acceptedByName: string; purchaseOrderRef: string; quoteId: string }): Promise<void>
}

export interface QuoteServiceDeps {
  dataSource: DataSource
  catalogue: CatalogueService
  dataDir: string
  publicUrl: string
  renderPdf: PdfRenderer
  mailer: QuoteMailer
  today?: () => string
}

const isStaff = (user: SessionUser) => user.role === 'admin' || user.role === 'sales'
const EDITABLE: readonly QuoteState[] = ['requested', 'drafting', 'issued']

function pricingFields(errors: PricingError[]): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const error of errors) {
    const key = `draft.${error.field.replace(/\[(\d+)\]/g, '.$1')}`
    fields[key] ??= error.message
  }
  return fields
}

/** The content of one issued revision: what the PDF shows and what the revision keeps, unchanged. */
export function buildDocument(args: {
  number: string
  letter: string
  issuedOn: string
  validUntil: string
  quote: QuoteRecordEntity
  issuer: User
  lines: RevisionLine[]
  priced: PricedQuote
  draft: QuoteDraft
}): QuoteDocument {
  const { quote, priced, draft } = args
  const requester = quote.requestedBy
  return {
    number: args.number,
    revision: args.letter,
    issuedOn: args.issuedOn,
    validUntil: args.validUntil,
    currency: priced.currency,
    maker: MAKER,
    customer: {
      name: quote.organisation.name,
      tier: quote.organisation.tier ?? 'oem',
      contactName: requester?.name ?? '',
      contactEmail: requester?.email ?? '',
    },
    salesEngineer: { name: args.issuer.name, email: args.issuer.email },
    lines: args.lines,
    priced,
    terms: { incoterm: draft.incoterm, incotermPlace: draft.incotermPlace, paymentTerms: draft.paymentTerms, depositBp: draft.depositBp, notes: draft.notes },
    copperIndex: { valuePerKg: priced.copperIndex.valuePerKg, baseValuePerKg: priced.baseCopperIndexPerKg, stampedOn: priced.copperIndex.stampedOn },
  }
}

/**
 * A buyer's request as a quote in state 'requested' with its draft started from the request (the
 * account's sales engineer and currency, DEFAULT_DRAFT_TERMS), audited.
 * QuoteService.request() runs it after its checks; the demo seed runs it for the demo request.
 */
export async function recordQuoteRequest(
  tx: EntityManager,
  buyer: { id: string; email: string; organisationId: string },
  request: QuoteRequest,
): Promise<QuoteRecordEntity> {
  const terms = await tx.findOneBy(AccountTerms, { organisationId: buyer.organisationId })
  const list = terms ? await tx.findOneBy(PriceListRecord, { id: terms.priceListId }) : null
  const created = await tx.save(
    tx.create(QuoteRecordEntity, {
      state: 'requested',
      organisationId: buyer.organisationId,
      requestedById: buyer.id,
      salesEngineerId: terms?.salesEngineerId ?? null,
      studyId: request.studyId ?? null,
      currency: list?.currency ?? 'USD',
      request,
      draft: {
        lines: [{ partNumber: request.partNumber, tap: request.tap, quantity: request.quantityPerYear, options: [], extraDiscountBp: 0, studyId: request.studyId }],
        nre: [],
        ...DEFAULT_DRAFT_TERMS,
        notes: request.note ? `Buyer's note: ${request.note}` : '',
      },
      currentRevision: null,
      validUntil: null,
      number: null,
      withdrawnReason: null,
    }),
  )
  await tx.save(
    tx.create(AuditEntry, {
      actorId: buyer.id,
      actorEmail: buyer.email,
      entity: 'quote',
      entityId: created.id,
      action: 'requested',
      detail: { partNumber: request.partNumber, quantityPerYear: request.quantityPerYear },
    }),
  )
  return created
}

export class QuoteService {
  private readonly today: () => string

  constructor(private readonly deps: QuoteServiceDeps) {
    this.today = deps.today ?? (() => utcToday())
  }

  private get dataSource() {
    return this.deps.dataSource
  }

  // ------------------------------------------------------------------ reading

  private async load(manager: EntityManager, id: string, lock = false): Promise<QuoteRecordEntity> {
    const quote = await manager.findOne(QuoteRecordEntity, {
      where: { id },
      relations: { organisation: true, requestedBy: true, salesEngineer: true },
      ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}),
    })
    if (!quote) throw new NotFoundError('Quote')
    return quote
  }

  private assertReadable(user: SessionUser, quote: QuoteRecordEntity): void {
    // Other organisations' quotes are answered as missing, so ids reveal nothing.
    if (!isStaff(user) && quote.organisationId !== user.organisation.id) throw new NotFoundError('Quote')
  }

  async list(user: SessionUser, page: number, pageSize: number, states?: QuoteState[]): Promise<Page<QuoteSummary>> {
    await this.expireDue()
    const builder = this.dataSource
      .getRepository(QuoteRecordEntity)
      .createQueryBuilder('quote')
      .innerJoinAndSelect('quote.organisation', 'organisation')
      .orderBy('quote.updatedAt', 'DESC')
      .skip((page - 1) * pageSize)
      .take(pageSize)
    if (!isStaff(user)) builder.andWhere('quote.organisationId = :org', { org: user.organisation.id })
    // A sales engineer's list holds their accounts' quotes and those nobody has taken yet.
    if (user.role === 'sales') builder.andWhere('(quote.salesEngineerId = :me OR quote.salesEngineerId IS NULL)', { me: user.id })
    if (states?.length) builder.andWhere('quote.state IN (:...states)', { states })
    const [quotes, total] = await builder.getManyAndCount()
    const revisions = quotes.length
      ? await this.dataSource.getRepository(QuoteRevisionRecord).find({
          where: { quoteId: In(quotes.map((quote) => quote.id)) },
          select: { quoteId: true, letter: true, total: true, validUntil: true, issuedAt: true },
        })
      : []
    return {
      items: quotes.map((quote) => {
        const current = revisions.find((revision) => revision.quoteId === quote.id && revision.letter === quote.currentRevision)
        const firstLine = quote.draft?.lines[0] ?? (quote.request ? { partNumber: quote.request.partNumber, quantity: quote.request.quantityPerYear } : undefined)
        return {
          id: quote.id,
          number: quote.number,
          revision: quote.currentRevision,
          state: quote.state,
          organisationName: quote.organisation.name,
          title: firstLine ? `${firstLine.partNumber} × ${firstLine.quantity.toLocaleString('en-US')}${(quote.draft?.lines.length ?? 1) > 1 ? ` and ${(quote.draft?.lines.length ?? 1) - 1} more` : ''}` : 'Quote',
          total: current?.total ?? null,
          currency: quote.currency,
          validUntil: current?.validUntil ?? null,
          updatedAt: quote.updatedAt.toISOString(),
        }
      }),
      total,
      page,
      pageSize,
    }
  }

  async get(user: SessionUser, id: string): Promise<QuoteRecord> {
    await this.expireDue()
    const quote = await this.load(this.dataSource.manager, id)
    this.assertReadable(user, quote)
    return this.record(user, quote)
  }

  private async record(user: SessionUser, quote: QuoteRecordEntity): Promise<QuoteRecord> {
    const manager = this.dataSource.manager
    const revisions = await manager.find(QuoteRevisionRecord, { where: { quoteId: quote.id }, order: { issuedAt: 'ASC' } })
    const current = revisions.find((revision) => revision.letter === quote.currentRevision) ?? null
    const acceptance = await manager.findOneBy(QuoteAcceptance, { quoteId: quote.id })
    const deposit = await manager.findOne(DepositPayment, { where: { quoteId: quote.id }, order: { createdAt: 'DESC' } })
    const order = await manager.findOneBy(SalesOrder, { quoteId: quote.id })
    let draftPricing: PricedQuote | null = null
    let draftErrors: { field: string; message: string }[] = []
    if (isStaff(user) && quote.draft) {
      const priced = await this.price(manager, quote, quote.draft, user)
      if (priced.ok) draftPricing = priced.value
      else draftErrors = Object.entries(pricingFields(priced.errors)).map(([field, message]) => ({ field, message }))
    }
    return {
      id: quote.id,
      number: quote.number,
      state: quote.state,
      version: quote.version,
      currency: quote.currency,
      organisation: { id: quote.organisation.id, name: quote.organisation.name, tier: quote.organisation.tier },
      requestedBy: quote.requestedBy ? { id: quote.requestedBy.id, name: quote.requestedBy.name, email: quote.requestedBy.email } : null,
      salesEngineer: quote.salesEngineer ? { id: quote.salesEngineer.id, name: quote.salesEngineer.name } : null,
      request: quote.request,
      // Buyers see what was issued to them, not the sales engineer's work in progress.
      draft: isStaff(user) ? quote.draft : null,
      draftPricing,
      draftErrors,
      revisions: revisions.map((revision) => ({
        letter: revision.letter,
        number: revision.fullNumber,
        issuedAt: revision.issuedAt.toISOString(),
        validUntil: revision.validUntil,
        total: revision.total,
        depositAmount: revision.depositAmount,
      })),
      current: current ? { ...current.document, letter: current.letter } : null,
      acceptance: acceptance
        ? { acceptedByName: acceptance.acceptedByName, purchaseOrderRef: acceptance.purchaseOrderRef, acceptedAt: acceptance.acceptedAt.toISOString(), revision: acceptance.revision }
        : null,
      deposit: deposit ? { status: deposit.status, amount: deposit.amount, paidAt: deposit.paidAt ? deposit.paidAt.toISOString() : null } : null,
      order: order ? { number: order.number, createdAt: order.createdAt.toISOString(), confirmedAt: order.confirmedAt ? order.confirmedAt.toISOString() : null } : null,
      createdAt: quote.createdAt.toISOString(),
      updatedAt: quote.updatedAt.toISOString(),
    }
  }

  async revisionDocument(user: SessionUser, id: string, letter: string): Promise<{ revision: QuoteRevisionRecord; absolutePath: string | null }> {
    const quote = await this.load(this.dataSource.manager, id)
    this.assertReadable(user, quote)
    const revision = await this.dataSource.getRepository(QuoteRevisionRecord).findOneBy({ quoteId: id, letter })
    if (!revision) throw new NotFoundError('Quote revision')
    return { revision, absolutePath: revision.pdfFile ? path.join(this.deps.dataDir, revision.pdfFile) : null }
  }

  // ------------------------------------------------------------------ pricing

  private async price(manager: EntityManager, quote: QuoteRecordEntity, draft: QuoteDraft, issuer: SessionUser | null): Promise<ReturnType<typeof priceQuote>> {
    const terms = await manager.findOneBy(AccountTerms, { organisationId: quote.organisationId })
    if (!terms) throw new AppError(409, 'no_account_terms', 'This customer has no price list assigned yet; an administrator sets it up under Organisations')
    const list = await manager.findOneBy(PriceListRecord, { id: terms.priceListId })
    if (!list || !isCurrencyCode(list.currency)) throw new AppError(409, 'no_price_list', 'The customer’s price list is missing')
    const partNumbers = [...new Set(draft.lines.map((line) => line.partNumber))]
    const variants = await manager.find(MotorVariant, { where: { partNumber: In(partNumbers) } })
    const unknown = draft.lines.findIndex((line) => !variants.some((variant) => variant.partNumber === line.partNumber))
    if (unknown >= 0) throw new ValidationError({ [`draft.lines.${unknown}.partNumber`]: 'no motor with this part number' })
    const entries = await manager.find(PriceListEntryRecord, { where: { priceListId: list.id, variantId: In(variants.map((variant) => variant.id)) } })
    const index = await manager.findOne(CopperIndexRecord, { where: { currency: list.currency, effectiveFrom: LessThan(addDays(this.today(), 1)) }, order: { effectiveFrom: 'DESC' } })
    const issuerLimit = issuer ? (issuer.role === 'admin' ? 10_000 : ((await manager.findOneBy(User, { id: issuer.id }))?.discountLimitBp ?? 0)) : 0
    const priceList: PriceList = {
      id: list.id,
      currency: list.currency,
      validFrom: list.validFrom,
      validTo: list.validTo,
      baseCopperIndexPerKg: list.baseCopperIndexPerKg,
      copperCreditBelowBase: list.copperCreditBelowBase,
      tierDiscountBp: { oem_contract: list.tierDiscountBp.oem, distributor: list.tierDiscountBp.distributor },
      entries: entries.map((entry) => ({ variantId: entry.variantId, unitPrice: entry.unitPrice, breaks: entry.breaks, moq: entry.moq, leadTimeDays: entry.leadTimeDays })),
      options: list.options,
    }
    const input: QuoteInput = {
      quoteDate: this.today(),
      currency: list.currency,
      priceList,
      customer: { accountId: quote.organisationId, tier: quote.organisation.tier === 'distributor' ? 'distributor' : 'oem_contract', overrides: terms.overrides },
      copperIndex: { valuePerKg: index?.valuePerKg ?? list.baseCopperIndexPerKg, currency: list.currency, stampedOn: index?.effectiveFrom ?? list.validFrom },
      lines: draft.lines.map((line) => {
        const variant = variants.find((item) => item.partNumber === line.partNumber)
        return {
          variantId: variant?.id ?? '',
          quantity: line.quantity,
          copperMassKg: (variant?.copperMassG ?? 0) / 1000,
          options: line.options,
          extraDiscountBp: line.extraDiscountBp,
        }
      }),
      nre: draft.nre,
      depositBp: draft.depositBp,
      salesDiscountLimitBp: issuerLimit,
    }
    return priceQuote(input)
  }

  // ------------------------------------------------------------------ lifecycle

  /** A buyer asks for a quote on a motor (usually a candidate of a duty study). */
  async request(user: SessionUser, request: QuoteRequest): Promise<QuoteRecord> {
    const manager = this.dataSource.manager
    const variant = await manager.findOneBy(MotorVariant, { partNumber: request.partNumber })
    if (!variant) throw new ValidationError({ partNumber: 'no motor with this part number' })
    if (variant.lifecycle === 'discontinued') throw new ValidationError({ partNumber: 'this motor is discontinued and cannot be quoted' })
    if (request.studyId) {
      const study = await manager.findOneBy(DutyStudy, { id: request.studyId })
      if (!study || study.organisationId !== user.organisation.id) throw new ValidationError({ studyId: 'no such duty study of your organisation' })
    }
    const quote = await this.dataSource.transaction((tx) => recordQuoteRequest(tx, { id: user.id, email: user.email, organisationId: user.organisation.id }, request))
    return this.get(user, quote.id)
  }

  /** A sales engineer starts a quote for an account without a request. */
  async create(user: SessionUser, organisationId: string, draft: QuoteDraft): Promise<QuoteRecord> {
    const organisation = await this.dataSource.getRepository(Organisation).findOneBy({ id: organisationId })
    if (!organisation || organisation.kind !== 'customer') throw new ValidationError({ organisationId: 'no such customer' })
    const terms = await this.dataSource.getRepository(AccountTerms).findOneBy({ organisationId })
    const list = terms ? await this.dataSource.getRepository(PriceListRecord).findOneBy({ id: terms.priceListId }) : null
    const quote = await this.dataSource.transaction(async (tx) => {
      const created = await tx.save(
        tx.create(QuoteRecordEntity, {
          state: 'drafting',
          organisationId,
          requestedById: null,
          salesEngineerId: user.id,
          studyId: null,
          currency: list?.currency ?? organisation.currency,
          request: null,
          draft,
          currentRevision: null,
          validUntil: null,
          number: null,
          withdrawnReason: null,
        }),
      )
      await this.audit(tx, user, created.id, 'created', { lines: draft.lines.length })
      return created
    })
    return this.get(user, quote.id)
  }

  async updateDraft(user: SessionUser, id: string, draft: QuoteDraft, version: number): Promise<QuoteRecord> {
    await this.dataSource.transaction(async (tx) => {
      const quote = await this.load(tx, id, true)
      if (quote.version !== version) throw new ConflictError('Someone changed this quote after you opened it; reload to see their changes', 'stale_version')
      if (!EDITABLE.includes(quote.state)) throw new ConflictError(`A quote that is ${quote.state} cannot be edited`, 'not_editable')
      for (const [index, line] of draft.lines.entries()) {
        if (line.extraDiscountBp > 0 && user.role === 'sales') {
          const limit = (await tx.findOneBy(User, { id: user.id }))?.discountLimitBp ?? 0
          if (line.extraDiscountBp > limit) throw new ValidationError({ [`draft.lines.${index}.extraDiscountBp`]: `above your discount limit of ${limit / 100} %` })
        }
      }
      quote.draft = draft
      if (quote.state === 'requested') quote.state = 'drafting'
      if (!quote.salesEngineerId) quote.salesEngineerId = user.id
      await tx.save(quote)
      await this.audit(tx, user, id, 'draft-saved', { lines: draft.lines.length })
    })
    return this.get(user, id)
  }

  private async dutyPoint(partNumber: string, tap: string | undefined, studyId: string | null | undefined, manager: EntityManager): Promise<LineDutyPoint | null> {
    if (!studyId) return null
    const study = await manager.findOneBy(DutyStudy, { id: studyId })
    if (!study) return null
    const input = studyInputSchema.parse(study.input)
    const entry = await this.deps.catalogue.solverEntry(partNumber)
    if (!entry) return null
    const result = runSelection([entry], { ...input, constraints: { ...input.constraints, activeOnly: false } })
    const candidate = result.candidates.find((item) => !tap || item.tap === tap) ?? result.candidates[0]
    if (!candidate) return null
    const curves = result.curves.find((item) => item.tap === candidate.tap)
    const lowVolts = input.supply.volts * (1 - input.tolerance.voltagePct / 100)
    return {
      studyName: study.name,
      supply: input.supply,
      duty: input.duty,
      nominal: {
        rpm: candidate.nominal.rpm,
        flowM3s: candidate.nominal.flowM3s,
        staticPa: candidate.nominal.staticPa,
        inputW: candidate.nominal.inputW,
        currentA: candidate.nominal.currentA,
        efficiency: candidate.nominal.efficiency,
        status: candidate.nominal.status,
      },
      lowLine: {
        volts: lowVolts,
        rpm: candidate.lowLine.rpm,
        flowM3s: candidate.lowLine.flowM3s,
        staticPa: candidate.lowLine.staticPa,
        inputW: candidate.lowLine.inputW,
        currentA: candidate.lowLine.currentA,
        status: candidate.lowLine.status,
      },
      meetsDuty: candidate.meetsDuty,
      motorCurve: curves?.motorNominal ?? [],
      motorLowLineCurve: curves?.motorLowLine ?? [],
      loadCurve: result.loadCurve,
    }
  }

  /**
   * Freezes the draft into the next numbered revision: prices, surcharge index and each line's
   * operating point at the buyer's duty. The first issue claims a yearly sequence number under a
   * row lock, so concurrent issues get unique numbers.
   */
  async issue(user: SessionUser, id: string, version: number): Promise<QuoteRecord> {
    const manager = this.dataSource.manager
    const quote = await this.load(manager, id)
    if (quote.version !== version) throw new ConflictError('Someone changed this quote after you opened it; reload to see their changes', 'stale_version')
    if (!EDITABLE.includes(quote.state)) throw new ConflictError(`A quote that is ${quote.state} cannot be issued`, 'not_issuable')
    const draft = quote.draft
    if (!draft) throw new ValidationError({ draft: 'the quote has no lines yet' })
    const priced = await this.price(manager, quote, draft, user)
    if (!priced.ok) throw new ValidationError(pricingFields(priced.errors), 'The quote cannot be priced as it stands')
    const variants = await manager.find(MotorVariant, { where: { partNumber: In(draft.lines.map((line) => line.partNumber)) } })
    const list = await manager.findOneByOrFail(PriceListRecord, { id: priced.value.priceListId })
    const lines: RevisionLine[] = []
    for (const [index, line] of draft.lines.entries()) {
      const variant = variants.find((item) => item.partNumber === line.partNumber)
      const pricedLine = priced.value.lines[index]
      const entry = await manager.findOneBy(PriceListEntryRecord, { priceListId: list.id, variantId: variant?.id ?? '' })
      lines.push({
        partNumber: line.partNumber,
        name: variant?.name ?? line.partNumber,
        tap: line.tap ?? null,
        quantity: line.quantity,
        moq: pricedLine?.moq ?? 1,
        leadTimeDays: pricedLine?.leadTimeDays ?? 0,
        breaks: entry ? [{ minQuantity: 1, unitPrice: entry.unitPrice }, ...entry.breaks] : [],
        options: (pricedLine?.options ?? []).map((option) => ({ code: option.code, label: option.label, perUnit: option.perUnit })),
        dutyPoint: await this.dutyPoint(line.partNumber, line.tap, line.studyId ?? quote.studyId, manager),
      })
    }
    const issuedOn = this.today()
    const validUntil = addDays(issuedOn, draft.validityDays)
    const issuer = await manager.findOneByOrFail(User, { id: user.id })

    // The PDF is written inside the transaction (the mail in the outbox names it); if the
    // transaction then fails, the file goes too, so no document exists for a revision that does not.
    let pdfWritten: string | undefined
    try {
      await this.issueInTransaction({ user, id, version, issuedOn, validUntil, issuer, lines, priced: priced.value, draft, onPdf: (file) => (pdfWritten = file) })
    } catch (error) {
      if (pdfWritten) rmSync(pdfWritten, { force: true })
      throw error
    }
    return this.get(user, id)
  }

  private async issueInTransaction(args: {
    user: SessionUser
    id: string
    version: number
    issuedOn: string
    validUntil: string
    issuer: User
    lines: RevisionLine[]
    priced: PricedQuote
    draft: QuoteDraft
    onPdf: (file: string) => void
  }): Promise<void> {
    const { user, id, version, issuedOn, validUntil, issuer, lines, draft, priced } = args
    await this.dataSource.transaction(async (tx) => {
      const locked = await this.load(tx, id, true)
      if (locked.version !== version) throw new ConflictError('Someone changed this quote after you opened it; reload to see their changes', 'stale_version')
      let number = locked.number
      if (!number) {
        const year = Number(issuedOn.slice(0, 4))
        await tx.query('INSERT IGNORE INTO quote_sequence (year, next) VALUES (?, 1)', [year])
        const row = await tx.findOne(QuoteSequence, { where: { year }, lock: { mode: 'pessimistic_write' } })
        const sequence = row?.next ?? 1
        await tx.update(QuoteSequence, { year }, { next: sequence + 1 })
        number = formatQuoteNumber({ year, sequence, revision: 'A' }).slice(0, -1)
      }
      const letter = locked.currentRevision ? nextRevision(locked.currentRevision) : 'A'
      const requester = locked.requestedBy
      const doc = buildDocument({ number, letter, issuedOn, validUntil, quote: locked, issuer, lines, priced, draft })
      const pdf = await this.deps.renderPdf(doc)
      const relative = path.join('quotes', `${randomUUID()}.pdf`)
      mkdirSync(path.join(this.deps.dataDir, 'quotes'), { recursive: true })
      writeFileSync(path.join(this.deps.dataDir, relative), pdf)
      args.onPdf(path.join(this.deps.dataDir, relative))
      await tx.insert(QuoteRevisionRecord, {
        quoteId: id,
        letter,
        fullNumber: `${number}${letter}`,
        issuedById: user.id,
        validUntil,
        total: priced.totals.total,
        depositAmount: priced.totals.depositAmount,
        document: doc,
        pdfFile: relative,
      })
      await tx.update(QuoteRecordEntity, { id }, { number, currentRevision: letter, state: 'issued', validUntil, version: locked.version + 1, currency: priced.currency })
      await this.audit(tx, user, id, 'issued', { revision: `${number}${letter}`, total: priced.totals.total })
      const recipients = [requester?.email, ...(await this.buyerEmails(tx, locked.organisationId))].filter((item): item is string => Boolean(item))
      if (recipients.length > 0) await this.deps.mailer.issued(tx, { doc, to: [...new Set(recipients)], pdfPath: relative, quoteId: id })
    })
  }

  private async buyerEmails(manager: EntityManager, organisationId: string): Promise<string[]> {
    const buyers = await manager.find(User, { where: { organisationId, role: 'buyer' }, select: { email: true, disabledAt: true } })
    return buyers.filter((buyer) => !buyer.disabledAt).map((buyer) => buyer.email)
  }

  /** The buyer accepts the current revision online, by name and purchase-order reference. */
  async accept(user: SessionUser, id: string, acceptance: Acceptance): Promise<QuoteRecord> {
    if (user.role !== 'buyer') throw new ForbiddenError('Only the customer’s buyer accepts a quote')
    await this.expireDue()
    await this.dataSource.transaction(async (tx) => {
      const quote = await this.load(tx, id, true)
      this.assertReadable(user, quote)
      if (quote.state !== 'issued') throw new ConflictError(quote.state === 'expired' ? 'This quote has expired; ask for a new revision' : `A quote that is ${quote.state} cannot be accepted`, 'not_acceptable')
      if (quote.currentRevision !== acceptance.revision) {
        throw new ConflictError(`Revision ${acceptance.revision} is no longer current; revision ${quote.currentRevision} replaced it. Review it before accepting`, 'revision_superseded')
      }
      const revision = await tx.findOneByOrFail(QuoteRevisionRecord, { quoteId: id, letter: acceptance.revision })
      if (revision.validUntil < this.today()) throw new ConflictError('This quote has expired; ask for a new revision', 'not_acceptable')
      await tx.insert(QuoteAcceptance, {
        quoteId: id,
        revisionId: revision.id,
        revision: revision.letter,
        acceptedById: user.id,
        acceptedByName: acceptance.acceptedByName,
        purchaseOrderRef: acceptance.purchaseOrderRef,
      })
      await tx.update(QuoteRecordEntity, { id }, { state: 'accepted', version: quote.version + 1 })
      await this.audit(tx, user, id, 'accepted', { revision: revision.fullNumber, purchaseOrderRef: acceptance.purchaseOrderRef })
      const to = [user.email, quote.salesEngineer?.email].filter((item): item is string => Boolean(item))
      await this.deps.mailer.accepted(tx, { doc: revision.document, to, acceptedByName: acceptance.acceptedByName, purchaseOrderRef: acceptance.purchaseOrderRef, quoteId: id })
    })
    return this.get(user, id)
  }

  async withdraw(user: SessionUser, id: string, reason: string, version: number): Promise<QuoteRecord> {
    await this.dataSource.transaction(async (tx) => {
      const quote = await this.load(tx, id, true)
      this.assertReadable(user, quote)
      if (quote.version !== version) throw new ConflictError('Someone changed this quote after you opened it; reload to see their changes', 'stale_version')
      const allowed: readonly QuoteState[] = isStaff(user) ? ['requested', 'drafting', 'issued', 'accepted'] : ['requested', 'issued']
      if (!allowed.includes(quote.state)) throw new ConflictError(`A quote that is ${quote.state} cannot be withdrawn`, 'not_withdrawable')
      await tx.update(QuoteRecordEntity, { id }, { state: 'withdrawn', withdrawnReason: reason, version: quote.version + 1 })
      await this.audit(tx, user, id, 'withdrawn', { reason })
    })
    return this.get(user, id)
  }

  /** Issued quotes past their validity become expired (run on reads and by the hourly job). */
  async expireDue(): Promise<number> {
    return this.expireDueOn(this.today())
  }

  async expireDueOn(today: string): Promise<number> {
    const result = await this.dataSource
      .createQueryBuilder()
      .update(QuoteRecordEntity)
      .set({ state: 'expired', version: () => 'version + 1' })
      .where('state = :state AND validUntil < :today', { state: 'issued', today })
      .execute()
    return result.affected ?? 0
  }

  /**
   * Reminds the buyers of issued quotes that expire within `daysBefore` days, once per revision
   * (the outbox row with kind quote-expiry-reminder and the revision's number marks it done).
   */
  async sendExpiryReminders(daysBefore = 5, today = this.today()): Promise<number> {
    const horizon = addDays(today, daysBefore)
    const due = await this.dataSource
      .getRepository(QuoteRecordEntity)
      .createQueryBuilder('quote')
      .where('quote.state = :state AND quote.validUntil >= :today AND quote.validUntil <= :horizon', { state: 'issued', today, horizon })
      .getMany()
    let sent = 0
    for (const quote of due) {
      await this.dataSource.transaction(async (tx) => {
        const revision = await tx.findOneBy(QuoteRevisionRecord, { quoteId: quote.id, letter: quote.currentRevision ?? '' })
        if (!revision || !this.deps.mailer.reminder) return
        const to = await this.buyerEmails(tx, quote.organisationId)
        const daysLeft = Math.round((Date.parse(revision.validUntil) - Date.parse(today)) / 86_400_000)
        if (to.length > 0 && (await this.deps.mailer.reminder(tx, { doc: revision.document, to, daysLeft, quoteId: quote.id }))) sent += 1
      })
    }
    return sent
  }

  private async audit(manager: EntityManager, user: SessionUser, quoteId: string, action: string, detail: Record<string, unknown>): Promise<void> {
    await manager.save(manager.create(AuditEntry, { actorId: user.id, actorEmail: user.email, entity: 'quote', entityId: quoteId, action, detail }))
  }
}
