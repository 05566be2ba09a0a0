// Shared drawing kit for Spinwright's PDFs: page geometry (US Letter), embedded Roboto, colours,
// and small text helpers that never let pdfkit break pages on its own.
import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { inflateSync } from 'node:zlib'
import PDFDocument from 'pdfkit'

export type Pdf = PDFKit.PDFDocument

/** US Letter in points (8.5 x 11 in): the demo customers are in the US. */
export const PAGE = { width: 612, height: 792 } as const
export const MARGIN = { left: 50, right: 50, top: 46 } as const
export const CONTENT_LEFT = MARGIN.left
export const CONTENT_RIGHT = PAGE.width - MARGIN.right
export const CONTENT_WIDTH = CONTENT_RIGHT - CONTENT_LEFT
/** Lowest y any content block may reach; the footer lives below it. */
export const CONTENT_BOTTOM = PAGE.height - 58
export const FOOTER_Y = PAGE.height - 40

export const COLOURS = {
  teal: '#0b5d5e',
  copper: '#c8753a',
  ink: '#1f2a2b',
  muted: '#5b6b6c',
  rule: '#c9d6d5',
  tint: '#e8f3f2',
  grid: '#e3e9e8',
  white: '#ffffff',
} as const

export const FONT = { regular: 'Roboto', bold: 'Roboto-Bold' } as const
export type FontName = (typeof FONT)[keyof typeof FONT]

const require = createRequire(import.meta.url)
let fontCache: { regular: Buffer; bold: Buffer } | null = null

/**
 * Roboto from the @fontsource/roboto npm package (latin subset, WOFF). The WOFF is unpacked to a
 * plain TrueType file once per process: fontkit would otherwise inflate every table again for
 * every document, which was most of the render time.
 */
function robotoFiles(): { regular: Buffer; bold: Buffer } {
  if (fontCache === null) {
    fontCache = {
      regular: woffToSfnt(readFileSync(require.resolve('@fontsource/roboto/files/roboto-latin-400-normal.woff'))),
      bold: woffToSfnt(readFileSync(require.resolve('@fontsource/roboto/files/roboto-latin-700-normal.woff'))),
    }
  }
  return fontCache
}

/**
 * WOFF 1.0 to the sfnt (TrueType/OpenType) it wraps, per the W3C WOFF File Format 1.0
 * recommendation: a 44-byte header, 20-byte table entries (tag, offset, compLength, origLength,
 * origChecksum), each table zlib-compressed when compLength < origLength. Table order and
 * checksums are kept as the WOFF directory gives them (sorted by tag, as the format requires).
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.toString('latin1', 0, 4) !== 'wOFF') throw new Error('not a WOFF 1.0 font')
  const flavor = woff.readUInt32BE(4)
  const numTables = woff.readUInt16BE(12)
  const tables = Array.from({ length: numTables }, (_, i) => {
    const at = 44 + i * 20
    const offset = woff.readUInt32BE(at + 4)
    const compLength = woff.readUInt32BE(at + 8)
    const origLength = woff.readUInt32BE(at + 12)
    const raw = woff.subarray(offset, offset + compLength)
    return {
      tag: woff.readUInt32BE(at),
      checksum: woff.readUInt32BE(at + 16),
      data: compLength < origLength ? inflateSync(raw) : raw,
    }
  })
  let power = 1
  while (power * 2 <= numTables) power *= 2
  const headerLength = 12 + numTables * 16
  const padded = (n: number): number => (n + 3) & ~3
  const total = tables.reduce((sum, t) => sum + padded(t.data.length), headerLength)
  const out = Buffer.alloc(total)
  out.writeUInt32BE(flavor, 0)
  out.writeUInt16BE(numTables, 4)
  out.writeUInt16BE(power * 16, 6)
  out.writeUInt16BE(Math.log2(power), 8)
  out.writeUInt16BE(numTables * 16 - power * 16, 10)
  let offset = headerLength
  tables.forEach((t, i) => {
    const at = 12 + i * 16
    out.writeUInt32BE(t.tag, at)
    out.writeUInt32BE(t.checksum, at + 4)
    out.writeUInt32BE(offset, at + 8)
    out.writeUInt32BE(t.data.length, at + 12)
    t.data.copy(out, offset)
    offset += padded(t.data.length)
  })
  return out
}

export interface PdfInfo {
  title: string
  author: string
  subject: string
  keywords: string
  createdOn: Date
}

/**
 * A Letter document with buffered pages (so footers can say "page x of y" at the end) and Roboto
 * registered. The bottom margin is kept small so pdfkit never adds a page by itself: every block
 * checks CONTENT_BOTTOM first.
 */
