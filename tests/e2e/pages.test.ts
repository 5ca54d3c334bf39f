// What every page owes a visitor besides its content: failures told apart, fields that say what is
// wrong with them, a skip link, and the page's description and icon.
import { describe, expect, it } from 'vitest'
import { browserForFile, signInAs } from '../support/browser'

const browser = browserForFile()

// Signed out first: the forms and the page furniture; then signed in, the failures.
describe('forms', () => {
  it('puts each field\'s error beside the field and ties it to the field for screen readers', async () => {
    await browser.page.goto('/signup')
    await browser.page.getByLabel('Your name').fill('Ines Marrow')
    await browser.page.getByLabel('E-mail').fill('not-an-address')
    await browser.page.getByLabel('Password').fill('short')
    await browser.page.getByRole('button', { name: 'Open my studio' }).click()
    const email = browser.page.getByLabel('E-mail')
    await expect.poll(() => email.getAttribute('aria-invalid')).toBe('true')
    const described = await email.getAttribute('aria-describedby')
    expect(await browser.page.locator(`#${described}`).textContent()).toContain('Enter a valid e-mail address')
    const password = browser.page.getByLabel('Password')
    const passwordIds = (await password.getAttribute('aria-describedby'))!.split(' ')
    const passwordTexts = await Promise.all(passwordIds.map(id => browser.page.locator(`#${id}`).textContent()))
    expect(passwordTexts.join(' ')).toContain('at least 8 characters')
    expect(await browser.page.getByLabel('Your name').getAttribute('aria-invalid')).toBeNull()
  })
})

describe('every page', () => {
  it('offers a skip link first, and has a description and an icon', async () => {
    await browser.page.goto('/login')
    await browser.page.keyboard.press('Tab')
    expect(await browser.page.evaluate(() => document.activeElement?.textContent?.trim())).toBe('Skip to content')
    expect(await browser.page.locator('meta[name="description"]').getAttribute('content')).toMatch(/fingering/i)
    const icon = await browser.page.locator('link[rel="icon"]').getAttribute('href')
    const reply = await browser.page.request.get(icon!)
    expect(reply.status()).toBe(200)
    expect(reply.headers()['content-type']).toContain('svg')
  })
})
describe('failures', () => {
  it('answers an unknown address with a 404 page that leads back home', async () => {
    await signInAs(browser.page, 'student@evenhand.test')
    await browser.page.waitForURL(/\/student$/)
    const response = await browser.page.goto('/no-such-page')
    expect(response?.status()).toBe(404)
    expect(await browser.page.getByRole('heading', { level: 1 }).textContent()).toContain('This page isn\'t here')
    expect(await browser.page.getByRole('link', { name: 'Back home' }).isVisible()).toBe(true)
  })

  it('tells a missing attempt from a lost connection', async () => {
    await browser.page.goto('/attempts/00000000-0000-4000-8000-000000000000')
    expect(await browser.page.locator('[data-problem]').getAttribute('data-problem')).toBe('missing')
    expect(await browser.page.getByRole('heading', { level: 1 }).textContent()).toContain('This attempt isn\'t here')

    // Offline, a page change inside the app (its code already loaded) finds no server at all.
    await browser.page.goto('/student')
    await browser.context.setOffline(true)
    try {
      await browser.page.evaluate(async () => {
        const app = (document.querySelector('#__nuxt') as unknown as { __vue_app__: { config: { globalProperties: { $router: { push: (to: string) => Promise<unknown> } } } } }).__vue_app__
        await app.config.globalProperties.$router.push('/attempts/00000000-0000-4000-8000-000000000001')
      })
      await expect.poll(() => browser.page.locator('[data-problem]').getAttribute('data-problem')).toBe('offline')
      expect(await browser.page.getByRole('button', { name: 'Try again' }).isVisible()).toBe(true)
    }
    finally {
      await browser.context.setOffline(false)
    }
  })
})
