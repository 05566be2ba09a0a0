import { readFile } from 'node:fs/promises'
import { expect, test, type Page } from '@playwright/test'
import { shot, signIn } from './support'

async function pickRangeHoodFan(page: Page): Promise<string> {
  await page.getByTestId('study-demo-fan').click()
  const option = page.locator('[data-test^="demo-fan-RH-"]').first()
  await expect(option).toBeVisible()
  const code = (await option.getAttribute('data-test'))?.replace('demo-fan-', '') ?? ''
  await option.click()
  return code
}

test.describe('the buyer path through a duty study', () => {
  test('a buyer builds a range-hood study on 120 V 60 Hz, runs, compares, exports, saves, reopens and shares it', async ({ page }) => {
    test.setTimeout(300_000)
    await signIn(page, 'buyer@larkspur.test', '/studies')
    await expect(page.getByTestId('studies-title')).toBeVisible()
    await page.getByTestId('studies-new').click()
    await expect(page).toHaveURL(/\/studies\/new$/)

    // Fan: the demo range-hood blower takes its suggested duty; the preview draws it at once.
    const code = await pickRangeHoodFan(page)
    expect(code).toMatch(/^RH-/)
    await expect(page.getByTestId('duty-flow').locator('input')).not.toHaveValue('')
    await expect(page.getByTestId('duty-pressure').locator('input')).not.toHaveValue('')
    await expect(page.getByTestId('study-preview-chart').locator('svg').first()).toBeVisible()
    await page.getByTestId('supply-120-60').click()
    await shot(page, 'study-editor-range-hood')

    // An impossible entry is named on its field, and clears when put right.
    const flow2 = page.getByTestId('fan-point-2-flow').locator('input')
    const before = await flow2.inputValue()
    await flow2.fill('0')
    await expect(page.getByTestId('fan-point-2-error')).toContainText(/flows must/i)
    await shot(page, 'study-editor-field-error')
    await flow2.fill(before)
    await expect(page.getByTestId('fan-point-2-error')).toHaveCount(0)

    const name = `Range hood ${Date.now()}`
    await page.getByTestId('study-name').locator('input').fill(name)

    // Run: signed in, the study is saved first, then solved; the address becomes the saved study's.
    await page.getByTestId('study-run').click()
    await expect(page.getByTestId('study-results')).toBeVisible({ timeout: 30_000 })
    await expect(page).toHaveURL(/\/studies\/[0-9a-f-]{36}$/)
    const rows = page.locator('[data-test^="candidate-row-"]')
    await expect(rows.first()).toBeVisible()
    expect(await rows.count()).toBeGreaterThan(1)
    await expect(page.getByTestId('study-torque-chart').locator('svg').first()).toBeVisible()
    await expect(page.getByTestId('study-fan-chart').locator('svg').first()).toBeVisible()
    await shot(page, 'study-results')

    // The two best are selected for the charts; compare them side by side.
    await expect(page.getByTestId('study-compare-open')).toContainText('2')
    await page.getByTestId('study-compare-open').click()
    const compare = page.getByTestId('study-compare')
    await expect(compare).toBeVisible()
    await expect(compare.locator('[data-test^="compare-col-"]')).toHaveCount(2)
    await expect(compare).toContainText('Low line')
    await shot(page, 'study-compare')
    await page.getByTestId('study-compare-close').click()

    // CSV export in the buyer's units: a header and one row per candidate at least.
    const downloadPromise = page.waitForEvent('download')
    await page.getByTestId('study-csv-export').click()
    const download = await downloadPromise
    const file = await download.path()
    const csv = await readFile(file, 'utf8')
    const lines = csv.trim().split(/\r?\n/)
    expect(lines.length).toBeGreaterThan(2)
    expect(lines.some((line) => /part/i.test(line))).toBe(true)

    // Save a change of name, reopen it from the list.
    await page.getByTestId('study-name').locator('input').fill(`${name} (saved)`)
    await expect(page.getByTestId('study-saved-state')).toContainText('Unsaved')
    await page.getByTestId('study-save').click()
    await expect(page.getByTestId('study-saved-state')).toContainText('Saved')
    const studyUrl = page.url()

    await page.getByTestId('nav-studies').click()
    const link = page.getByTestId('study-open').filter({ hasText: `${name} (saved)` })
    await expect(link).toBeVisible()
    await shot(page, 'studies-list')
    await link.click()
    await expect(page).toHaveURL(studyUrl)
    await expect(page.getByTestId('study-name').locator('input')).toHaveValue(`${name} (saved)`)
    await expect(page.locator('[data-test^="candidate-row-"]').first()).toBeVisible()

    // Share: a read-only link that a colleague can open.
    await page.getByTestId('study-share-open').click()
    await page.getByTestId('share-create').click()
    const shareInput = page.getByTestId('share-link').locator('input')
    await expect(shareInput).toHaveValue(/\/shared\/studies\//)
    await shot(page, 'study-share')
    const shareUrl = await shareInput.inputValue()
    await page.keyboard.press('Escape')

    await page.goto(shareUrl)
    await expect(page.getByTestId('study-readonly')).toBeVisible()
    await expect(page.getByTestId('study-run')).toHaveCount(0)
    await expect(page.locator('[data-test^="candidate-row-"]').first()).toBeVisible()
    await shot(page, 'study-shared-read-only')
  })

  test('an anonymous visitor runs a preview of a demo fan study and is told saving needs sign-in', async ({ page }) => {
    await page.goto('/studies/new')
    await expect(page.getByTestId('study-anonymous')).toContainText('sign in')
    await pickRangeHoodFan(page)
    await page.getByTestId('study-run').click()
    await expect(page.getByTestId('study-results')).toBeVisible({ timeout: 30_000 })
    await expect(page.locator('[data-test^="candidate-row-"]').first()).toBeVisible()
    await expect(page.getByTestId('study-save')).toHaveCount(0)
    await shot(page, 'study-anonymous-preview')
  })
})

test.describe('a fan curve pasted as CSV', () => {
  test('is read in the units chosen, re-read when a unit changes, and a header names its own units', async ({ page }) => {
    await signIn(page, 'buyer@larkspur.test', '/studies/new')
    await page.getByTestId('fan-mode-points').click()
    await page.getByTestId('study-csv-open').click()
    const text = page.getByTestId('study-csv-text').locator('textarea').first()
    // No header: the selectors' units apply (this buyer works in CFM and in wg by default).
    await text.fill('# 1500 rpm\n0 1.0 30\n100 0.8 40\n200 0.4 50\n300 0 55\n')
    await expect(page.getByTestId('study-csv-summary')).toContainText('4 good rows')
    // Switch flow to m3/h: the rows are read again, so 100 in the text is 100 m3/h, about 58.9 CFM.
    await page.getByTestId('study-csv-flow-unit').click()
    await page.getByRole('option', { name: 'm³/h' }).click()
    await expect(page.getByTestId('study-csv-summary')).toContainText('4 good rows')
    await shot(page, 'study-csv-units-chosen')
    await page.getByTestId('study-csv-use').click()
    const flow1 = Number((await page.getByTestId('fan-point-1-flow').locator('input').inputValue()).replace(/,/g, ''))
    expect(flow1).toBeGreaterThan(58.5)
    expect(flow1).toBeLessThan(59.3)

    // A header that names its units wins, and the selectors show and lock them.
    await page.getByTestId('study-csv-open').click()
    await text.fill('"Flow, (L/s)";"Static (Pa)";"Shaft power (W)"\n0;250;30\n20;200;40\n40;100;50\n60;0;55\n')
    await expect(page.getByTestId('study-csv-summary')).toContainText('Units from the header: flow, pressure, power')
    await expect(page.getByTestId('study-csv-flow-unit')).toContainText('L/s')
    await expect(page.getByRole('combobox', { name: 'Flow: header' })).toBeDisabled()
    await shot(page, 'study-csv-header-units')
  })
})
