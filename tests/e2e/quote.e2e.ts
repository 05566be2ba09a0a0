// The whole quote path in the browser: a buyer requests a quote from a study candidate, sales
// prices and issues it, the mail with its PDF reaches the mailbox, the buyer accepts and pays the
// deposit on the fake's hosted test page, and both see the order, which sales confirms.
import { readFile } from 'node:fs/promises'
import { expect, test, type APIRequestContext, type Browser, type Page } from '@playwright/test'
import type { DemoFan } from '@shared/contracts/catalogue.contract'
import type { StudyInput, StudyRecord } from '@shared/contracts/study.contract'
import { shot, signIn } from './support'

async function csrf(request: APIRequestContext): Promise<string> {
  const response = await request.get('/api/auth/csrf')
  expect(response.ok()).toBe(true)
  const body: { token: string } = await response.json()
  return body.token
}

/** A range-hood study on the demo blower, made through the API to save the clicks the study test already covers. */
async function createRangeHoodStudy(page: Page): Promise<StudyRecord> {
  const fans: DemoFan[] = await (await page.request.get('/api/v1/catalogue/demo-fans')).json()
  const fan = fans.find((item) => item.code.startsWith('RH-'))
  if (!fan) throw new Error('the demo data has no range-hood fan')
  const input: StudyInput = {
    name: `Range hood for quote ${Date.now()}`,
    fan: { source: 'curve', refRpm: fan.refRpm, refDensity: fan.refDensity, points: fan.points, demoFanCode: fan.code },
    duty: fan.suggestedDuty,
    system: { offsetPa: 0 },
    supply: { volts: 120, hz: 60 },
    ambient: { temperatureC: 25, altitudeM: 0 },
    energy: { hoursPerYear: 2000, tariffMinorPerKWh: 16, currency: 'USD', lifeYears: 10 },
    constraints: { motorTypes: [], mountings: [], enclosures: [], protections: [], activeOnly: true },
    tolerance: { voltagePct: 10, minMarginPct: 0 },
  }
  const response = await page.request.post('/api/v1/studies', { data: { input }, headers: { 'X-CSRF-Token': await csrf(page.request) } })
  expect(response.status(), await response.text()).toBe(201)
  return response.json()
}

async function newSignedInPage(browser: Browser, email: string, next: string): Promise<Page> {
  const context = await browser.newContext()
  const page = await context.newPage()
  await signIn(page, email, next)
  return page
}

interface MailSummary {
  id: string
  subject: string | null
  to: { address: string }[]
  attachmentCount: number
}
interface MailDetail extends MailSummary {
  attachments: { index: number; filename: string; contentType: string }[]
}

