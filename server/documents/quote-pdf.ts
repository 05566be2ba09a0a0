/**
 * The quote PDF a buyer's purchasing department files: drawn from a frozen QuoteDocument alone.
 *
 * Page: US Letter (the demo customers are in the US). Order: letterhead and parties, the quoted
 * items (each with its price build-up, quantity breaks and, where the line came from a duty study,
 * its operating point chart and figures), then totals, terms and the safety cautions kept together
 * on the last page. A line block never splits across pages; the items table header repeats on
 * every page it continues on. Money is only ever formatted by shared/pricing.
 */
import type { LineDutyPoint, QuoteDocument, RevisionLine } from '../../shared/contracts/quote.contract'
import { fromSI } from '../../shared/engineering'
import {
  formatBasisPoints,
  formatDeliveryTerm,
  formatMoney,
  INCOTERM_RULES,
  validateDeliveryTerm,
  type CurrencyCode,
  type PricedLine,
} from '../../shared/pricing'
import {
  collect,
  COLOURS,
  CONTENT_BOTTOM,
  CONTENT_LEFT,
  CONTENT_RIGHT,
  CONTENT_WIDTH,
  createPdf,
  drawMark,
  fitLine,
  FONT,
  FOOTER_Y,
  hRule,
  line,
  MARGIN,
  para,
  paraHeight,
  type Pdf,
} from './pdf-kit'
import { drawTorqueChart, rpmText } from './torque-chart'

/** Renders the quote revision as PDF bytes. */
export async function renderQuotePdf(doc: QuoteDocument): Promise<Buffer> {
  const ctx = makeContext(doc)
  const pdf = createPdf({
    title: `Quotation ${ctx.ref}`,
    author: doc.maker.name,
    subject: `Quotation ${ctx.ref} for ${doc.customer.name}: ${doc.lines.length} ${doc.lines.length === 1 ? 'line' : 'lines'}, total ${ctx.money(doc.priced.totals.total)} excluding taxes`,
    keywords: `quotation, ${doc.number}, rev ${doc.revision}, ${doc.customer.name}, Spinwright`,
    createdOn: new Date(`${doc.issuedOn}T00:00:00Z`),
  })
  const done = collect(pdf)
  const flow = new Flow(pdf, ctx)

  flow.y = drawLetterhead(pdf, ctx)
  flow.place(partiesBlock(pdf, ctx))
  flow.gap(14)

  const blocks = doc.lines.map((revisionLine, i) => lineBlock(pdf, ctx, revisionLine, doc.priced.lines[i] ?? null, i))
  const heading = sectionHeading(pdf, 'Quoted items')
  flow.ensure(heading.height + TABLE_HEADER_HEIGHT + (blocks[0]?.height ?? 0))
  flow.place(heading)
  flow.startTable()
  for (const block of blocks) flow.place(block)
  flow.endTable()

  // Totals, terms and cautions stay together so the last page carries the totals.
  const closing = [totalsBlock(pdf, ctx), termsBlock(pdf, ctx), safetyBlock(pdf)]
  const closingHeight = closing.reduce((sum, b) => sum + b.height + CLOSING_GAP, 0)
  flow.gap(10)
  if (closingHeight <= CONTENT_BOTTOM - MARGIN.top - CONTINUATION_HEIGHT) flow.ensure(closingHeight)
  for (const block of closing) {
    flow.place(block)
    flow.gap(CLOSING_GAP)
  }

  drawFooters(pdf, ctx)
  pdf.end()
  return done
}

// ---------------------------------------------------------------------------------------------
// Context: the document plus its formatters.

interface Ctx {
  doc: QuoteDocument
  ref: string
  currency: CurrencyCode
  money: (minor: number) => string
}

function makeContext(doc: QuoteDocument): Ctx {
  const currency = doc.priced.currency
  // formatMoney builds an Intl formatter per call; a quote repeats few distinct amounts.
  const formatted = new Map<number, string>()
  const money = (minor: number): string => {
    let text = formatted.get(minor)
    if (text === undefined) {
      text = formatMoney(minor, currency, 'en-US')
      formatted.set(minor, text)
    }
    return text
  }
  return { doc, ref: `${doc.number} rev ${doc.revision}`, currency, money }
}

