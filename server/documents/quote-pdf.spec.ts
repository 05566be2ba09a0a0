import { PDFParse } from 'pdf-parse'
import { beforeAll, describe, expect, it } from 'vitest'
import type { QuoteDocument } from '../../shared/contracts/quote.contract'
import { fromSI } from '../../shared/engineering'
import { formatDeliveryTerm, formatMoney } from '../../shared/pricing'
import { woffToSfnt } from './pdf-kit'
import { sampleQuoteDocument, stressQuoteDocument } from './quote-fixture'
import { renderQuotePdf, SAFETY_CAUTIONS } from './quote-pdf'
import { niceAxis, torqueAt } from './torque-chart'
import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'

interface Extracted {
  bytes: Buffer
  /** Whole text with runs of whitespace folded to one space, so table cells can be matched. */
  text: string
  pages: string[]
}

async function extract(bytes: Buffer): Promise<Extracted> {
  const parser = new PDFParse({ data: new Uint8Array(bytes) })
  try {
    const result = await parser.getText()
    const fold = (s: string): string => s.replace(/\s+/g, ' ')
    return { bytes, text: fold(result.text), pages: result.pages.map((p) => fold(p.text)) }
  } finally {
    await parser.destroy()
  }
}

/** Rendering plus text extraction takes well under a second alone; shared CI cores can be slow. */
const SLOW_MACHINE_MS = 30_000

const money = (doc: QuoteDocument, minor: number): string => formatMoney(minor, doc.priced.currency, 'en-US')
const whole = new Intl.NumberFormat('en-US', { maximumFractionDigits: 0 })

