// The admin invites a buyer of Larkspur Air Appliances; the invitation mail is read from the
// mailbox and its link opened in a fresh browser; the buyer sets a password and signs in; the
// admin disables them and their page goes to sign-in; the admin adds a copper index value.
import { expect, test, type Page } from '@playwright/test'
import { randomUUID } from 'node:crypto'
import { shot, signIn } from './support'

interface MailSummary {
  id: string
  subject: string | null
  to: { address: string }[]
}

const NEW_PASSWORD = 'Range-hood-duty-point-7'

async function invitationLink(admin: Page, email: string): Promise<string> {
  let found: MailSummary | undefined
  await expect
    .poll(
      async () => {
        const response = await admin.request.get('/api/admin/mailbox')
        if (!response.ok()) return `mailbox answered ${response.status()}`
        const body: { messages: MailSummary[] } = await response.json()
        found = body.messages.find((message) => message.to.some((to) => to.address === email))
        return found ? 'found' : 'not yet'
      },
      { timeout: 60_000, intervals: [1000] },
    )
    .toBe('found')
  const detail: { text: string | null } = await (await admin.request.get(`/api/admin/mailbox/${found?.id ?? ''}`)).json()
  const link = detail.text?.match(/https?:\/\/\S+\/set-password\/[A-Za-z0-9_-]{43}/)?.[0]
  expect(link, 'the invitation mail carries a set-password link').toBeTruthy()
  // The portal address in the mail may name another host than the test's; keep its path.
  return new URL(link ?? '').pathname
}

test('an admin invites a buyer who sets a password and signs in, is disabled and sent to sign-in; the copper index gets a value', async ({ browser }) => {
  test.setTimeout(180_000)
  const email = `ines.${randomUUID().slice(0, 6)}@larkspur.test`

  // ------------------------------------------------------------------ admin invites a buyer
  const adminContext = await browser.newContext()
  const admin = await adminContext.newPage()
  await signIn(admin, 'admin@ashcombe.test', '/admin/users')
  await expect(admin.getByTestId('users-table')).toBeVisible()
  await expect(admin.getByTestId('user-row-admin@ashcombe.test')).toBeVisible()
  await shot(admin, 'admin-people-01-users')
  await admin.getByTestId('users-invite').click()
  const dialog = admin.getByTestId('invite-dialog')
  await dialog.getByTestId('invite-name').locator('input').fill('Ines Marlowe')
  await dialog.getByTestId('invite-email').locator('input').fill(email)
  await dialog.getByTestId('invite-organisation').locator('input').fill('Larkspur')
  await admin.getByRole('option', { name: /Larkspur Air Appliances/ }).click()
  await expect(dialog.getByTestId('invite-role')).toContainText('Buyer')
  await shot(admin, 'admin-people-02-invite')
  await dialog.getByTestId('invite-submit').click()
  await expect(admin.getByTestId('users-notice')).toContainText(email)
  await admin.getByTestId('users-search').locator('input').fill(email)
  await expect(admin.getByTestId(`user-row-${email}`).getByTestId('user-status-invited')).toBeVisible()
  await shot(admin, 'admin-people-03-invited')

  // ------------------------------------------------------------------ the invitee, in a fresh browser
  const path = await invitationLink(admin, email)
  const buyerContext = await browser.newContext()
  const buyer = await buyerContext.newPage()
  await buyer.goto(path)
  await expect(buyer.getByText('Welcome, Ines Marlowe')).toBeVisible()
  await buyer.getByTestId('set-password-new').locator('input').fill('too-short')
  await buyer.getByTestId('set-password-repeat').locator('input').fill('too-short')
  await buyer.getByTestId('set-password-submit').click()
  await expect(buyer.getByText('Use at least 12 characters')).toBeVisible()
  await buyer.getByTestId('set-password-new').locator('input').fill(NEW_PASSWORD)
  await buyer.getByTestId('set-password-repeat').locator('input').fill(NEW_PASSWORD)
  await shot(buyer, 'admin-people-04-set-password')
  await buyer.getByTestId('set-password-submit').click()
  await expect(buyer.getByTestId('set-password-done')).toBeVisible()
  await shot(buyer, 'admin-people-05-password-set')
  await buyer.getByTestId('set-password-sign-in').click()
  await buyer.getByTestId('sign-in-email').locator('input').fill(email)
  await buyer.getByTestId('sign-in-password').locator('input').fill(NEW_PASSWORD)
  await buyer.getByTestId('sign-in-submit').click()
  await expect(buyer.getByTestId('account-menu')).toBeVisible()
  await expect(buyer.getByTestId('nav-admin')).toHaveCount(0)

  // The used link no longer works.
  const again = await buyerContext.newPage()
  await again.goto(path)
  await expect(again.getByTestId('set-password-dead')).toContainText('already been used')
  await again.close()

  // ------------------------------------------------------------------ admin disables the buyer
  await admin.reload()
  await admin.getByTestId('users-search').locator('input').fill(email)
  const row = admin.getByTestId(`user-row-${email}`)
  await expect(row.getByTestId('user-status-active')).toBeVisible()
  await row.getByTestId('user-actions').click()
  await admin.getByTestId('user-action-disable').click()
  await expect(admin.getByTestId('user-confirm-dialog')).toContainText('signed out everywhere')
  await shot(admin, 'admin-people-06-disable-confirm')
  await admin.getByTestId('user-confirm').click()
  await expect(row.getByTestId('user-status-disabled')).toBeVisible()

  // Their next request is refused and the page goes to sign-in.
  await buyer.getByTestId('nav-studies').click()
  await expect(buyer).toHaveURL(/\/sign-in/)
  await expect(buyer.getByTestId('sign-in-error')).toContainText('session has ended')
  await shot(buyer, 'admin-people-07-buyer-signed-out')

  // ------------------------------------------------------------------ copper index
  const effective = new Date(Date.now() + 3 * 86_400_000).toISOString().slice(0, 10)
  await admin.getByTestId('admin-section-price-lists').click()
  await expect(admin.getByTestId('price-list-detail')).toBeVisible()
  await shot(admin, 'admin-people-08-price-lists')
  await admin.getByTestId('prices-tab-copper').click()
  await expect(admin.getByTestId('copper-history')).toBeVisible()
  await admin.getByTestId('copper-value').locator('input').fill('10.15')
  await admin.getByTestId('copper-date').locator('input').fill(effective)
  await admin.getByTestId('copper-add').click()
  const added = admin.getByTestId(`copper-row-${effective}`)
  await expect(added).toContainText('10.15')
  await expect(added).toContainText('scheduled')
  await shot(admin, 'admin-people-09-copper')

  // ------------------------------------------------------------------ the audit log shows it all
  await admin.getByTestId('admin-section-audit-log').click()
  await expect(admin.getByTestId('audit-table')).toBeVisible()
  await admin.getByTestId('audit-actor').locator('input').fill('admin@ashcombe.test')
  await expect(admin.getByTestId('audit-row-copper_index-value-added').first()).toBeVisible()
  await expect(admin.getByTestId('audit-row-user-disabled').first()).toBeVisible()
  await expect(admin.getByTestId('audit-row-user-invited').first()).toBeVisible()
  await shot(admin, 'admin-people-10-audit')
  await admin.getByTestId('admin-section-organisations').click()
  await expect(admin.getByTestId('organisation-row-Larkspur Air Appliances')).toBeVisible()
  await shot(admin, 'admin-people-11-organisations')

  await buyerContext.close()
  await adminContext.close()
})
