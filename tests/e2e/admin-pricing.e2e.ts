// An admin edits a price list entry (lead time), and meets a newer version of the list saved
// elsewhere meanwhile: the dialog refuses to save over it and offers to reload.
import { expect, test, type Page } from '@playwright/test'
import type { AdminPriceListRow, Page as ListPage } from '@shared/contracts/admin.contract'
import { shot, signIn } from './support'

// The demo list (server/seed/demo-pricing.ts, DEMO_PRICE_LIST_CODE) and a small shaded-pole motor
// no other browser test quotes.
const DEMO_PRICE_LIST_CODE = 'AMW-USD-2026H2'
const PART = 'LN60-4P10-A6'

async function openEntry(admin: Page): Promise<void> {
  const row = admin.getByTestId(`entry-row-${PART}`)
  await expect(row).toBeVisible()
  await row.getByTestId('entry-edit').click()
  await expect(admin.getByTestId('price-entry-dialog')).toBeVisible()
}

/** Saves the list's header unchanged through the API, as another admin would: its version moves on. */
async function saveListElsewhere(admin: Page): Promise<void> {
  const csrf: { token: string } = await (await admin.request.get('/api/auth/csrf')).json()
  const lists: ListPage<AdminPriceListRow> = await (await admin.request.get('/api/admin/price-lists')).json()
  const list = lists.items.find((item) => item.code === DEMO_PRICE_LIST_CODE)
  if (!list) throw new Error(`no demo price list ${DEMO_PRICE_LIST_CODE}`)
  const response = await admin.request.put(`/api/admin/price-lists/${list.id}`, {
    headers: { 'X-CSRF-Token': csrf.token },
    data: {
      name: list.name,
      validFrom: list.validFrom,
      validTo: list.validTo,
      baseCopperIndexPerKg: list.baseCopperIndexPerKg,
      copperCreditBelowBase: list.copperCreditBelowBase,
      tierDiscountBp: list.tierDiscountBp,
      version: list.version,
    },
  })
  expect(response.status(), await response.text()).toBe(200)
}

test('an admin edits a price list entry, and is stopped from saving over a newer version of the list', async ({ page }) => {
  await signIn(page, 'admin@ashcombe.test', '/admin/price-lists')
  await page.getByTestId(`price-list-row-${DEMO_PRICE_LIST_CODE}`).click()
  await expect(page.getByTestId('price-list-detail')).toBeVisible()
  await page.getByTestId('entries-search').locator('input').fill(PART)

  // A plain edit: the lead time, saved and shown in the table.
  await openEntry(page)
  const leadTime = page.getByTestId('entry-lead-time').locator('input')
  const before = Number(await leadTime.inputValue())
  await leadTime.fill(String(before + 7))
  await page.getByTestId('entry-save').click()
  await expect(page.getByTestId('price-entry-dialog')).toBeHidden()
  await expect(page.getByTestId(`entry-row-${PART}`)).toContainText(`${before + 7} d`)

  // Someone else saves the list while the dialog is open: saving answers 409, the dialog says so.
  await openEntry(page)
  await saveListElsewhere(page)
  await page.getByTestId('entry-lead-time').locator('input').fill(String(before))
  await page.getByTestId('entry-save').click()
  const alert = page.getByTestId('entry-error')
  await expect(alert).toBeVisible()
  await expect(page.getByTestId('entry-save')).toBeDisabled()
  await shot(page, 'admin-pricing-stale-entry')
  await alert.getByRole('button', { name: 'Reload' }).click()
  await expect(page.getByTestId('price-entry-dialog')).toBeHidden()
  // Nothing was saved over the newer version; after the reload the edit goes through.
  await expect(page.getByTestId(`entry-row-${PART}`)).toContainText(`${before + 7} d`)
  await openEntry(page)
  await page.getByTestId('entry-lead-time').locator('input').fill(String(before))
  await page.getByTestId('entry-save').click()
  await expect(page.getByTestId('price-entry-dialog')).toBeHidden()
  await expect(page.getByTestId(`entry-row-${PART}`)).toContainText(`${before} d`)
})
