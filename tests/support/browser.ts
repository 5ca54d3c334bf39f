// Debian's chromium driven by playwright-core, with the flags this closed network needs.
import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium } from 'playwright-core'
import { afterAll, beforeAll } from 'vitest'
import type { BrowserContext, Page } from 'playwright-core'
import { fakeMidiScript } from './fake-midi'
import { baseUrl, DEMO_PASSWORD } from './server'
import { uniqueEmail } from './studio'

export interface BrowserSession {
  context: BrowserContext
  page: Page
  close: () => Promise<void>
}

export async function openBrowser(options: { initScript?: string } = {}): Promise<BrowserSession> {
  const profile = await mkdtemp(join(tmpdir(), 'evenhand-chromium-'))
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    baseURL: baseUrl(),
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
      '--disable-component-update', '--disable-sync', '--autoplay-policy=no-user-gesture-required'],
  })
  if (options.initScript) await context.addInitScript(options.initScript)
  const page = context.pages()[0] ?? await context.newPage()
  return {
    context,
    page,
    close: async () => {
      await context.close()
      await rm(profile, { recursive: true, force: true })
    },
  }
}

/**
 * One browser for a whole test file: opened (by `open`, a plain one unless told) before the file's
 * first test, closed after its last. Its `page` and `context` are read inside tests and later hooks.
 */
export function browserForFile(open: () => Promise<BrowserSession> = () => openBrowser()): BrowserSession {
  let session: BrowserSession | undefined
  beforeAll(async () => {
    session = await open()
  })
  afterAll(async () => {
    await session?.close()
  })
  const current = (): BrowserSession => {
    if (!session) throw new Error('The file\'s browser opens before its first test: read it inside a test or a later hook.')
    return session
  }
  return {
    get context() {
      return current().context
    },
    get page() {
      return current().page
    },
    close: () => current().close(),
  }
}

export async function signInAs(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto('/login')
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password').fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
}

/** A new teacher's studio, opened through the sign-up page; the page ends on the teacher's home. */
export async function signUpTeacher(page: Page, name: string): Promise<void> {
  await page.goto('/signup')
  await page.getByLabel('Your name').fill(name)
  await page.getByLabel('E-mail').fill(uniqueEmail('studio'))
  await page.getByLabel('Password').fill('long-enough-1')
  await page.getByRole('button', { name: 'Open my studio' }).click()
  await page.waitForURL(/\/teacher$/)
}

/**
 * The demo student, signed in, in a browser whose Web MIDI is the fake keyboard of fake-midi.ts;
 * `initScripts` run before page scripts too (such as audio-tap.ts).
 */
export async function openStudentWithFakeMidi(initScripts: string[] = []): Promise<BrowserSession> {
  const session = await openBrowser({ initScript: [fakeMidiScript, ...initScripts].join(';\n') })
  await signInAs(session.page, 'student@evenhand.test')
  await session.page.waitForURL(/\/student$/)
  return session
}
