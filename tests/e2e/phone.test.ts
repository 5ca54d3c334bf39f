// The main pages of a teacher and of a student on a phone held upright (390 × 844 CSS px): nothing
// wider than the screen, the navigation on one row with its links behind a menu, and every control
// at least 24 × 24 px (WCAG 2.2, 2.5.8 Target Size (Minimum), with its inline-link exception).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { openBrowser, signInAs } from '../support/browser'
import type { BrowserSession } from '../support/browser'
import { demoPaths } from '../support/demo'
import type { DemoPaths } from '../support/demo'
import { closeTestDb } from '../support/server'

const WIDTH = 390
const HEIGHT = 844
/** WCAG 2.2 success criterion 2.5.8: a target at least 24 by 24 CSS pixels. */
const MIN_TARGET_PX = 24

let teacher: BrowserSession
let student: BrowserSession
let paths: DemoPaths

beforeAll(async () => {
  paths = await demoPaths()
  ;[teacher, student] = await Promise.all([openBrowser(), openBrowser()])
  for (const [session, email, home] of [[teacher, 'teacher@evenhand.test', /\/teacher$/], [student, 'student@evenhand.test', /\/student$/]] as const) {
    await session.page.setViewportSize({ width: WIDTH, height: HEIGHT })
    await signInAs(session.page, email)
    await session.page.waitForURL(home)
  }
})
afterAll(async () => {
  await Promise.all([teacher, student].map(b => b?.close()))
  await closeTestDb()
})

interface Fit { scrollWidth: number, small: string[], wide: string[] }

/** How wide the page is, and the visible controls smaller than the minimum target. */
function measure(page: Page): Promise<Fit> {
  return page.evaluate((min) => {
    const small: string[] = []
    const controls = document.querySelectorAll<HTMLElement>('a[href], button, input:not([type="hidden"]), select, textarea, summary, [role="button"], [role="tab"], [role="slider"]')
    for (const el of controls) {
      const style = getComputedStyle(el)
      if (style.visibility === 'hidden' || el.closest('[aria-hidden="true"], .sr-only')) continue
      // The on-screen piano's keys keep a piano's proportions (an essential layout, 2.5.8's exception); the page asks to turn the phone.
      if (el.closest('[data-testid="keyboard"]')) continue
      let box = el.getBoundingClientRect()
      if (box.width === 0 && box.height === 0) continue
      // A box or button inside its label: the whole label is what a finger taps.
      const label = el.closest('label')
      if (label && el.matches('input')) box = label.getBoundingClientRect()
      // A link inside a sentence is exempt (2.5.8's inline exception).
      const parent = el.parentElement
      const inSentence = el.tagName === 'A' && style.display === 'inline' && !!parent
        && [...parent.childNodes].some(n => n !== el && n.nodeType === Node.TEXT_NODE && (n.textContent ?? '').trim() !== '')
      if (inSentence) continue
      if (box.width < min || box.height < min) {
        const name = (el.getAttribute('aria-label') ?? el.textContent ?? el.getAttribute('name') ?? '').trim().slice(0, 40)
        small.push(`${el.tagName.toLowerCase()} “${name}” ${Math.round(box.width)}×${Math.round(box.height)}`)
      }
    }
    // Where the page grows wider than the screen: the outermost elements that reach past its edge.
    const wide: string[] = []
    for (const el of document.body.querySelectorAll<HTMLElement>('*')) {
      const right = el.getBoundingClientRect().right
      const parent = el.parentElement
      if (right > innerWidth + 1 && parent && parent.getBoundingClientRect().right <= innerWidth + 1 && wide.length < 3) {
        wide.push(`${el.tagName.toLowerCase()}.${[...el.classList].slice(0, 4).join('.')} to ${Math.round(right)} px`)
      }
    }
    return { scrollWidth: document.documentElement.scrollWidth, small, wide }
  }, MIN_TARGET_PX)
}

async function navIsOneRow(page: Page): Promise<number> {
  return (await page.getByRole('navigation', { name: 'Main' }).boundingBox())!.height
}

