/**
 * Calendar dates as ISO 8601 strings (YYYY-MM-DD), interpreted in UTC with no time of day, and
 * the quote validity rules built on them. A quote is valid through its `validUntil` date
 * inclusive and expired from the next day on.
 */

/** A calendar date `YYYY-MM-DD`; checked by {@link parseIsoDate}. */
export type IsoDate = string

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/
const MS_PER_DAY = 86_400_000

/** Day number since 1970-01-01 (UTC) of a real calendar date, or null when it is not one (2026-02-30). */
export function parseIsoDate(date: string): number | null {
  const match = ISO_DATE.exec(date)
  if (!match) return null
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])]
  const ms = Date.UTC(year, month - 1, day)
  const check = new Date(ms)
  if (check.getUTCFullYear() !== year || check.getUTCMonth() !== month - 1 || check.getUTCDate() !== day) return null
  return ms / MS_PER_DAY
}

export function isIsoDate(date: string): boolean {
  return parseIsoDate(date) !== null
}

function dayNumber(date: IsoDate): number {
  const n = parseIsoDate(date)
  if (n === null) throw new RangeError(`not an ISO calendar date (YYYY-MM-DD): ${date}`)
  return n
}

function fromDayNumber(day: number): IsoDate {
  return new Date(day * MS_PER_DAY).toISOString().slice(0, 10)
}

/** The date `days` calendar days after (or before, if negative) `date`. */
export function addDays(date: IsoDate, days: number): IsoDate {
  if (!Number.isSafeInteger(days)) throw new RangeError(`days must be an integer, got ${days}`)
  return fromDayNumber(dayNumber(date) + days)
}

/** Whole days from `from` to `to` (positive when `to` is later). */
export function daysBetween(from: IsoDate, to: IsoDate): number {
  return dayNumber(to) - dayNumber(from)
}

/** -1, 0 or 1 as `a` is before, equal to or after `b`. */
export function compareIsoDates(a: IsoDate, b: IsoDate): -1 | 0 | 1 {
  const d = dayNumber(a) - dayNumber(b)
  return d < 0 ? -1 : d > 0 ? 1 : 0
}

/** Today's date in UTC from an instant (defaults to now); the one place a clock is read. */
export function utcToday(now: Date = new Date()): IsoDate {
  return now.toISOString().slice(0, 10)
}

/**
 * Last day a quote issued on `issuedOn` with `validityDays` of validity can be accepted:
 * issued 2026-03-01 with 30 days is valid through 2026-03-31 (day 0 is the issue day).
 */
export function quoteValidUntil(issuedOn: IsoDate, validityDays: number): IsoDate {
  if (!Number.isSafeInteger(validityDays) || validityDays < 0) throw new RangeError(`validity days must be a non-negative integer, got ${validityDays}`)
  return addDays(issuedOn, validityDays)
}

/** True from the day after `validUntil`. */
export function isQuoteExpired(validUntil: IsoDate, onDate: IsoDate): boolean {
  return compareIsoDates(onDate, validUntil) > 0
}

/** Days left to accept (0 on the last day, negative once expired). */
export function daysUntilExpiry(validUntil: IsoDate, onDate: IsoDate): number {
  return daysBetween(onDate, validUntil)
}

/**
 * Whether an expiry reminder is due: on the date that is `daysBefore` days ahead of expiry, or
 * any later day up to and including the last day of validity.
 */
export function isExpiryReminderDue(validUntil: IsoDate, onDate: IsoDate, daysBefore: number): boolean {
  const left = daysUntilExpiry(validUntil, onDate)
  return left >= 0 && left <= daysBefore
}

/** Whether `date` falls inside [validFrom, validTo] inclusive; a null `validTo` is open-ended. */
export function isWithinValidity(date: IsoDate, validFrom: IsoDate, validTo: IsoDate | null): boolean {
  return compareIsoDates(date, validFrom) >= 0 && (validTo === null || compareIsoDates(date, validTo) <= 0)
}