test.describe('a quote from a duty study to a paid deposit and a confirmed order', () => {
  test('buyer requests, sales issues, mail carries the PDF, buyer accepts and pays, both see the order', async ({ browser }) => {
    test.setTimeout(240_000)

    // ---------------------------------------------------------------- buyer: study -> request
    const buyer = await newSignedInPage(browser, 'buyer@larkspur.test', '/studies')
    const study = await createRangeHoodStudy(buyer)
    await buyer.goto(`/studies/${study.id}`)
    await buyer.getByTestId('study-run').click()
    await expect(buyer.getByTestId('study-results')).toBeVisible({ timeout: 30_000 })
    const quoteButton = buyer.locator('[data-test^="candidate-quote-"]').first()
    await expect(quoteButton).toBeEnabled()
    const [, partNumber] = /^candidate-quote-(.+)-[^-]+$/.exec((await quoteButton.getAttribute('data-test')) ?? '') ?? []
    expect(partNumber).toBeTruthy()
    await quoteButton.click()

    await expect(buyer).toHaveURL(/\/quotes\?/)
    const requestDialog = buyer.getByTestId('quote-request-dialog')
    await expect(requestDialog).toBeVisible()
    await expect(requestDialog).toContainText(partNumber ?? '')
    await buyer.getByTestId('request-quantity').locator('input').fill('12000')
    await buyer.getByTestId('request-lot').locator('input').fill('3000')
    await buyer.getByTestId('request-note').locator('textarea').first().fill('First lot for the spring range-hood line.')
    await shot(buyer, 'quote-01-buyer-request-form')
    await buyer.getByTestId('request-submit').click()

    await expect(buyer).toHaveURL(/\/quotes\/[0-9a-f-]{36}$/)
    const quoteUrl = new URL(buyer.url()).pathname
    const quoteId = quoteUrl.split('/').pop() ?? ''
    await expect(buyer.getByTestId('quote-state-requested')).toBeVisible()
    await expect(buyer.getByTestId('quote-request')).toContainText('12,000')
    await expect(buyer.getByTestId('quote-state-message')).toContainText('with Ashcombe sales')
    await shot(buyer, 'quote-02-buyer-request-sent')

    // ---------------------------------------------------------------- sales: price and issue
    const sales = await newSignedInPage(browser, 'sales@ashcombe.test', '/quotes')
    const row = sales.getByTestId(`quote-row-${quoteId}`)
    await expect(row).toBeVisible()
    await expect(row).toContainText('Request received')
    await shot(sales, 'quote-03-sales-list')
    await row.click()
    await expect(sales).toHaveURL(quoteUrl)
    await expect(sales.getByTestId('quote-editor')).toBeVisible()
    await expect(sales.getByTestId('draft-line-0-part').locator('input[type="text"]')).toHaveValue(partNumber ?? '')
    // The request's draft is priced as it stands (12 000 per year takes the top quantity break).
    await expect(sales.getByTestId('price-line-0')).toBeVisible()

    // One lot's worth at a time: 3 000 pieces; a bracket on each motor.
    await sales.getByTestId('draft-line-0-quantity').locator('input').fill('3000')
    await sales.getByTestId('draft-line-0-option-BRKT-STD').click()
    // A sea-only rule is flagged as such; the customer collects in the US, so a rule for any mode is chosen.
    await sales.getByTestId('draft-incoterm').click()
    await sales.getByTestId('incoterm-option-FOB').click()
    await expect(sales.getByTestId('draft-incoterm-sea')).toBeVisible()
    await sales.getByTestId('draft-incoterm').click()
    await sales.getByTestId('incoterm-option-DAP').click()
    await expect(sales.getByTestId('draft-incoterm-sea')).toHaveCount(0)
    await sales.getByTestId('draft-incoterm-place').locator('input').fill('Larkspur Air Appliances, Columbus OH')
    await expect(sales.getByTestId('quote-unsaved')).toBeVisible()
    await shot(sales, 'quote-04-sales-editing')

    await sales.getByTestId('quote-save').click()
    await expect(sales.getByTestId('quote-notice')).toContainText('saved')
    await expect(sales.getByTestId('quote-unsaved')).toHaveCount(0)
    const priceLine = sales.getByTestId('price-line-0')
    await expect(priceLine).toContainText('3,000')
    await expect(priceLine).toContainText('from 2,000 pcs')
    await expect(priceLine).toContainText('Mounting bracket')
    await expect(sales.getByTestId('total-total')).toContainText('$')
    const totalText = (await sales.getByTestId('total-total').textContent())?.trim() ?? ''
    await shot(sales, 'quote-05-sales-saved-with-prices')

    await sales.getByTestId('quote-issue').click()
    await expect(sales.getByTestId('issue-dialog')).toContainText('freezes revision A')
    await shot(sales, 'quote-06-sales-issue-confirm')
    await sales.getByTestId('issue-confirm').click()
    await expect(sales.getByTestId('quote-state-issued')).toBeVisible({ timeout: 30_000 })
    await expect(sales.getByTestId('revision-A')).toBeVisible()
    const title = (await sales.getByTestId('quote-title').textContent())?.trim() ?? ''
    const fullNumber = title.replace(/^Quote\s+/, '')
    expect(fullNumber).toMatch(/A$/)
    await shot(sales, 'quote-07-sales-issued')

    // ---------------------------------------------------------------- admin: the mail with its PDF
    const admin = await newSignedInPage(browser, 'admin@ashcombe.test', '/')
    const number = fullNumber.slice(0, -1)
    let issuedMail: MailSummary | undefined
    await expect
      .poll(
        async () => {
          const response = await admin.request.get('/api/admin/mailbox')
          if (!response.ok()) return `mailbox answered ${response.status()}`
          const body: { messages: MailSummary[] } = await response.json()
          issuedMail = body.messages.find((message) => (message.subject ?? '').includes(number) && message.to.some((to) => to.address === 'buyer@larkspur.test'))
          return issuedMail ? 'found' : 'not yet'
        },
        { timeout: 60_000, intervals: [1000] },
      )
      .toBe('found')
    const detail: MailDetail = await (await admin.request.get(`/api/admin/mailbox/${issuedMail?.id ?? ''}`)).json()
    const pdfAttachment = detail.attachments.find((attachment) => attachment.contentType === 'application/pdf')
    expect(pdfAttachment, 'the issue mail carries the quote PDF').toBeTruthy()
    const attachment = await admin.request.get(`/api/admin/mailbox/${detail.id}/attachments/${pdfAttachment?.index ?? 0}`)
    expect(attachment.ok()).toBe(true)
    expect((await attachment.body()).subarray(0, 5).toString('latin1')).toBe('%PDF-')
    // The mailbox screen, as far as it is built.
    await admin.goto('/admin/mailbox')
    await shot(admin, 'quote-08-admin-mailbox')

    // ---------------------------------------------------------------- buyer: read, PDF, accept
    await buyer.goto(quoteUrl)
    await expect(buyer.getByTestId('quote-state-issued')).toBeVisible()
    const document = buyer.getByTestId('quote-document')
    await expect(document).toBeVisible()
    await expect(buyer.getByTestId('quote-document-number')).toHaveText(fullNumber)
    await expect(buyer.getByTestId('duty-point-0')).toContainText('Low line')
    await expect(buyer.getByTestId('total-total')).toHaveText(totalText)
    await expect(buyer.getByTestId('quote-terms')).toContainText('DAP Larkspur Air Appliances, Columbus OH, Incoterms 2020')
    await expect(buyer.getByTestId('quote-safety')).toBeVisible()
    await shot(buyer, 'quote-09-buyer-issued-document')

    const downloadPromise = buyer.waitForEvent('download')
    await buyer.getByTestId('quote-pdf').click()
    const download = await downloadPromise
    expect(download.suggestedFilename()).toContain(number)
    const pdf = await readFile(await download.path())
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-')

    await buyer.getByTestId('quote-accept').click()
    const acceptDialog = buyer.getByTestId('accept-dialog')
    await expect(acceptDialog).toContainText('revision A')
    await buyer.getByTestId('accept-name').locator('input').fill('Dana Whitcombe')
    await buyer.getByTestId('accept-po').locator('input').fill('LAA-PO-55120')
    await expect(buyer.getByTestId('accept-submit')).toBeDisabled()
    await buyer.getByTestId('accept-confirm-revision').locator('input').check()
    await shot(buyer, 'quote-10-buyer-accept-dialog')
    await buyer.getByTestId('accept-submit').click()
    await expect(buyer.getByTestId('quote-state-accepted')).toBeVisible()
    await expect(buyer.getByTestId('quote-pay-deposit')).toBeVisible()
    await shot(buyer, 'quote-11-buyer-accepted')

    // ---------------------------------------------------------------- buyer: the hosted test checkout
    await buyer.getByTestId('quote-pay-deposit').click()
    await expect(buyer.locator('#pay-button')).toBeVisible({ timeout: 20_000 })
    await buyer.locator('#card-name').fill('Dana Whitcombe')
    await buyer.locator('#card-number').fill('4242 4242 4242 4242')
    await buyer.locator('#card-expiry').fill('12/34')
    await buyer.locator('#card-cvc').fill('123')
    await shot(buyer, 'quote-12-hosted-checkout')
    await buyer.locator('#pay-button').click()

    await expect(buyer).toHaveURL(new RegExp(`${quoteUrl}`), { timeout: 20_000 })
    await expect(buyer.getByTestId('deposit-paid')).toBeVisible({ timeout: 45_000 })
    await expect(buyer.getByTestId('quote-order')).toBeVisible()
    await expect(buyer.getByTestId('order-awaiting')).toBeVisible()
    await expect(buyer.getByTestId('quote-state-deposit-paid')).toBeVisible()
    await shot(buyer, 'quote-13-buyer-deposit-paid-order')

    // ---------------------------------------------------------------- sales: sees and confirms the order
    await sales.goto('/quotes?state=deposit-paid')
    await expect(sales.getByTestId(`quote-row-${quoteId}`)).toBeVisible()
    await sales.getByTestId(`quote-row-${quoteId}`).click()
    await expect(sales.getByTestId('quote-order')).toBeVisible()
    await expect(sales.getByTestId('quote-order')).toContainText('LAA-PO-55120')
    await shot(sales, 'quote-14-sales-order')
    await sales.getByTestId('order-confirm').click()
    await expect(sales.getByTestId('order-confirmed')).toBeVisible()
    await expect(sales.getByTestId('quote-state-ordered')).toBeVisible()
    await shot(sales, 'quote-15-sales-order-confirmed')

    await buyer.goto(quoteUrl)
    await expect(buyer.getByTestId('order-confirmed')).toBeVisible()
    await expect(buyer.getByTestId('quote-state-ordered')).toBeVisible()
    await shot(buyer, 'quote-16-buyer-order-confirmed')
  })
})