export function createPdf(info: PdfInfo): Pdf {
  const doc = new PDFDocument({
    size: [PAGE.width, PAGE.height],
    margins: { top: MARGIN.top, bottom: 12, left: MARGIN.left, right: MARGIN.right },
    bufferPages: true,
    autoFirstPage: true,
    pdfVersion: '1.7',
    lang: 'en-US',
    displayTitle: true,
    info: {
      Title: info.title,
      Author: info.author,
      Subject: info.subject,
      Keywords: info.keywords,
      Creator: 'Spinwright',
      Producer: 'Spinwright (pdfkit)',
      CreationDate: info.createdOn,
    },
  })
  const fonts = robotoFiles()
  doc.registerFont(FONT.regular, fonts.regular)
  doc.registerFont(FONT.bold, fonts.bold)
  doc.font(FONT.regular)
  return doc
}

/** Collects the document's bytes; call before doc.end(). */
export function collect(doc: Pdf): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    doc.on('data', (chunk: Buffer) => chunks.push(chunk))
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })
}

export interface TextStyle {
  font?: FontName
  size?: number
  color?: string
}

export function style(doc: Pdf, s: TextStyle): Pdf {
  return doc
    .font(s.font ?? FONT.regular)
    .fontSize(s.size ?? 9)
    .fillColor(s.color ?? COLOURS.ink)
}

/** One line of text, never wrapped; `align` right or centre is measured here (pdfkit only aligns wrapped text). */
export function line(doc: Pdf, text: string, x: number, y: number, s: TextStyle & { align?: 'left' | 'right' | 'center'; width?: number } = {}): number {
  style(doc, s)
  const w = doc.widthOfString(text)
  let left = x
  if (s.align === 'right') left = x + (s.width ?? 0) - w
  else if (s.align === 'center') left = x + ((s.width ?? 0) - w) / 2
  doc.text(text, left, y, { lineBreak: false })
  return w
}

/** One line that shrinks its font (down to 6 pt) rather than run into the next column. */
export function fitLine(doc: Pdf, text: string, x: number, y: number, width: number, s: TextStyle & { align?: 'left' | 'right' } = {}): void {
  let size = s.size ?? 9
  doc.font(s.font ?? FONT.regular).fontSize(size)
  let w = doc.widthOfString(text)
  while (size > 6 && w > width) {
    size = Math.max(6, size * (width / w) - 0.05)
    doc.fontSize(size)
    w = doc.widthOfString(text)
  }
  line(doc, text, x, y, { ...s, size, width })
}

/** Wrapped text in a column; returns its height. */
export function para(doc: Pdf, text: string, x: number, y: number, width: number, s: TextStyle & { lineGap?: number } = {}): number {
  style(doc, s)
  const options = { width, lineGap: s.lineGap ?? 1 }
  const h = doc.heightOfString(text, options)
  doc.text(text, x, y, options)
  return h
}

/** Height the same call to {@link para} would take. */
export function paraHeight(doc: Pdf, text: string, width: number, s: TextStyle & { lineGap?: number } = {}): number {
  style(doc, s)
  return doc.heightOfString(text, { width, lineGap: s.lineGap ?? 1 })
}

export function hRule(doc: Pdf, y: number, color: string = COLOURS.rule, width = 0.6, x0: number = CONTENT_LEFT, x1: number = CONTENT_RIGHT): void {
  doc.save().moveTo(x0, y).lineTo(x1, y).lineWidth(width).strokeColor(color).stroke().restore()
}

/**
 * The Spinwright mark (public/spinwright-mark.svg, a 64-unit square) drawn with pdfkit paths so it
 * stays vector and needs no SVG renderer.
 */
export function drawMark(doc: Pdf, x: number, y: number, size: number): void {
  doc.save().translate(x, y).scale(size / 64)
  doc.circle(32, 32, 29).fill(COLOURS.teal)
  doc.circle(32, 32, 22).lineWidth(3).strokeColor(COLOURS.tint).stroke()
  doc.path('M32 6 A26 26 0 0 1 56.5 23').lineWidth(5).lineCap('round').strokeColor(COLOURS.copper).stroke()
  doc.fillColor(COLOURS.tint)
  doc.path('M32 32 C30 24 33 17 40 14 C38 21 37 27 32 32 Z').fill()
  doc.path('M32 32 C40 33 45 39 44 46 C38 42 34 38 32 32 Z').fill()
  doc.path('M32 32 C26 38 19 39 13 36 C19 32 25 30 32 32 Z').fill()
  doc.circle(32, 32, 3.5).fill(COLOURS.copper)
  doc.restore()
}