describe('renderQuotePdf', () => {
  const doc = sampleQuoteDocument()
  let pdf: Extracted

  beforeAll(async () => {
    pdf = await extract(await renderQuotePdf(doc))
  }, SLOW_MACHINE_MS)

  it('writes a PDF file that embeds the Roboto font', () => {
    expect(pdf.bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-')
    // Font dictionaries are not compressed: the subset names read like "ABCDEF+Roboto-Regular".
    const raw = pdf.bytes.toString('latin1')
    expect(raw).toMatch(/\/BaseFont \/[A-Z]{6}\+Roboto-Regular/)
    expect(raw).toMatch(/\/BaseFont \/[A-Z]{6}\+Roboto-Bold/)
    expect(raw).toContain('/FontFile2')
  })

  it('sets the title, author and subject metadata', async () => {
    const parser = new PDFParse({ data: new Uint8Array(pdf.bytes) })
    try {
      const info = await parser.getInfo()
      expect(info.info?.Title).toBe('Quotation SW-2026-00042 rev B')
      expect(info.info?.Author).toBe('Ashcombe Motor Works')
      expect(String(info.info?.Subject)).toContain('Larkspur Air Appliances')
    } finally {
      await parser.destroy()
    }
  })

  it('carries the quote number with its revision, the maker and the customer', () => {
    expect(pdf.text).toContain('SW-2026-00042 rev B')
    expect(pdf.text).toContain('Ashcombe Motor Works')
    expect(pdf.text).toContain('Larkspur Air Appliances')
    expect(pdf.text).toContain('Valid until Apr 1, 2026')
  })

  it('lists every line by part number with its extended amount', () => {
    doc.lines.forEach((line, i) => {
      expect(pdf.text).toContain(line.partNumber)
      const priced = doc.priced.lines[i]
      if (priced === undefined) throw new Error('fixture line without pricing')
      expect(pdf.text).toContain(money(doc, priced.extendedAmount))
    })
  })

  it('states the total, the deposit with its percentage and the balance', () => {
    const { totals } = doc.priced
    expect(pdf.text).toContain(`Total (USD, excluding taxes) ${money(doc, totals.total)}`)
    expect(pdf.text).toContain(`Deposit (30 % of the total) ${money(doc, totals.depositAmount)}`)
    expect(pdf.text).toContain(`Balance ${money(doc, totals.balanceAmount)}`)
    expect(pdf.text).toMatch(/Prices exclude taxes/)
  })

  it('prints the operating point speeds and flows at nominal and low line', () => {
    const duty = doc.lines.flatMap((l) => (l.dutyPoint ? [l.dutyPoint] : []))
    expect(duty.length).toBeGreaterThan(0)
    for (const dp of duty) {
      for (const point of [dp.nominal, dp.lowLine]) {
        expect(pdf.text).toContain(`${whole.format(point.rpm)} r/min`)
        const m3h = fromSI(point.flowM3s, 'm3/h')
        const cfm = fromSI(point.flowM3s, 'CFM')
        // Whole m³/h from 100 up, one decimal below; CFM to one decimal.
        const m3hText = m3h >= 100 ? whole.format(m3h) : m3h.toFixed(1)
        expect(pdf.text).toContain(`${m3hText} m³/h (${cfm.toFixed(1)} CFM)`)
      }
    }
  })

  it('prints the Incoterms 2020 rule with its named place', () => {
    expect(pdf.text).toContain(formatDeliveryTerm({ rule: 'FCA', namedPlace: 'Ashcombe works, Bristol' }))
    expect(pdf.text).toContain('FCA Ashcombe works, Bristol, Incoterms 2020')
  })

  it('carries the safety and engineering cautions', () => {
    expect(pdf.text).toContain('Safety and engineering cautions')
    for (const caution of SAFETY_CAUTIONS) expect(pdf.text).toContain(caution.slice(0, 40))
    expect(pdf.text).toContain('Run capacitors can hold a dangerous charge')
    expect(pdf.text).toMatch(/IEC 60335-1/)
    expect(pdf.text).toMatch(/UL 507/)
    expect(pdf.text).toMatch(/UL 1004/)
  })

  it('numbers the pages "Page x of y"', () => {
    const n = pdf.pages.length
    pdf.pages.forEach((page, i) => expect(page).toContain(`Page ${i + 1} of ${n}`))
  })
})

describe('renderQuotePdf with 20 lines', () => {
  const doc = sampleQuoteDocument({ lineCount: 20 })
  let pdf: Extracted

  beforeAll(async () => {
    pdf = await extract(await renderQuotePdf(doc))
  }, SLOW_MACHINE_MS)

  it('runs over several pages, each with the continued header and page footer', () => {
    expect(pdf.pages.length).toBeGreaterThan(1)
    pdf.pages.slice(1).forEach((page) => {
      expect(page).toContain('Quotation SW-2026-00042 rev B for Larkspur Air Appliances')
    })
  })

  it('prints every line exactly once, in order', () => {
    const positions = doc.lines.map((line, i) => {
      const priced = doc.priced.lines[i]
      if (priced === undefined) throw new Error('fixture line without pricing')
      // "#  part number" opens each line's row.
      const at = pdf.text.indexOf(`${i + 1} ${line.partNumber}`)
      expect(at, `line ${i + 1}`).toBeGreaterThanOrEqual(0)
      return at
    })
    expect([...positions].sort((a, b) => a - b)).toEqual(positions)
  })

  it('puts the totals on the last page', () => {
    const last = pdf.pages.at(-1) ?? ''
    expect(last).toContain(`Total (USD, excluding taxes) ${money(doc, doc.priced.totals.total)}`)
    expect(last).toContain(money(doc, doc.priced.totals.depositAmount))
    const earlier = pdf.pages.slice(0, -1).join(' ')
    expect(earlier).not.toContain('Total (USD, excluding taxes)')
  })
})

describe('renderQuotePdf with awkward content', () => {
  it('wraps long names, prints eight-digit amounts and says when a motor does not start', async () => {
    const doc = stressQuoteDocument()
    const pdf = await extract(await renderQuotePdf(doc))
    expect(pdf.text).toContain('Larkspur Air Appliances International Holdings (North America) LLC')
    expect(pdf.text).toContain(money(doc, doc.priced.totals.total))
    expect(doc.priced.totals.total).toBeGreaterThan(100_000_000_00)
    expect(pdf.text).toContain('does not start')
    expect(pdf.text).toContain('Note 26:')
  }, SLOW_MACHINE_MS)
})

describe('torque chart helpers', () => {
  it('picks a nice axis covering the maximum with 1-2-2.5-5 steps', () => {
    expect(niceAxis(1800, 4)).toMatchObject({ max: 2000, step: 500 })
    expect(niceAxis(0.62, 4)).toMatchObject({ step: 0.2, decimals: 1 })
    expect(niceAxis(0.075, 4)).toMatchObject({ step: 0.02, decimals: 2 })
    expect(niceAxis(0.09, 4)).toMatchObject({ step: 0.025, decimals: 3 })
    expect(niceAxis(0, 4).max).toBeGreaterThan(0)
  })

  it('interpolates torque linearly between curve points and clamps at the ends', () => {
    const curve = [
      { rpm: 0, torqueNm: 0 },
      { rpm: 1000, torqueNm: 0.4 },
      { rpm: 2000, torqueNm: 0.2 },
    ]
    expect(torqueAt(curve, 500)).toBeCloseTo(0.2, 12)
    expect(torqueAt(curve, 1500)).toBeCloseTo(0.3, 12)
    expect(torqueAt(curve, 2500)).toBe(0.2)
    expect(torqueAt([], 10)).toBeNull()
  })
})

describe('woffToSfnt', () => {
  it('unpacks the Roboto WOFF into a TrueType file with the same tables', () => {
    const require = createRequire(import.meta.url)
    const woff = readFileSync(require.resolve('@fontsource/roboto/files/roboto-latin-400-normal.woff'))
    const sfnt = woffToSfnt(woff)
    // W3C WOFF 1.0: the header's totalSfntSize is the size of the unpacked font.
    expect(sfnt.length).toBe(woff.readUInt32BE(16))
    expect(sfnt.readUInt32BE(0)).toBe(woff.readUInt32BE(4))
    expect(sfnt.readUInt16BE(4)).toBe(woff.readUInt16BE(12))
  })
})