const dateFormat = new Intl.DateTimeFormat('en-US', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' })
/** "Mar 2, 2026": month spelled out so no reader mistakes day and month. */
export function formatIsoDate(iso: string): string {
  const date = new Date(`${iso}T00:00:00Z`)
  return Number.isNaN(date.getTime()) ? iso : dateFormat.format(date)
}

const TIER_LABELS: Record<string, string> = { oem_contract: 'OEM contract', distributor: 'Distributor' }
const tierLabel = (tier: string): string => TIER_LABELS[tier] ?? tier.replace(/_/g, ' ')

const numberFormats = [0, 1, 2, 3].map((digits) => new Intl.NumberFormat('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits }))
const num = (value: number, digits: number): string => (numberFormats[digits] ?? new Intl.NumberFormat('en-US')).format(value)
const qty = (value: number): string => num(value, 0)
const percent = (bp: number): string => formatBasisPoints(bp, 'en-US').replace(/%$/, ' %')

// ---------------------------------------------------------------------------------------------
// Page flow: blocks measure themselves first, then draw at the y the flow gives them.

interface Block {
  height: number
  draw: (y: number) => void
}

const TABLE_HEADER_HEIGHT = 20
const CONTINUATION_HEIGHT = 30
const CLOSING_GAP = 12

class Flow {
  y: number = MARGIN.top
  private inTable = false

  constructor(
    private readonly pdf: Pdf,
    private readonly ctx: Ctx,
  ) {}

  ensure(height: number): void {
    if (this.y + height > CONTENT_BOTTOM) this.newPage()
  }

  place(block: Block): void {
    this.ensure(block.height)
    block.draw(this.y)
    this.y += block.height
  }

  gap(height: number): void {
    this.y = Math.min(this.y + height, CONTENT_BOTTOM)
  }

  startTable(): void {
    this.inTable = true
    drawTableHeader(this.pdf, this.y)
    this.y += TABLE_HEADER_HEIGHT
  }

  endTable(): void {
    this.inTable = false
  }

  private newPage(): void {
    this.pdf.addPage()
    this.y = drawContinuationStrip(this.pdf, this.ctx)
    if (this.inTable) {
      line(this.pdf, 'Quoted items (continued)', CONTENT_LEFT, this.y, { font: FONT.bold, size: 9, color: COLOURS.teal })
      this.y += 14
      drawTableHeader(this.pdf, this.y)
      this.y += TABLE_HEADER_HEIGHT
    }
  }
}

function drawContinuationStrip(pdf: Pdf, ctx: Ctx): number {
  const y = MARGIN.top
  drawMark(pdf, CONTENT_LEFT, y - 2, 14)
  const makerWidth = line(pdf, ctx.doc.maker.name, CONTENT_LEFT + 20, y, { font: FONT.bold, size: 8.5, color: COLOURS.teal })
  const rightX = CONTENT_LEFT + 20 + makerWidth + 24
  fitLine(pdf, `Quotation ${ctx.ref} for ${ctx.doc.customer.name}`, rightX, y, CONTENT_RIGHT - rightX, { size: 8.5, color: COLOURS.muted, align: 'right' })
  hRule(pdf, y + 16)
  return y + CONTINUATION_HEIGHT
}

function drawFooters(pdf: Pdf, ctx: Ctx): void {
  const range = pdf.bufferedPageRange()
  for (let i = range.start; i < range.start + range.count; i++) {
    pdf.switchToPage(i)
    hRule(pdf, FOOTER_Y - 6)
    line(pdf, `Spinwright · Quotation ${ctx.ref} · issued ${formatIsoDate(ctx.doc.issuedOn)} · valid until ${formatIsoDate(ctx.doc.validUntil)}`, CONTENT_LEFT, FOOTER_Y, {
      size: 7.5,
      color: COLOURS.muted,
    })
    line(pdf, `Page ${i - range.start + 1} of ${range.count}`, CONTENT_LEFT, FOOTER_Y, { size: 7.5, color: COLOURS.muted, align: 'right', width: CONTENT_WIDTH })
  }
}

function sectionHeading(pdf: Pdf, title: string): Block {
  return {
    height: 20,
    draw: (y) => {
      line(pdf, title, CONTENT_LEFT, y, { font: FONT.bold, size: 11, color: COLOURS.teal })
      hRule(pdf, y + 15, COLOURS.teal, 0.8)
    },
  }
}

// ---------------------------------------------------------------------------------------------
// Letterhead and parties.

function drawLetterhead(pdf: Pdf, ctx: Ctx): number {
  const { doc } = ctx
  const top = MARGIN.top
  drawMark(pdf, CONTENT_LEFT, top, 44)
  const tx = CONTENT_LEFT + 56
  line(pdf, doc.maker.name, tx, top, { font: FONT.bold, size: 15, color: COLOURS.teal })
  let ly = top + 20
  for (const addressLine of doc.maker.address) {
    line(pdf, addressLine, tx, ly, { size: 8, color: COLOURS.muted })
    ly += 10
  }
  line(pdf, doc.maker.email, tx, ly, { size: 8, color: COLOURS.muted })
  ly += 10

  const right = { x: CONTENT_LEFT, width: CONTENT_WIDTH, align: 'right' as const }
  line(pdf, 'Quotation', right.x, top - 2, { ...right, font: FONT.bold, size: 20 })
  line(pdf, ctx.ref, right.x, top + 23, { ...right, font: FONT.bold, size: 11, color: COLOURS.teal })
  line(pdf, `Issued ${formatIsoDate(doc.issuedOn)}`, right.x, top + 39, { ...right, size: 8.5 })
  line(pdf, `Valid until ${formatIsoDate(doc.validUntil)}`, right.x, top + 50, { ...right, size: 8.5 })
  const bottom = Math.max(ly, top + 62) + 6
  hRule(pdf, bottom, COLOURS.copper, 1.2)
  return bottom + 12
}

function partiesBlock(pdf: Pdf, ctx: Ctx): Block {
  const { doc } = ctx
  const { totals } = doc.priced
  const columns: { title: string; rows: { text: string; bold?: boolean }[] }[] = [
    {
      title: 'Prepared for',
      rows: [
        { text: doc.customer.name, bold: true },
        { text: `${tierLabel(doc.customer.tier)} account` },
        { text: `Attn. ${doc.customer.contactName}` },
        { text: doc.customer.contactEmail },
      ],
    },
    {
      title: 'Your sales engineer',
      rows: [{ text: doc.salesEngineer.name, bold: true }, { text: doc.salesEngineer.email }, { text: doc.maker.name }],
    },
    {
      title: 'At a glance',
      rows: [
        { text: `Total ${ctx.money(totals.total)} (${ctx.currency}, excl. taxes)`, bold: true },
        { text: `Deposit ${percent(totals.depositBp)}: ${ctx.money(totals.depositAmount)}` },
        { text: deliveryTermText(ctx) },
        { text: `Price list ${doc.priced.priceListId}` },
      ],
    },
  ]
  // The sales engineer's column holds short rows; the other two get the room.
  const widths = [0.36, 0.28, 0.36].map((share) => share * (CONTENT_WIDTH - 24))
  const colX = (i: number): number => CONTENT_LEFT + widths.slice(0, i).reduce((a, w) => a + w + 12, 0)
  // Rows wrap (a long organisation name takes two lines) and each column is measured.
  const rowStyle = (bold: boolean | undefined) => ({ font: bold ? FONT.bold : FONT.regular, size: 8.5, lineGap: 0.5 })
  const heights = columns.map((c, i) => c.rows.map((row) => paraHeight(pdf, row.text, widths[i] ?? 150, rowStyle(row.bold)) + 1))
  const height = 13 + Math.max(...heights.map((h) => h.reduce((a, b) => a + b, 0))) + 4
  return {
    height,
    draw: (y) => {
      columns.forEach((column, i) => {
        const x = colX(i)
        line(pdf, column.title.toUpperCase(), x, y, { font: FONT.bold, size: 7, color: COLOURS.muted })
        let ry = y + 13
        column.rows.forEach((row, r) => {
          para(pdf, row.text, x, ry, widths[i] ?? 150, rowStyle(row.bold))
          ry += heights[i]?.[r] ?? 11
        })
      })
    },
  }
}

function deliveryTermText(ctx: Ctx): string {
  const checked = validateDeliveryTerm({ rule: ctx.doc.terms.incoterm, namedPlace: ctx.doc.terms.incotermPlace })
  if (!checked.ok) return `${ctx.doc.terms.incoterm} ${ctx.doc.terms.incotermPlace}, Incoterms 2020`
  return formatDeliveryTerm(checked.value)
}

// ---------------------------------------------------------------------------------------------
// Quoted items.

const COLS = [
  { key: 'no', title: '#', x: 0, w: 16, align: 'left' },
  { key: 'part', title: 'Part number', x: 18, w: 102, align: 'left' },
  { key: 'name', title: 'Description', x: 124, w: 168, align: 'left' },
  { key: 'tap', title: 'Tap', x: 296, w: 34, align: 'left' },
  { key: 'qty', title: 'Quantity', x: 330, w: 48, align: 'right' },
  { key: 'unit', title: 'Unit net', x: 380, w: 62, align: 'right' },
  { key: 'ext', title: 'Extended', x: 444, w: 68, align: 'right' },
] as const
type ColKey = (typeof COLS)[number]['key']

function drawTableHeader(pdf: Pdf, y: number): void {
  for (const col of COLS) {
    line(pdf, col.title, CONTENT_LEFT + col.x, y + 4, { font: FONT.bold, size: 7.5, color: COLOURS.teal, align: col.align, width: col.w })
  }
  hRule(pdf, y + 15, COLOURS.teal, 0.6)
}

const ROW_SIZE = 8.5
const BUILD_SIZE = 7.5
const BUILD_ROW = 10.5
const DUTY_HEIGHT = 172
/** Extra space above the bold "unit net price" row, so its rule does not underline the row above. */
const STRONG_GAP = 3

function lineBlock(pdf: Pdf, ctx: Ctx, revisionLine: RevisionLine, priced: PricedLine | null, index: number): Block {
  const cells: Record<ColKey, string> = {
    no: String(index + 1),
    part: revisionLine.partNumber,
    name: revisionLine.name,
    tap: revisionLine.tap ?? '—',
    qty: qty(revisionLine.quantity),
    unit: priced ? ctx.money(priced.unitNetPrice) : '—',
    ext: priced ? ctx.money(priced.extendedAmount) : '—',
  }
  const wrapped: ColKey[] = ['part', 'name', 'tap']
  const cellHeight = (key: ColKey, w: number): number =>
    wrapped.includes(key) ? paraHeight(pdf, cells[key], w, { font: key === 'part' ? FONT.bold : FONT.regular, size: ROW_SIZE }) : 11
  const rowHeight = Math.max(...COLS.map((c) => cellHeight(c.key, c.w))) + 8

  const build = priced ? buildUpRows(ctx, revisionLine, priced) : []
  const breaks = breakRows(ctx, revisionLine, priced)
  const leftHeight = 12 + build.length * BUILD_ROW + STRONG_GAP
  const rightHeight = 12 + breaks.length * BUILD_ROW + 4 + BUILD_ROW
  const buildHeight = Math.max(leftHeight, rightHeight) + (revisionLine.dutyPoint ? 12 : 6)
  const dutyHeight = revisionLine.dutyPoint ? DUTY_HEIGHT : 0
  const height = rowHeight + buildHeight + dutyHeight + 8

  return {
    height,
    draw: (y) => {
      pdf.save().rect(CONTENT_LEFT, y, CONTENT_WIDTH, rowHeight).fill(COLOURS.tint).restore()
      for (const col of COLS) {
        const x = CONTENT_LEFT + col.x
        const font = col.key === 'part' || col.key === 'ext' ? FONT.bold : FONT.regular
        if (wrapped.includes(col.key)) para(pdf, cells[col.key], x, y + 4, col.w, { font, size: ROW_SIZE, lineGap: 0 })
        else fitLine(pdf, cells[col.key], x, y + 4, col.w, { font, size: ROW_SIZE, align: col.align })
      }

      // Price build-up (left) and quantity breaks (right).
      const by = y + rowHeight + 5
      const left = { x: CONTENT_LEFT + 18, w: 262 }
      line(pdf, 'PRICE BUILD-UP PER UNIT', left.x, by, { font: FONT.bold, size: 6.5, color: COLOURS.muted })
      build.forEach((row, r) => {
        const ry = by + 12 + r * BUILD_ROW + (row.strong ? STRONG_GAP : 0)
        const font = row.strong ? FONT.bold : FONT.regular
        if (row.strong) hRule(pdf, ry - 2.5, COLOURS.rule, 0.5, left.x, left.x + left.w)
        fitLine(pdf, row.label, left.x, ry, left.w - 62, { font, size: BUILD_SIZE })
        fitLine(pdf, row.value, left.x + left.w - 60, ry, 60, { font, size: BUILD_SIZE, align: 'right' })
      })

      const right = { x: CONTENT_LEFT + 312, w: 200 }
      line(pdf, 'QUANTITY BREAKS (UNIT PRICE BEFORE DISCOUNT)', right.x, by, { font: FONT.bold, size: 6.5, color: COLOURS.muted })
      breaks.forEach((row, r) => {
        const ry = by + 12 + r * BUILD_ROW
        const style = row.applied ? { font: FONT.bold, color: COLOURS.teal } : { font: FONT.regular, color: COLOURS.ink }
        line(pdf, row.label, right.x, ry, { ...style, size: BUILD_SIZE })
        if (row.applied) line(pdf, 'applied', right.x + 70, ry, { ...style, size: BUILD_SIZE })
        line(pdf, row.value, right.x, ry, { ...style, size: BUILD_SIZE, align: 'right', width: 150 })
      })
      const my = by + 12 + breaks.length * BUILD_ROW + 4
      line(pdf, `MOQ ${qty(revisionLine.moq)} pcs  ·  Lead time ${revisionLine.leadTimeDays} days`, right.x, my, { size: BUILD_SIZE, color: COLOURS.muted })

      if (revisionLine.dutyPoint) drawDutySection(pdf, revisionLine.dutyPoint, y + rowHeight + buildHeight)
      hRule(pdf, y + height - 4, COLOURS.rule, 0.4)
    },
  }
}

interface BuildRow {
  label: string
  value: string
  strong?: boolean
}

function buildUpRows(ctx: Ctx, revisionLine: RevisionLine, priced: PricedLine): BuildRow[] {
  const rows: BuildRow[] = [{ label: 'List price', value: ctx.money(priced.listUnitPrice) }]
  rows.push(
    priced.appliedBreak
      ? { label: `Quantity break ${qty(priced.appliedBreak.minQuantity)}+ applied`, value: ctx.money(priced.breakUnitPrice) }
      : { label: `No quantity break at ${qty(priced.quantity)} pcs`, value: ctx.money(priced.breakUnitPrice) },
  )
  if (priced.discountBp > 0) {
    const source =
      priced.discountSource === 'tier'
        ? `${tierLabel(ctx.doc.customer.tier)} tier`
        : priced.discountSource === 'account_override'
          ? 'account terms'
          : 'part-specific terms'
    const parts = [`${percent(priced.customerDiscountBp)} ${source}`]
    if (priced.extraDiscountBp > 0) parts.push(`${percent(priced.extraDiscountBp)} sales`)
    rows.push({ label: `Discount ${percent(priced.discountBp)} (${parts.join(' + ')})`, value: `−${ctx.money(priced.discountPerUnit)}` })
  } else {
    rows.push({ label: 'Discount', value: 'none' })
  }
  const pricedOptions = new Map(priced.options.map((o) => [o.code, o]))
  for (const option of revisionLine.options) {
    const detail = pricedOptions.get(option.code)
    const length = detail?.lengthMm != null ? ` ${qty(detail.lengthMm)} mm` : ''
    rows.push({ label: `Option ${option.code}: ${option.label}${length}`, value: `+${ctx.money(option.perUnit)}` })
  }
  const copper = priced.copper
  if (copper.copperMassGrams === 0) rows.push({ label: 'Copper surcharge (no copper)', value: ctx.money(0) })
  else if (copper.floored) rows.push({ label: `Copper surcharge: ${qty(copper.copperMassGrams)} g, index below base`, value: ctx.money(priced.copperPerUnit) })
  else {
    const sign = priced.copperPerUnit < 0 ? '−' : '+'
    rows.push({
      label: `Copper surcharge: ${qty(copper.copperMassGrams)} g × ${ctx.money(copper.deltaPerKg)}/kg over base`,
      value: `${sign}${ctx.money(Math.abs(priced.copperPerUnit))}`,
    })
  }
  rows.push({ label: `Unit net price`, value: ctx.money(priced.unitNetPrice), strong: true })
  return rows
}

function breakRows(ctx: Ctx, revisionLine: RevisionLine, priced: PricedLine | null): { label: string; value: string; applied: boolean }[] {
  const listPrice = priced?.listUnitPrice
  const rows: { label: string; value: string; applied: boolean }[] = []
  if (listPrice !== undefined) {
    rows.push({ label: `${qty(revisionLine.moq)}+ (list)`, value: ctx.money(listPrice), applied: priced !== null && priced.appliedBreak === null })
  }
  for (const b of [...revisionLine.breaks].sort((a, c) => a.minQuantity - c.minQuantity)) {
    rows.push({ label: `${qty(b.minQuantity)}+`, value: ctx.money(b.unitPrice), applied: priced?.appliedBreak?.minQuantity === b.minQuantity })
  }
  return rows
}

// ---------------------------------------------------------------------------------------------
// Operating point of a line: chart and figures.

const flowText = (m3s: number): string => {
  const m3h = fromSI(m3s, 'm3/h')
  return `${num(m3h, m3h >= 100 ? 0 : 1)} m³/h (${num(fromSI(m3s, 'CFM'), 1)} CFM)`
}
const pressureText = (pa: number): string => `${num(pa, pa >= 100 ? 0 : 1)} Pa (${num(fromSI(pa, 'inH2O'), 3)} inH2O)`
const STATUS_TEXT: Record<string, string> = { running: 'running', 'no-start': 'does not start', stall: 'stalls', stalled: 'stalls' }
const statusText = (status: string): string => STATUS_TEXT[status] ?? status
const wattsText = (w: number | null): string => (w === null ? '—' : `${num(w, 1)} W`)
const ampsText = (a: number | null): string => (a === null ? '—' : `${num(a, a < 0.1 ? 3 : 2)} A`)

function drawDutySection(pdf: Pdf, dp: LineDutyPoint, y: number): void {
  const x0 = CONTENT_LEFT + 18
  line(pdf, 'OPERATING POINT AT THE BUYER’S DUTY', x0, y, { font: FONT.bold, size: 6.5, color: COLOURS.muted })
  fitLine(pdf, `Duty study: ${dp.studyName}`, x0 + 150, y - 0.5, CONTENT_RIGHT - x0 - 150, { font: FONT.regular, size: 7, color: COLOURS.muted })
  drawTorqueChart(pdf, { x: x0, y: y + 12, w: 214, h: 152 }, dp)

  const fx = x0 + 232
  const fw = CONTENT_RIGHT - fx
  const labelW = 74
  const colW = (fw - labelW) / 2
  let fy = y + 14
  const kv = (label: string, value: string): void => {
    line(pdf, label, fx, fy, { size: 7.5, color: COLOURS.muted })
    fitLine(pdf, value, fx + labelW, fy, fw - labelW, { font: FONT.regular, size: 7.5 })
    fy += 11
  }
  kv('Supply', `${dp.supply.volts} V ${dp.supply.hz} Hz (low line ${dp.lowLine.volts} V)`)
  kv('Duty flow', flowText(dp.duty.flowM3s))
  kv('Duty pressure', `${pressureText(dp.duty.staticPa)} static`)
  fy += 3
  pdf.save().rect(fx, fy - 2, fw, 13).fill(COLOURS.tint).restore()
  line(pdf, 'Achieved', fx + 3, fy + 1, { font: FONT.bold, size: 7.5 })
  line(pdf, `At ${dp.supply.volts} V`, fx + labelW, fy + 1, { font: FONT.bold, size: 7.5 })
  line(pdf, `Low line ${dp.lowLine.volts} V`, fx + labelW + colW, fy + 1, { font: FONT.bold, size: 7.5 })
  fy += 14
  const row = (label: string, nominal: string, low: string): void => {
    line(pdf, label, fx + 3, fy, { size: 7.5, color: COLOURS.muted })
    fitLine(pdf, nominal, fx + labelW, fy, colW - 6, { font: FONT.regular, size: 7.5 })
    fitLine(pdf, low, fx + labelW + colW, fy, colW - 6, { font: FONT.regular, size: 7.5 })
    fy += 10.5
  }
  row('Speed', rpmText(dp.nominal.rpm), rpmText(dp.lowLine.rpm))
  row('Flow', flowText(dp.nominal.flowM3s), flowText(dp.lowLine.flowM3s))
  row('Static pressure', pressureText(dp.nominal.staticPa), pressureText(dp.lowLine.staticPa))
  row('Input power', wattsText(dp.nominal.inputW), wattsText(dp.lowLine.inputW))
  row('Current', ampsText(dp.nominal.currentA), ampsText(dp.lowLine.currentA))
  row('Efficiency', dp.nominal.efficiency === null ? '—' : `${num(dp.nominal.efficiency * 100, 0)} %`, '—')
  row('State', statusText(dp.nominal.status), statusText(dp.lowLine.status))
  hRule(pdf, fy, COLOURS.rule, 0.5, fx, CONTENT_RIGHT)
  fy += 5
  line(pdf, 'Meets the duty', fx + 3, fy, { font: FONT.bold, size: 8 })
  line(pdf, dp.meetsDuty ? 'Yes' : 'No', fx + labelW, fy, { font: FONT.bold, size: 8, color: dp.meetsDuty ? COLOURS.teal : COLOURS.copper })
  fy += 13
  para(
    pdf,
    'Operating points are engineering estimates from catalogue data; qualify them in the appliance.',
    fx + 3,
    fy,
    fw - 3,
    { size: 6.5, color: COLOURS.muted, lineGap: 0 },
  )
}

// ---------------------------------------------------------------------------------------------
// Totals, terms, cautions.

function totalsBlock(pdf: Pdf, ctx: Ctx): Block {
  const { totals, nre } = ctx.doc.priced
  const rows: { label: string; value: string; strong?: boolean; rule?: boolean }[] = [
    { label: `Subtotal, ${ctx.doc.lines.length} ${ctx.doc.lines.length === 1 ? 'line' : 'lines'}`, value: ctx.money(totals.subtotal) },
  ]
  for (const charge of nre) rows.push({ label: `NRE: ${charge.description}`, value: ctx.money(charge.amount) })
  if (nre.length > 1) rows.push({ label: 'NRE total', value: ctx.money(totals.nreTotal) })
  rows.push({ label: `Total (${ctx.currency}, excluding taxes)`, value: ctx.money(totals.total), strong: true, rule: true })
  rows.push({ label: `Deposit (${percent(totals.depositBp)} of the total)`, value: ctx.money(totals.depositAmount) })
  rows.push({ label: 'Balance', value: ctx.money(totals.balanceAmount) })
  const currencyName = new Intl.DisplayNames(['en'], { type: 'currency' }).of(ctx.currency) ?? ctx.currency
  const note = `All amounts are in ${ctx.currency} (${currencyName}). Prices exclude taxes (sales tax, VAT), which are added to the invoice where they apply.`
  const rowH = 13
  const heading = 20
  const noteWidth = 170
  const tableX = CONTENT_LEFT + noteWidth + 24
  const tableW = CONTENT_RIGHT - tableX
  const height = heading + Math.max(rows.length * rowH + 4, paraHeight(pdf, note, noteWidth, { size: 7.5 }))
  return {
    height,
    draw: (y) => {
      sectionHeading(pdf, 'Totals').draw(y)
      para(pdf, note, CONTENT_LEFT, y + heading + 2, noteWidth, { size: 7.5, color: COLOURS.muted })
      rows.forEach((row, i) => {
        const ry = y + heading + 2 + i * rowH
        if (row.rule) {
          pdf.save().rect(tableX, ry - 3, tableW, rowH).fill(COLOURS.tint).restore()
        }
        const font = row.strong ? FONT.bold : FONT.regular
        fitLine(pdf, row.label, tableX + 4, ry, tableW - 96, { font, size: row.strong ? 9 : 8.5, color: row.strong ? COLOURS.teal : COLOURS.ink })
        fitLine(pdf, row.value, tableX + tableW - 94, ry, 90, { font, size: row.strong ? 9 : 8.5, color: row.strong ? COLOURS.teal : COLOURS.ink, align: 'right' })
      })
    },
  }
}

function termsBlock(pdf: Pdf, ctx: Ctx): Block {
  const { doc } = ctx
  const checked = validateDeliveryTerm({ rule: doc.terms.incoterm, namedPlace: doc.terms.incotermPlace })
  const ruleInfo = checked.ok ? INCOTERM_RULES[checked.value.rule] : null
  const delivery = ruleInfo ? `${deliveryTermText(ctx)} (${ruleInfo.name}; the named place is the ${ruleInfo.namedPlace})` : deliveryTermText(ctx)
  const base = doc.copperIndex.baseValuePerKg
  const value = doc.copperIndex.valuePerKg
  const copper =
    `Index ${ctx.money(value)} per kg of copper, stamped ${formatIsoDate(doc.copperIndex.stampedOn)}, against the price list base of ${ctx.money(base)} per kg. ` +
    `Each line carries copper mass × (index − base), per unit${value < base ? '; below base no surcharge is charged unless the price list grants a credit' : ''}. ` +
    'The index is fixed for this revision.'
  const rows: [string, string][] = [
    ['Delivery', delivery],
    ['Payment', doc.terms.paymentTerms],
    ['Deposit', `${percent(doc.terms.depositBp)} of the total (${ctx.money(doc.priced.totals.depositAmount)}), paid online after acceptance; the first lot is released on receipt.`],
    ['Validity', `Valid until ${formatIsoDate(doc.validUntil)} (issued ${formatIsoDate(doc.issuedOn)}). Prices, copper index and operating points are those of revision ${doc.revision}.`],
    ['Lead time', `As stated per line, up to ${doc.priced.leadTimeDays} days.`],
    ['Copper surcharge', copper],
  ]
  if (doc.terms.notes.trim() !== '') rows.push(['Notes', doc.terms.notes.trim()])
  const labelW = 86
  const textW = CONTENT_WIDTH - labelW
  const heights = rows.map(([, text]) => paraHeight(pdf, text, textW, { size: 8 }) + 4)
  const heading = 20
  return {
    height: heading + heights.reduce((a, b) => a + b, 0),
    draw: (y) => {
      sectionHeading(pdf, 'Terms').draw(y)
      let ry = y + heading + 1
      rows.forEach(([label, text], i) => {
        line(pdf, label, CONTENT_LEFT, ry, { font: FONT.bold, size: 8, color: COLOURS.muted })
        para(pdf, text, CONTENT_LEFT + labelW, ry, textW, { size: 8 })
        ry += heights[i] ?? 12
      })
    },
  }
}

/** Our own wording of the cautions in DESIGN.md "Safety". */
export const SAFETY_CAUTIONS: readonly string[] = [
  'Mains voltage: install, connect and service these motors only with the supply isolated; terminals and leads are live when connected.',
  'Run capacitors can hold a dangerous charge after the supply is removed: discharge them before touching terminals.',
  'Guard rotating impellers and blades so fingers and objects cannot reach them; do not run a motor with its guard off.',
  'Motor frames and windings get hot in service; keep them clear of combustibles and of people.',
  'An automatic-reset thermal protector restarts the motor without warning once it cools: isolate the supply before any work.',
  'Operating points on this quotation are engineering estimates from catalogue data and the duty study; qualify each motor in the appliance (temperature rise, starting at low line, noise).',
  'The appliance safety standard governs the finished product (IEC 60335-1 with its fan part IEC 60335-2-80, UL 507); the motor standards (UL 1004, IEC 60034), local electrical codes and licensed practice take precedence over anything here.',
]

function safetyBlock(pdf: Pdf): Block {
  const textX = CONTENT_LEFT + 20
  const textW = CONTENT_RIGHT - textX - 10
  const heights = SAFETY_CAUTIONS.map((c) => paraHeight(pdf, c, textW, { size: 7.5 }) + 2.5)
  const height = 26 + heights.reduce((a, b) => a + b, 0) + 6
  return {
    height,
    draw: (y) => {
      pdf.save().rect(CONTENT_LEFT, y, CONTENT_WIDTH, height).lineWidth(0.7).strokeColor(COLOURS.copper).stroke().restore()
      pdf.save().rect(CONTENT_LEFT, y, 4, height).fill(COLOURS.copper).restore()
      line(pdf, 'Safety and engineering cautions', CONTENT_LEFT + 12, y + 9, { font: FONT.bold, size: 9.5, color: COLOURS.copper })
      let ry = y + 26
      SAFETY_CAUTIONS.forEach((caution, i) => {
        pdf.save().circle(textX - 6, ry + 4, 1.3).fill(COLOURS.ink).restore()
        para(pdf, caution, textX, ry, textW, { size: 7.5 })
        ry += heights[i] ?? 10
      })
    },
  }
}
