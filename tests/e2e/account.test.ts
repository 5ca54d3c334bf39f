// The settings page's account section in chromium, on a teacher of its own (the demo accounts keep
// their password and address): a new name, a new password that the next sign-in needs, and a new
// e-mail that waits for its link.
import { beforeAll, describe, expect, it } from 'vitest'
import { browserForFile, signInAs } from '../support/browser'
import { linkIn, waitForMail } from '../support/mail'
import { uniqueEmail } from '../support/studio'

const FIRST_PASSWORD = 'first-long-password-1'
const SECOND_PASSWORD = 'second-long-password-2'

const browser = browserForFile()
let email: string

beforeAll(async () => {
  email = uniqueEmail('settings')
  const { page } = browser
  await page.goto('/signup')
  await page.getByLabel('Your name').fill('Maren Obi')
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(FIRST_PASSWORD)
  await page.getByRole('button', { name: 'Open my studio' }).click()
  await page.waitForURL(/\/teacher$/)
})

async function openSettings(): Promise<void> {
  await browser.page.goto('/settings')
  await browser.page.getByRole('heading', { name: 'Your account' }).waitFor()
}

describe('the account section of the settings page', () => {
  it('saves a new name, which the header shows and a reload keeps', async () => {
    const { page } = browser
    await openSettings()
    expect(await page.getByLabel('Your name').inputValue()).toBe('Maren Obi')
    await page.getByLabel('Your name').fill('Maren Obi-Lund')
    await page.getByRole('button', { name: 'Save name' }).click()
    await page.getByRole('status').filter({ hasText: 'Name saved.' }).waitFor()
    await expect.poll(() => page.getByTestId('signed-in-as').textContent()).toBe('Maren Obi-Lund')
    await page.reload()
    expect(await page.getByLabel('Your name').inputValue()).toBe('Maren Obi-Lund')
  })

  it('refuses a wrong current password beside the field, then changes it so that only the new one signs in', async () => {
    const { page } = browser
    await openSettings()
    await page.locator('#account-current-password').fill('not-my-password')
    await page.locator('#account-new-password').fill(SECOND_PASSWORD)
    await page.getByRole('button', { name: 'Change password' }).click()
    const current = page.locator('#account-current-password')
    await expect.poll(() => current.getAttribute('aria-invalid')).toBe('true')
    expect(await page.locator(`#${await current.getAttribute('aria-describedby')}`).textContent()).toMatch(/password/i)

    await current.fill(FIRST_PASSWORD)
    await page.getByRole('button', { name: 'Change password' }).click()
    await page.getByRole('status').filter({ hasText: 'Password changed' }).waitFor()
    expect(await current.inputValue()).toBe('')

    await page.getByRole('button', { name: 'Sign out', exact: true }).click()
    await page.waitForURL(/\/login/)
    await signInAs(page, email, FIRST_PASSWORD)
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('Wrong e-mail or password')
    await signInAs(page, email, SECOND_PASSWORD)
    await page.waitForURL(/\/teacher$/)
  })

  it('shows a new e-mail as waiting until its link is opened, and signs in with the old one meanwhile', async () => {
    const { page } = browser
    const newEmail = uniqueEmail('moved')
    await openSettings()
    await page.getByLabel('New e-mail').fill(newEmail)
    await page.locator('#account-email-password').fill(SECOND_PASSWORD)
    await page.getByRole('button', { name: 'Send confirmation link' }).click()
    await page.getByRole('status').filter({ hasText: `We sent a link to ${newEmail}` }).waitFor()
    await expect.poll(() => page.getByTestId('pending-email').textContent()).toContain(newEmail)

    // Still waiting after a reload: the server keeps the pending address, the sign-in e-mail is unchanged.
    await page.reload()
    expect(await page.getByTestId('pending-email').textContent()).toContain(newEmail)
    expect(await page.getByText(`Signed in as ${email}.`).isVisible()).toBe(true)

    const [mail] = await waitForMail(newEmail)
    await page.goto(linkIn(mail!, '/confirm-email').toString())
    await page.getByRole('button', { name: 'Confirm my new e-mail' }).click()
    await page.getByRole('status').filter({ hasText: newEmail }).waitFor()
    await openSettings()
    expect(await page.getByText(`Signed in as ${newEmail}.`).isVisible()).toBe(true)
    expect(await page.getByTestId('pending-email').count()).toBe(0)
  })
})
