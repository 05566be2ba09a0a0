import { randomUUID } from 'node:crypto'
import { expect, test, type Page } from '@playwright/test'
import { csvOf, variantRow } from '../api/catalogue-csv-fixtures'
import { shot, signIn } from './support'

const family = `E2E${randomUUID().slice(0, 5).toUpperCase()}`
const partA = `${family}-4-127-60-07`
const partB = `${family}-4-127-60-09`

/** A row of this scenario: a 127 V 60 Hz bath-fan family, on the import tests' shared row builder. */
function row(partNumber: string, cells: Record<string, string> = {}): Record<string, string> {
  return variantRow(family, partNumber, {
    family_name: `Ashcombe ${family} shaded-pole`,
    family_description: 'Open-frame shaded-pole motors for 127 V bath fans',
    name: `${family} 4-pole 127 V 60 Hz`,
    rated_voltage_v: '127',
    rated_output_w: '7',
    rated_current_a: '0.35',
    rated_input_w: '33',
    locked_rotor_torque_nm: '0.06',
    breakdown_torque_nm: '0.08',
    copper_mass_g: '90',
    weight_g: '600',
    ...cells,
  })
}

const csv = csvOf

/** An invented shaded-pole curve, 4 poles at 60 Hz (n_s = 1800 r/min), torque in N m. */
const CURVE = [
  'rpm,torque_Nm,current_A,input_W',
  '0,0.060,0.33,36',
  '180,0.058,0.33,35.6',
  '360,0.050,0.32,35.0',
  '540,0.040,0.32,34.4',
  '720,0.050,0.32,34.0',
  '960,0.066,0.31,33.3',
  '1200,0.078,0.31,32.5',
  '1380,0.080,0.30,31.4',
  '1500,0.070,0.29,30.2',
  '1620,0.045,0.28,28.5',
  '1740,0.015,0.28,26.6',
  '1800,0,0.27,25.8',
].join('\n')

const PDF = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [] /Count 0 >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n', 'latin1')

async function chooseFile(page: Page, testId: string, name: string, mimeType: string, buffer: Buffer): Promise<void> {
  await page.getByTestId(testId).locator('input[type="file"]').setInputFiles({ name, mimeType, buffer })
}

