/**
 * Quote numbers: `SW-<year>-<5-digit sequence><revision letters>`, e.g. SW-2026-00042A.
 * The sequence restarts each year (allocating it uniquely is the server's job); revisions run
 * A, B ... Z, then AA, AB ... AZ, BA ... ZZ, AAA (bijective base 26, like spreadsheet columns).
 */

export interface QuoteNumber {
  year: number
  /** 1 ... 99 999 within the year. */
  sequence: number
  /** Upper-case letters, A for the first issued revision. */
  revision: string
}

export const MAX_QUOTE_SEQUENCE = 99_999
export const FIRST_REVISION = 'A'

const QUOTE_NUMBER = /^SW-(\d{4})-(\d{5})([A-Z]+)$/
const REVISION = /^[A-Z]+$/

/** 1 for A, 26 for Z, 27 for AA. */
export function revisionIndex(revision: string): number {
  if (!REVISION.test(revision)) throw new RangeError(`revision must be upper-case letters, got "${revision}"`)
  let index = 0
  for (const ch of revision) index = index * 26 + (ch.charCodeAt(0) - 64)
  return index
}

/** Inverse of {@link revisionIndex}: 1 -> A, 27 -> AA. */
export function revisionFromIndex(index: number): string {
  if (!Number.isSafeInteger(index) || index < 1) throw new RangeError(`revision index must be >= 1, got ${index}`)
  let letters = ''
  let n = index
  while (n > 0) {
    const rem = (n - 1) % 26
    letters = String.fromCharCode(65 + rem) + letters
    n = Math.floor((n - 1) / 26)
  }
  return letters
}

/** The revision after `revision`: A -> B, Z -> AA, AZ -> BA, ZZ -> AAA. */
export function nextRevision(revision: string): string {
  return revisionFromIndex(revisionIndex(revision) + 1)
}

export function formatQuoteNumber(number: QuoteNumber): string {
  const { year, sequence, revision } = number
  if (!Number.isInteger(year) || year < 1000 || year > 9999) throw new RangeError(`year must have four digits, got ${year}`)
  if (!Number.isInteger(sequence) || sequence < 1 || sequence > MAX_QUOTE_SEQUENCE) {
    throw new RangeError(`sequence must be 1 ... ${MAX_QUOTE_SEQUENCE}, got ${sequence}`)
  }
  revisionIndex(revision)
  return `SW-${year}-${String(sequence).padStart(5, '0')}${revision}`
}

/** Parses a quote number; null when the text is not one (lower case, wrong width, sequence 0 ...). */
export function parseQuoteNumber(text: string): QuoteNumber | null {
  const match = QUOTE_NUMBER.exec(text)
  if (!match || match[1] === undefined || match[2] === undefined || match[3] === undefined) return null
  const sequence = Number(match[2])
  if (sequence < 1) return null
  return { year: Number(match[1]), sequence, revision: match[3] }
}

/** The same quote with its next revision letter. */
export function nextRevisionNumber(number: QuoteNumber): QuoteNumber {
  return { ...number, revision: nextRevision(number.revision) }
}

/** Year, then sequence, then revision order (so B sorts before AA). Negative, 0 or positive. */
export function compareQuoteNumbers(a: QuoteNumber, b: QuoteNumber): number {
  return a.year - b.year || a.sequence - b.sequence || revisionIndex(a.revision) - revisionIndex(b.revision)
}

/** Whether two numbers name revisions of the same quote. */
export function isSameQuote(a: QuoteNumber, b: QuoteNumber): boolean {
  return a.year === b.year && a.sequence === b.sequence
}
