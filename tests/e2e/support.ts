import { expect, type Page } from '@playwright/test'
import path from 'node:path'

export const DEMO_PASSWORD = 'Spinwright-demo-1'
export const SCREENSHOTS = path.resolve(process.env.SCREENSHOT_DIR ?? '.data/test/screenshots')

export async function signIn(page: Page, email: string, next = '/'): Promise<void> {
  await page.goto(`/sign-in?next=${encodeURIComponent(next)}`)
  await page.getByTestId('sign-in-email').locator('input').fill(email)
  await page.getByTestId('sign-in-password').locator('input').fill(DEMO_PASSWORD)
  await page.getByTestId('sign-in-submit').click()
  await expect(page.getByTestId('account-menu')).toBeVisible()
}

export async function shot(page: Page, name: string): Promise<void> {
  await page.screenshot({ path: path.join(SCREENSHOTS, `${name}.png`), fullPage: true })
}