describe('on a phone held upright', () => {
  const pagesOf = (): [string, () => BrowserSession, string][] => [
    ['teacher home', () => teacher, '/teacher'],
    ['classes', () => teacher, '/teacher/classes'],
    ['a class', () => teacher, `/teacher/classes/${paths.classId}`],
    ['drill sets', () => teacher, '/teacher/sets'],
    ['a drill set', () => teacher, `/teacher/sets/${paths.setId}`],
    ['a student, as the teacher', () => teacher, `/teacher/students/${paths.studentId}`],
    ['a student\'s drill, as the teacher', () => teacher, `/teacher/students/${paths.studentId}/drills/${paths.drillId}`],
    ['an attempt, as the teacher', () => teacher, `/attempts/${paths.attemptId}`],
    ['settings, as the teacher', () => teacher, '/settings'],
    ['local mail', () => teacher, '/dev/mail'],
    ['student home', () => student, '/student'],
    ['habits', () => student, '/student/habits'],
    ['a drill\'s progress', () => student, `/student/drills/${paths.drillId}`],
    ['practice', () => student, `/practice/${paths.drillId}`],
    ['an attempt, as the student', () => student, `/attempts/${paths.attemptId}`],
    ['settings, as the student', () => student, '/settings'],
  ]

  it('fits every main page in the screen\'s width, with the navigation on one row and targets of 24 px or more', async () => {
    const failures: string[] = []
    for (const [name, who, path] of pagesOf()) {
      const { page } = who()
      await page.goto(path, { waitUntil: 'networkidle' })
      await page.locator('details').evaluateAll(all => all.forEach(d => d.setAttribute('open', '')))
      const fit = await measure(page)
      if (fit.scrollWidth > WIDTH) failures.push(`${name}: ${fit.scrollWidth} px wide (${fit.wide.join('; ')})`)
      failures.push(...fit.small.map(s => `${name}: ${s}`))
      const navHeight = await navIsOneRow(page)
      if (navHeight >= 70) failures.push(`${name}: the navigation is ${navHeight} px tall`)
    }
    expect(failures).toEqual([])
  })

  it('folds the teacher\'s links behind a menu that opens, leads on and closes again', async () => {
    const { page } = teacher
    await page.goto('/teacher')
    const nav = page.getByRole('navigation', { name: 'Main' })
    const menu = nav.getByRole('button', { name: 'Menu' })
    expect(await menu.getAttribute('aria-expanded')).toBe('false')
    expect(await nav.getByRole('link', { name: 'Drill sets' }).isVisible()).toBe(false)

    await menu.click()
    expect(await nav.getByRole('button', { name: 'Close menu' }).getAttribute('aria-expanded')).toBe('true')
    for (const label of ['Studio', 'Classes', 'Drills', 'Drill sets', 'Settings']) {
      expect(await nav.getByRole('link', { name: label, exact: true }).isVisible(), label).toBe(true)
    }
    expect(await nav.getByRole('button', { name: 'Sign out' }).isVisible()).toBe(true)
    const open = await measure(page)
    expect(open.small).toEqual([])
    expect(open.scrollWidth).toBeLessThanOrEqual(WIDTH)

    await nav.getByRole('link', { name: 'Drill sets' }).click()
    await page.waitForURL(/\/teacher\/sets$/)
    await expect.poll(() => nav.getByRole('link', { name: 'Drill sets' }).isVisible()).toBe(false)
    expect(await nav.getByRole('button', { name: 'Menu' }).getAttribute('aria-expanded')).toBe('false')
  })

  it('keeps every link in one row, with no menu button, on a tablet and a laptop', async () => {
    const { page } = teacher
    for (const width of [768, 1024, 1280]) {
      await page.setViewportSize({ width, height: 800 })
      await page.goto('/teacher')
      const nav = page.getByRole('navigation', { name: 'Main' })
      expect(await nav.getByRole('button', { name: 'Menu' }).isVisible(), `${width}`).toBe(false)
      const tops = await Promise.all(['Studio', 'Classes', 'Drills', 'Drill sets', 'Settings'].map(async label => (await nav.getByRole('link', { name: label, exact: true }).boundingBox())!.y))
      expect(new Set(tops).size, `${width}`).toBe(1)
      expect(await nav.getByRole('button', { name: 'Sign out' }).isVisible(), `${width}`).toBe(true)
      expect(await page.evaluate(() => document.documentElement.scrollWidth), `${width}`).toBeLessThanOrEqual(width)
    }
    await page.setViewportSize({ width: WIDTH, height: HEIGHT })
  })
})
