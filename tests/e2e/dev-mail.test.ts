// /dev/mail in chromium: the local mail box shows the admin a message the app just sent (a password
// link asked for on the sign-in side), its link works from there, and other accounts are refused.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { makeAccount, TEST_PASSWORD } from '../support/accounts'
import type { TestAccount } from '../support/accounts'
import { browserForFile, signInAs } from '../support/browser'
import { waitForMail } from '../support/mail'
import { closeTestDb } from '../support/server'

const browser = browserForFile()
let admin: TestAccount

beforeAll(async () => {
  admin = await makeAccount('admin', 'Mailbox Admin')
})
afterAll(closeTestDb)

describe('the local mail box', () => {
  it('shows the admin a password e-mail the app sent, whose link opens the new-password page', async () => {
    const { page } = browser
    await page.goto('/forgot-password')
    await page.getByLabel('E-mail').fill(admin.email)
    await page.getByRole('button', { name: 'Send me a link' }).click()
    await page.getByRole('status').filter({ hasText: admin.email }).waitFor()
    // The worker sends it within a moment; the list reads what the mail server stored.
    await waitForMail(admin.email)

    await signInAs(page, admin.email, TEST_PASSWORD)
    await page.waitForURL(url => url.pathname !== '/login')
    await page.goto('/dev/mail')
    const row = page.getByTestId('dev-mail-list').getByRole('link').filter({ hasText: `To ${admin.email}` })
    expect(await row.count()).toBe(1)
    expect(await row.textContent()).toContain('Choose a new Evenhand password')
    await row.click()
    await page.waitForURL(/\/dev\/mail\/[\w-]+\.eml$/)
    await page.getByRole('heading', { level: 1, name: 'Choose a new Evenhand password' }).waitFor()
    expect(await page.getByText(`to ${admin.email}`).count()).toBeGreaterThan(0)

    const link = page.getByTestId('dev-mail-text').getByRole('link', { name: /\/reset-password\?token=/ })
    await page.goto((await link.getAttribute('href'))!)
    await page.getByRole('heading', { name: 'Choose a new password' }).waitFor()
    await page.getByLabel('New password').fill('a-fresh-admin-password-9')
    await page.getByRole('button', { name: 'Save and sign in' }).click()
    // Signed in with the new password and sent home; a refused link would leave its reason in an alert here.
    await expect.poll(async () => new URL(page.url()).pathname !== '/reset-password' || (await page.getByRole('alert').allTextContents()).join(' '), { timeout: 15_000 }).toBe(true)
    expect(await page.getByTestId('signed-in-as').textContent()).toBe('Mailbox Admin')
  })

  it('shows a demo account the same mail box, and refuses an account of a real studio', async () => {
    const { page } = browser
    await page.getByRole('button', { name: 'Sign out', exact: true }).click()
    await page.waitForURL(/\/login/)
    await signInAs(page, 'teacher@evenhand.test')
    await page.waitForURL(/\/teacher$/)
    await page.goto('/dev/mail')
    expect(await page.getByTestId('dev-mail-list').getByRole('link').filter({ hasText: `To ${admin.email}` }).count()).toBe(1)

    await page.getByRole('button', { name: 'Sign out', exact: true }).click()
    await page.waitForURL(/\/login/)
    const outsider = `outsider-${Date.now().toString(36)}@example.org`
    await page.goto('/signup')
    await page.getByLabel('Your name').fill('Rafe Tolland')
    await page.getByLabel('E-mail').fill(outsider)
    await page.getByLabel('Password').fill('long-enough-outsider-1')
    await page.getByRole('button', { name: 'Open my studio' }).click()
    await page.waitForURL(/\/teacher$/)
    await page.goto('/dev/mail')
    await page.locator('[data-problem="forbidden"]').waitFor()
    expect(await page.getByRole('heading', { level: 2, name: 'This mail box isn\'t yours to open' }).count()).toBe(1)
    expect(await page.getByTestId('dev-mail-list').count()).toBe(0)
  })
})
