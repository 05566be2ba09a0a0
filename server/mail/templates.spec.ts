import { describe, expect, it } from 'vitest'
import { formatMoney } from '../../shared/pricing'
import {
  depositReceivedMail,
  escapeHtml,
  expiryReminderMail,
  formatDate,
  formatInstant,
  portalUrlFrom,
  quoteAcceptedMail,
  quoteIssuedMail,
  type QuoteMailContext,
} from './templates'

const context: QuoteMailContext = {
  portalUrl: 'https://portal.ashcombe.test/',
  quoteId: '0b4c3c1e-8f1e-4c7e-9a57-4d1d2f0a9e11',
  quoteNumber: 'SW-2031-00042B',
  revision: 'B',
  customerName: 'Larkspur Air Appliances',
  buyer: { name: 'Dana Whitlow', email: 'buyer@larkspur.test' },
  salesEngineer: { name: 'Rhys Okafor', email: 'sales@ashcombe.test' },
  currency: 'USD',
}
const link = 'https://portal.ashcombe.test/quotes/0b4c3c1e-8f1e-4c7e-9a57-4d1d2f0a9e11'

describe('quoteIssuedMail', () => {
  const mail = quoteIssuedMail({
    ...context,
    validUntil: '2031-03-12',
    total: 1_234_550,
    depositAmount: 370_365,
    depositBp: 3000,
    incoterms: 'FCA Ashcombe works',
    pdf: { path: 'quotes/SW-2031-00042B.pdf' },
  })

  it('goes to the buyer with the sales engineer in copy, about the quote by id', () => {
    expect(mail).toMatchObject({ kind: 'quote-issued', reference: context.quoteId, to: ['buyer@larkspur.test'], cc: ['sales@ashcombe.test'] })
    expect(mail.subject).toContain('SW-2031-00042B')
  })

  it('states number, revision, totals through formatMoney, validity and the portal link in text and HTML', () => {
    for (const body of [mail.text, mail.html ?? '']) {
      expect(body).toContain('SW-2031-00042B (revision B)')
      expect(body).toContain(formatMoney(1_234_550, 'USD'))
      expect(body).toContain(formatMoney(370_365, 'USD'))
      expect(body).toContain('12 March 2031')
      expect(body).toContain(link)
    }
    expect(mail.text).toContain('US$12,345.50')
  })

  it('attaches the stored PDF by its path under the data directory', () => {
    expect(mail.attachments).toEqual([{ filename: 'SW-2031-00042B.pdf', contentType: 'application/pdf', path: 'quotes/SW-2031-00042B.pdf' }])
  })
})

describe('quoteAcceptedMail', () => {
  it('goes to both the sales engineer and the buyer and names the purchase order', () => {
    const mail = quoteAcceptedMail({
      ...context,
      acceptedByName: 'Dana Whitlow',
      purchaseOrderRef: 'PO-77812',
      acceptedAt: '2031-02-20T09:30:00.000Z',
      total: 1_234_550,
      depositAmount: 370_365,
    })
    expect(mail.to).toEqual(['sales@ashcombe.test', 'buyer@larkspur.test'])
    expect(mail.kind).toBe('quote-accepted')
    expect(mail.text).toContain('PO-77812')
    expect(mail.text).toContain('20 February 2031 at 09:30 UTC')
    expect(mail.text).toContain(`Pay the deposit: ${link}`)
    expect(mail.attachments).toEqual([])
  })
})

describe('depositReceivedMail', () => {
  it('is a receipt with the amount, payment reference, order and balance', () => {
    const mail = depositReceivedMail({
      ...context,
      currency: 'JPY',
      amount: 45_000,
      balance: 105_000,
      paidAt: new Date('2031-02-21T16:00:00Z'),
      paymentReference: 'pi_test_123',
      orderNumber: 'SO-2031-0007',
      pdf: { path: 'quotes/x.pdf', filename: 'quote.pdf' },
    })
    expect(mail.kind).toBe('deposit-received')
    expect(mail.text).toContain(formatMoney(45_000, 'JPY'))
    expect(mail.text).toContain(formatMoney(105_000, 'JPY'))
    expect(mail.text).toContain('pi_test_123')
    expect(mail.text).toContain('SO-2031-0007')
    expect(mail.attachments?.[0]?.filename).toBe('quote.pdf')
  })
})

describe('expiryReminderMail', () => {
  it('says how long is left in the subject', () => {
    const base = { ...context, validUntil: '2031-03-12', total: 100 }
    expect(expiryReminderMail({ ...base, daysLeft: 3 }).subject).toBe('Quote SW-2031-00042B expires in 3 days')
    expect(expiryReminderMail({ ...base, daysLeft: 1 }).subject).toBe('Quote SW-2031-00042B expires tomorrow')
    expect(expiryReminderMail({ ...base, daysLeft: 0 }).subject).toBe('Quote SW-2031-00042B expires today')
  })
})

describe('template safety and helpers', () => {
  it('escapes names in the HTML body', () => {
    const mail = quoteAcceptedMail({
      ...context,
      acceptedByName: '<script>alert(1)</script>',
      purchaseOrderRef: 'A&B',
      acceptedAt: new Date('2031-02-20T09:30:00Z'),
      total: 1,
      depositAmount: 0,
    })
    expect(mail.html).not.toContain('<script>')
    expect(mail.html).toContain('&#60;script&#62;')
    expect(mail.html).toContain('A&#38;B')
  })

  it('refuses an unknown currency rather than printing a wrong amount', () => {
    expect(() => expiryReminderMail({ ...context, currency: 'XXQ', validUntil: '2031-03-12', daysLeft: 2, total: 1 })).toThrow(/currency/)
  })

  it('formats calendar dates and instants in UTC', () => {
    expect(formatDate('2031-01-05')).toBe('5 January 2031')
    expect(formatInstant('2031-01-05T23:59:00Z')).toBe('5 January 2031 at 23:59 UTC')
    expect(() => formatDate('2031-02-30')).toThrow(RangeError)
    expect(escapeHtml(`"'`)).toBe('&#34;&#39;')
  })

  it('takes the portal address from PUBLIC_URL, else from where the server listens', () => {
    expect(portalUrlFrom({ PUBLIC_URL: 'https://portal.example.test/', HOST: '127.0.0.1', PORT: 8080 })).toBe('https://portal.example.test')
    expect(portalUrlFrom({ PUBLIC_URL: undefined, HOST: '127.0.0.1', PORT: 8080 })).toBe('http://127.0.0.1:8080')
  })
})
