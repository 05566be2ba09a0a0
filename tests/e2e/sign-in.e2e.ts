import { expect, test } from '@playwright/test'
import { shot, signIn } from './support'

const accounts = [
  { email: 'admin@ashcombe.test', role: 'Administrator', nav: ['catalogue', 'studies', 'quotes', 'admin'] },
  { email: 'sales@ashcombe.test', role: 'Sales engineer', nav: ['catalogue', 'studies', 'quotes'] },
  { email: 'buyer@larkspur.test', role: 'Buyer', nav: ['catalogue', 'studies', 'quotes'] },
  { email: 'buyer@quillon.test', role: 'Buyer', nav: ['catalogue', 'studies', 'quotes'] },
] as const

test.describe('signing in as each demo role', () => {
  for (const account of accounts) {
    test(`${account.email} signs in, sees the navigation of a ${account.role} and signs out`, async ({ page }) => {
      await signIn(page, account.email)
      await expect(page.getByTestId('home-title')).toContainText('Welcome')
      for (const entry of ['catalogue', 'studies', 'quotes', 'admin']) {
        const link = page.getByTestId(`nav-${entry}`)
        if ((account.nav as readonly string[]).includes(entry)) await expect(link).toBeVisible()
        else await expect(link).toHaveCount(0)
      }
      await page.getByTestId('account-menu').click()
      await expect(page.getByTestId('account-role')).toContainText(account.role)
      await shot(page, `home-${account.email.split('@')[0]}-${account.email.split('@')[1]?.split('.')[0]}`)
      await page.getByTestId('sign-out').click()
      await expect(page).toHaveURL(/\/sign-in/)
    })
  }
})

test('a wrong password shows the error and stays on the sign-in page', async ({ page }) => {
  await page.goto('/sign-in')
  await page.getByTestId('sign-in-email').locator('input').fill('buyer@larkspur.test')
  await page.getByTestId('sign-in-password').locator('input').fill('not-it')
  await page.getByTestId('sign-in-submit').click()
  await expect(page.getByTestId('sign-in-error')).toContainText('not right')
  await shot(page, 'sign-in-wrong-password')
})

test('a buyer opening the administration gets the not-allowed page', async ({ page }) => {
  await signIn(page, 'buyer@larkspur.test')
  await page.goto('/admin')
  await expect(page.getByTestId('forbidden-title')).toBeVisible()
  await shot(page, 'forbidden-buyer')
})

test('an anonymous visitor sent to a signed-in page returns there after signing in', async ({ page }) => {
  await page.goto('/quotes')
  await expect(page).toHaveURL(/\/sign-in\?next=(%2F|\/)quotes/)
  await page.getByTestId('sign-in-email').locator('input').fill('sales@ashcombe.test')
  await page.getByTestId('sign-in-password').locator('input').fill('Spinwright-demo-1')
  await page.getByTestId('sign-in-submit').click()
  await expect(page).toHaveURL(/\/quotes$/)
})

test('an unknown address shows the not-found page', async ({ page }) => {
  await page.goto('/no/such/page')
  await expect(page.getByTestId('not-found-title')).toBeVisible()
})

test('the dark theme can be switched on', async ({ page }) => {
  await signIn(page, 'buyer@quillon.test')
  await page.getByRole('button', { name: 'Dark theme' }).click()
  await expect(page.locator('.v-theme--dark').first()).toBeVisible()
  await shot(page, 'home-dark')
})

test('the e-mail field has the focus on arrival and does not take it back from the password field', async ({ page }) => {
  await page.goto('/sign-in')
  await expect(page.getByTestId('sign-in-email').locator('input')).toBeFocused()

  // Again, straight on to the password as soon as it is there, as a quick typist or a password
  // manager does: a focus that lands late (Vuetify's autofocus waits 50 ms after the field comes
  // into view) would take the rest of the typing into the e-mail field.
  await page.goto('/sign-in', { waitUntil: 'commit' })
  const email = page.getByTestId('sign-in-email').locator('input')
  const password = page.getByTestId('sign-in-password').locator('input')
  await password.waitFor({ state: 'attached' })
  await password.focus()
  await page.keyboard.type('Spinwright-demo-1')
  await page.waitForTimeout(300)
  await expect(password).toBeFocused()
  await expect(email).toHaveValue('')
  await expect(password).toHaveValue('Spinwright-demo-1')
})
