import { expect, test, type Page } from '@playwright/test'
import { shot, signIn } from './support'

const rows = (page: Page) => page.locator('[data-test^="catalogue-row-"]')

async function waitForRows(page: Page): Promise<void> {
  await expect(page.getByTestId('catalogue-table').locator('.v-data-table-progress')).toHaveCount(0)
  await expect(rows(page).first()).toBeVisible()
}

async function outputs(page: Page): Promise<number[]> {
  const values = await page.getByTestId('cell-output').evaluateAll((cells) => cells.map((cell) => Number(cell.getAttribute('data-value'))))
  return values
}

test.describe('the motor catalogue', () => {
  test('an anonymous visitor filters PSC motors on 120 V 60 Hz, sorts by output, and the view survives a reload and back', async ({ page }) => {
    await page.goto('/catalogue')
    await waitForRows(page)
    await expect(page.getByTestId('catalogue-total')).toContainText(/\d+ motors/)

    await page.getByTestId('filter-type-psc').click()
    await expect(page).toHaveURL(/[?&]type=psc/)
    await page.getByTestId('filter-supply').click()
    await page.getByRole('option', { name: /^120 V 60 Hz/ }).click()
    await page.keyboard.press('Escape')
    await expect(page).toHaveURL(/[?&]supply=120-60/)
    await waitForRows(page)
    for (const cell of await page.getByTestId('cell-type').allTextContents()) expect(cell.trim()).toBe('PSC')
    for (const cell of await page.getByTestId('cell-supply').allTextContents()) expect(cell.trim()).toBe('120 V 60 Hz')

    const outputHeader = page.getByTestId('catalogue-table').locator('th', { hasText: 'Output W' })
    await outputHeader.click()
    await expect(page).toHaveURL(/[?&]sort=ratedOutputW/)
    await outputHeader.click()
    await expect(page).toHaveURL(/[?&]order=desc/)
    await waitForRows(page)
    const descending = await outputs(page)
    expect(descending.length).toBeGreaterThan(1)
    for (let i = 1; i < descending.length; i++) expect(descending[i]).toBeLessThanOrEqual(descending[i - 1] ?? Infinity)
    await shot(page, 'catalogue-psc-120v60-by-output')

    const filtered = page.url()
    await page.reload()
    await waitForRows(page)
    expect(page.url()).toBe(filtered)
    expect(await outputs(page)).toEqual(descending)
    await expect(page.getByTestId('filter-type-psc')).toHaveClass(/v-chip--variant-flat/)

    await page.goBack()
    await expect(page).not.toHaveURL(/order=desc/)
    await expect(page).toHaveURL(/sort=ratedOutputW/)
    await page.goForward()
    await expect(page).toHaveURL(/order=desc/)
  })

  test('searching by part number narrows the list; a search with no match offers to clear the filters', async ({ page }) => {
    await page.goto('/catalogue')
    await waitForRows(page)
    const firstPart = (await page.locator('[data-test^="variant-link-"]').first().textContent())?.trim() ?? ''
    expect(firstPart).not.toBe('')

    await page.getByTestId('filter-search').locator('input').fill(firstPart)
    await expect(page).toHaveURL(new RegExp(`[?&]search=${encodeURIComponent(firstPart)}`))
    await waitForRows(page)
    await expect(page.getByTestId(`variant-link-${firstPart}`)).toBeVisible()

    await page.getByTestId('filter-search').locator('input').fill('NO-SUCH-MOTOR-XYZ')
    await expect(page.getByTestId('catalogue-empty')).toContainText('No motors match')
    await shot(page, 'catalogue-no-match')
    await page.getByTestId('empty-clear').click()
    await expect(page).not.toHaveURL(/search=/)
    await waitForRows(page)
  })

  test('a variant page shows its specifications, the torque-speed chart per tap, and links into a duty study', async ({ page }) => {
    await page.goto('/catalogue?type=psc&supply=120-60')
    await waitForRows(page)
    const link = page.locator('[data-test^="variant-link-"]').first()
    const partNumber = (await link.textContent())?.trim() ?? ''
    await link.click()
    await expect(page).toHaveURL(new RegExp(`/catalogue/${partNumber}$`))
    await expect(page.getByTestId('variant-part-number')).toHaveText(partNumber)
    await expect(page.getByTestId('variant-specs')).toContainText('Run capacitor')
    await expect(page.getByTestId('spec-insulation')).toContainText('IEC 60085')
    await expect(page.getByTestId('variant-safety')).toContainText('capacitor')

    const chart = page.getByTestId('variant-curves').getByTestId('chart')
    await expect(chart.locator('svg, canvas').first()).toBeVisible()
    await expect(chart.locator('svg path').first()).toBeAttached()
    await expect(page.locator('[data-test^="curves-tap-"]').first()).toBeVisible()
    await expect(page.getByTestId('curves-source').first()).toHaveText(/Measured|From datasheet|Fitted circuit/)
    await shot(page, 'variant-psc-torque')

    await page.getByTestId('curves-current').click()
    await expect(chart).toHaveAttribute('aria-label', /Line current/)
    await shot(page, 'variant-psc-current')

    const study = page.getByTestId('variant-use-in-study')
    await expect(study).toHaveAttribute('href', new RegExp(`/studies/new\\?variant=${partNumber}&volts=120&hz=60`))

    await page.getByTestId('variant-back').click()
    await expect(page).toHaveURL(/\/catalogue\?.*type=psc/)
  })

  test('a signed-in buyer opens a shaded-pole motor and an unknown part number says so', async ({ page }) => {
    await signIn(page, 'buyer@larkspur.test', '/catalogue?type=shaded-pole')
    await waitForRows(page)
    await page.locator('[data-test^="variant-link-"]').first().click()
    await expect(page.getByTestId('variant-specs')).toContainText('Shaded-pole')
    await expect(page.getByTestId('variant-curves').getByTestId('chart').locator('svg').first()).toBeVisible()
    await shot(page, 'variant-shaded-pole-buyer')

    await page.goto('/catalogue/NO-SUCH-PART')
    await expect(page.getByTestId('variant-error')).toContainText('No motor with part number NO-SUCH-PART')
  })
})
