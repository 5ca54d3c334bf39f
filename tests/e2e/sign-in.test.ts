import { describe, expect, it } from 'vitest'
import { browserForFile, signInAs } from '../support/browser'

const browser = browserForFile()

describe('signing in', () => {
  it('sends a signed-out visitor to the sign-in page', async () => {
    await browser.page.goto('/student')
    await browser.page.waitForURL(/\/login/)
    expect(await browser.page.getByRole('heading', { name: 'Sign in' }).isVisible()).toBe(true)
  })

  it('shows a wrong password as a message, not an error page', async () => {
    await signInAs(browser.page, 'teacher@evenhand.test', 'not-the-password')
    await expect.poll(() => browser.page.getByRole('alert').textContent()).toContain('Wrong e-mail or password')
  })

  it('brings the demo teacher to the studio home with the demo classes', async () => {
    await signInAs(browser.page, 'teacher@evenhand.test')
    await browser.page.waitForURL(/\/teacher$/)
    await expect.poll(() => browser.page.getByTestId('class-card').count()).toBe(2)
    expect(await browser.page.getByText('Tuesday Starters').first().isVisible()).toBe(true)
    await browser.page.getByTestId('class-card').filter({ hasText: 'Tuesday Starters' }).getByRole('link', { name: 'See progress' }).click()
    await expect.poll(() => browser.page.getByTestId('progress-table').locator('tbody tr').count()).toBe(3)
    await browser.page.getByRole('button', { name: 'Sign out' }).click()
    await browser.page.waitForURL(/\/login/)
  })

  it('brings the demo student to their practice home with assignments and the safety caution', async () => {
    await signInAs(browser.page, 'student@evenhand.test')
    await browser.page.waitForURL(/\/student$/)
    await expect.poll(() => browser.page.getByTestId('assignment-card').count()).toBeGreaterThanOrEqual(3)
    expect(await browser.page.getByLabel('Practise safely').textContent()).toMatch(/stop/i)
  })
})
