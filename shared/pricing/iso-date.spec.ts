import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import {
  addDays,
  compareIsoDates,
  daysBetween,
  daysUntilExpiry,
  isExpiryReminderDue,
  isIsoDate,
  isQuoteExpired,
  isWithinValidity,
  quoteValidUntil,
  utcToday,
} from './iso-date'

describe('ISO dates', () => {
  it('accepts real calendar dates only (Gregorian leap rule)', () => {
    expect(isIsoDate('2028-02-29')).toBe(true)
    expect(isIsoDate('2026-02-29')).toBe(false)
    expect(isIsoDate('2100-02-29')).toBe(false) // divisible by 100, not by 400
    expect(isIsoDate('2000-02-29')).toBe(true)
    expect(isIsoDate('2026-13-01')).toBe(false)
    expect(isIsoDate('2026-3-1')).toBe(false)
    expect(isIsoDate('2026-03-01T00:00:00Z')).toBe(false)
  })

  it('adds days across month, year and leap-day boundaries', () => {
    expect(addDays('2026-01-31', 1)).toBe('2026-02-01')
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01')
    expect(addDays('2028-02-28', 1)).toBe('2028-02-29')
    expect(addDays('2026-03-01', -1)).toBe('2026-02-28')
  })

  it('is not moved by daylight-saving changes (UTC arithmetic)', () => {
    expect(daysBetween('2026-03-28', '2026-03-30')).toBe(2)
    expect(daysBetween('2026-10-24', '2026-10-26')).toBe(2)
  })

  it('adds and measures days consistently (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 3000 }), fc.integer({ min: -5000, max: 5000 }), (offset, days) => {
        const start = addDays('2020-01-01', offset)
        expect(daysBetween(start, addDays(start, days))).toBe(days)
        expect(compareIsoDates(addDays(start, days), start)).toBe(Math.sign(days) + 0)
      }),
    )
  })

  it('reads today in UTC from an instant', () => {
    expect(utcToday(new Date('2026-03-01T23:30:00-05:00'))).toBe('2026-03-02')
  })
})

describe('quote validity', () => {
  it('counts validity from the issue day: 30 days from 1 March is valid through 31 March', () => {
    expect(quoteValidUntil('2026-03-01', 30)).toBe('2026-03-31')
  })

  it('expires the day after validUntil, not on it', () => {
    expect(isQuoteExpired('2026-03-31', '2026-03-31')).toBe(false)
    expect(isQuoteExpired('2026-03-31', '2026-04-01')).toBe(true)
    expect(daysUntilExpiry('2026-03-31', '2026-03-24')).toBe(7)
  })

  it('makes a reminder due within the last N days of validity only', () => {
    expect(isExpiryReminderDue('2026-03-31', '2026-03-23', 7)).toBe(false)
    expect(isExpiryReminderDue('2026-03-31', '2026-03-24', 7)).toBe(true)
    expect(isExpiryReminderDue('2026-03-31', '2026-03-31', 7)).toBe(true)
    expect(isExpiryReminderDue('2026-03-31', '2026-04-01', 7)).toBe(false)
  })

  it('checks price-list validity inclusively and allows an open end', () => {
    expect(isWithinValidity('2026-06-30', '2026-01-01', '2026-06-30')).toBe(true)
    expect(isWithinValidity('2026-07-01', '2026-01-01', '2026-06-30')).toBe(false)
    expect(isWithinValidity('2030-01-01', '2026-01-01', null)).toBe(true)
  })

  it('refuses bad input loudly', () => {
    expect(() => addDays('2026-02-30', 1)).toThrow(RangeError)
    expect(() => quoteValidUntil('2026-03-01', -1)).toThrow(RangeError)
  })
})