test('a fresh portal shows the demo work in progress: each buyer’s study and the requests sales finds waiting', async ({ browser }) => {
  // Seeded once per database by server/seed/demo-activity.ts.
  const sales = await newSignedInPage(browser, 'sales@ashcombe.test', '/quotes')
  const request = sales.locator('[data-test^="quote-row-"]', { hasText: '× 8,000' }).filter({ hasText: 'Larkspur Air Appliances' })
  await expect(request.first()).toContainText('Request received')
  await request.first().click()
  await expect(sales.getByTestId('quote-editor')).toBeVisible()
  await expect(sales.getByText('Pilot run for the spring canopy line').first()).toBeVisible()
  await expect(sales.getByTestId('price-line-0')).toBeVisible()

  const buyer = await newSignedInPage(browser, 'buyer@larkspur.test', '/studies')
  await expect(buyer.getByText('Range hood, 600 mm canopy')).toBeVisible()

  // The distributor's: a service-replacement study on 230 V 50 Hz and its request.
  await sales.goto('/quotes')
  const stock = sales.locator('[data-test^="quote-row-"]', { hasText: '× 1,200' }).filter({ hasText: 'Quillon Supply' })
  await expect(stock.first()).toContainText('Request received')
  const distributor = await newSignedInPage(browser, 'buyer@quillon.test', '/studies')
  await expect(distributor.getByText('Condenser fan 250 mm, service replacement')).toBeVisible()
  await distributor.goto('/quotes')
  await expect(distributor.locator('[data-test^="quote-row-"]', { hasText: '× 1,200' }).first()).toBeVisible()
})