test.describe('catalogue upkeep by an admin', () => {
  test('imports a CSV (error first, then fixed), uploads a curve and a datasheet; a buyer then finds the motor and gets it as a candidate', async ({ page, browser }) => {
    await signIn(page, 'admin@ashcombe.test', '/admin/catalogue-import')
    await expect(page.getByTestId('admin-import')).toBeVisible()

    // 1. A file with a deliberate error: the row report, nothing written.
    await chooseFile(page, 'import-file', 'new-family.csv', 'text/csv', Buffer.from(csv([row(partA), row(partB, { rated_output_w: '9 W' })])))
    await page.getByTestId('import-preview').click()
    await expect(page.getByTestId('import-summary')).toContainText('2 rows: 1 to add, 0 to change, 0 unchanged, 1 with errors')
    const errors = page.getByTestId('import-row-errors')
    await expect(errors).toContainText('rated_output_w')
    await expect(errors).toContainText('"9 W" is not a number')
    await expect(page.getByTestId('import-commit')).toBeDisabled()
    await expect(page.getByTestId('import-blocked')).toContainText('nothing has been written')
    await shot(page, 'admin-import-1-row-errors')
    expect((await page.request.get(`/api/v1/catalogue/variants/${partA}`)).status()).toBe(404)

    // 2. Fixed: two additions, confirmed, committed.
    await chooseFile(page, 'import-file', 'new-family-fixed.csv', 'text/csv', Buffer.from(csv([row(partA), row(partB, { rated_output_w: '9' })])))
    await page.getByTestId('import-preview').click()
    await expect(page.getByTestId('import-summary')).toContainText('2 rows: 2 to add, 0 to change, 0 unchanged, 0 with errors; families: 1 new')
    await shot(page, 'admin-import-2-preview')
    await page.getByTestId('import-commit').click()
    await expect(page.getByTestId('import-confirm')).toContainText('2 variants will be added')
    await page.getByTestId('import-confirm-commit').click()
    await expect(page.getByTestId('import-committed')).toContainText('2 variants added')
    await shot(page, 'admin-import-3-committed')
    expect((await page.request.get(`/api/v1/catalogue/variants/${partB}`)).status()).toBe(200)

    // 3. The measured curve of the new variant.
    await page.getByTestId('admin-section-performance').click()
    await page.getByTestId('performance-part').locator('input').fill(partB)
    await page.getByTestId('performance-lookup').click()
    await expect(page.getByTestId('performance-variant')).toContainText(family)
    await chooseFile(page, 'performance-file', 'curve-127v.csv', 'text/csv', Buffer.from(CURVE))
    await page.getByTestId('performance-preview').click()
    await expect(page.getByTestId('performance-preview-card')).toContainText('synchronous speed 1800 r/min')
    await expect(page.getByTestId('performance-preview-card')).toContainText('no current data for this tap and supply')
    await shot(page, 'admin-import-4-curve-preview')
    await page.getByTestId('performance-commit').click()
    await page.getByTestId('performance-confirm-commit').click()
    await expect(page.getByTestId('performance-committed')).toBeVisible()

    // 4. Its datasheet.
    await page.getByTestId('admin-section-datasheets').click()
    await page.getByTestId('datasheet-target').locator('input').fill(partB)
    await chooseFile(page, 'datasheet-file', `${partB} datasheet.pdf`, 'application/pdf', PDF)
    await page.getByTestId('datasheet-upload').click()
    await expect(page.getByTestId('datasheet-uploaded')).toContainText(`${partB} datasheet.pdf is attached to ${partB}`)
    await expect(page.getByTestId('datasheet-table')).toContainText(`${partB} datasheet.pdf`)
    await shot(page, 'admin-import-5-datasheet')

    // 5. A buyer finds the motor, its curve and datasheet, and gets it as a candidate of a duty study.
    const buyerContext = await browser.newContext()
    const buyer = await buyerContext.newPage()
    await signIn(buyer, 'buyer@larkspur.test', `/catalogue?search=${encodeURIComponent(partB)}`)
    await expect(buyer.locator(`[data-test^="catalogue-row-"]`, { hasText: partB })).toBeVisible()
    await buyer.getByTestId(`variant-link-${partB}`).click()
    await expect(buyer.getByTestId('variant-part-number')).toHaveText(partB)
    await expect(buyer.getByTestId('variant-datasheets')).toContainText(`${partB} datasheet.pdf`)
    await shot(buyer, 'admin-import-6-buyer-variant')

    const token = (await (await buyer.request.get('/api/auth/csrf')).json()).token
    const run = await buyer.request.post('/api/v1/studies/preview-run', {
      headers: { 'X-CSRF-Token': token },
      data: {
        input: {
          name: 'Bath fan on 127 V',
          fan: {
            source: 'curve',
            refRpm: 1650,
            refDensity: 1.2,
            points: [
              { flowM3s: 0, staticPa: 60, shaftW: 2.5 },
              { flowM3s: 0.01, staticPa: 55, shaftW: 3.0 },
              { flowM3s: 0.02, staticPa: 42, shaftW: 3.4 },
              { flowM3s: 0.03, staticPa: 24, shaftW: 3.6 },
              { flowM3s: 0.04, staticPa: 0, shaftW: 3.6 },
            ],
          },
          duty: { flowM3s: 0.015, staticPa: 30 },
          system: { offsetPa: 5 },
          supply: { volts: 127, hz: 60 },
          ambient: { temperatureC: 20, altitudeM: 0, densityKgM3: 1.2 },
          energy: {},
          constraints: {},
          tolerance: {},
        },
      },
    })
    expect(run.status()).toBe(200)
    const result = await run.json()
    const parts = result.candidates.map((c: { partNumber: string }) => c.partNumber)
    expect(parts).toContain(partB)
    await buyerContext.close()
  })
})
