// The progress pages in chromium: the demo student's drill chart, an attempt played back with
// its keys lighting in time, and the teacher reaching the same student's habits from the class table.
import type { Page } from 'playwright-core'
import { afterAll, afterEach, beforeEach, describe, expect, it } from 'vitest'
import { openBrowser, signInAs } from '../support/browser'
import type { BrowserSession } from '../support/browser'
import { closeTestDb, testDb } from '../support/server'

let browser: BrowserSession
beforeEach(async () => {
  browser = await openBrowser()
})
afterEach(async () => {
  await browser?.close()
})
afterAll(closeTestDb)

async function asStudent(): Promise<Page> {
  await signInAs(browser.page, 'student@evenhand.test')
  await browser.page.waitForURL(/\/student$/)
  return browser.page
}

async function noor(): Promise<number> {
  return Number((await testDb()('users').where({ email: 'student@evenhand.test' }).first('id')).id)
}

describe('progress in the browser', () => {
  it('shows the demo student one point per seeded attempt of a drill and a trend line', async () => {
    const id = await noor()
    const row = await testDb()('attempts').where('student_id', id).groupBy('drill_id').orderByRaw('COUNT(*) DESC').first('drill_id', testDb().raw('COUNT(*) AS n'))
    const page = await asStudent()
    await page.goto(`/student/drills/${row.drill_id}`)
    const score = page.getByRole('region', { name: 'Score' })
    await score.scrollIntoViewIfNeeded()
    const chart = score.getByTestId('progress-chart')
    await expect.poll(() => chart.getAttribute('data-points')).toBe(String(row.n))
    expect(await chart.getAttribute('data-trend')).toBe('yes')
    // The canvas really drew something: not every pixel is transparent.
    await expect.poll(() => chart.locator('canvas').evaluate((c: HTMLCanvasElement) => {
      const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data
      let ink = 0
      for (let i = 3; i < d.length; i += 4) if (d[i]! > 0) ink++
      return ink
    })).toBeGreaterThan(1000)
    await score.getByText('Show the numbers').click()
    expect(await score.locator('tbody tr').filter({ has: page.locator('a') }).count()).toBe(Number(row.n))
    expect(await score.getByTestId('figure-summary').textContent()).toMatch(/over \d+ attempts/)
  })

  it('plays an attempt back with each key lighting at its time', async () => {
    const id = await noor()
    const attempt = await testDb()('attempts').where('student_id', id).orderBy('started_at', 'desc').first('id', 'events')
    const events: { note: number, on: boolean, timeMs: number }[] = typeof attempt.events === 'string' ? JSON.parse(attempt.events) : attempt.events
    const page = await asStudent()
    await page.goto(`/attempts/${attempt.id}`)
    const playback = page.getByTestId('playback')
    await playback.scrollIntoViewIfNeeded()
    await page.evaluate(() => {
      const w = window as unknown as { __lit: { midi: number, t: number }[] }
      w.__lit = []
      const root = document.querySelector('[data-testid="playback"]')!
      new MutationObserver((list) => {
        for (const m of list) {
          const el = m.target as HTMLElement
          if (m.oldValue === null && el.hasAttribute('data-pressed')) w.__lit.push({ midi: Number(el.dataset.midi), t: performance.now() })
        }
      }).observe(root, { subtree: true, attributes: true, attributeFilter: ['data-pressed'], attributeOldValue: true })
    })
    await playback.getByTestId('speed').selectOption('0.5')
    await playback.getByTestId('play-attempt').click()
    const ons = events.filter(e => e.on).sort((a, b) => a.timeMs - b.timeMs)
    const origin = Math.min(0, ...events.map(e => e.timeMs))
    const count = Math.min(6, ons.length)
    await expect.poll(() => page.evaluate(() => (window as unknown as { __lit: unknown[] }).__lit.length), { timeout: 20_000 }).toBeGreaterThanOrEqual(count)
    const startedAt = Number(await playback.getAttribute('data-started-at'))
    const lit: { midi: number, t: number }[] = await page.evaluate(() => (window as unknown as { __lit: { midi: number, t: number }[] }).__lit)
    // At half speed a note due t ms into the attempt lights 2t ms after the start. Each within 100 ms
    // (a busy shared machine can hold one timer back), and typically within a frame or two.
    const offsets = lit.slice(0, count).map((l, k) => Math.abs(l.t - startedAt - 2 * (ons[k]!.timeMs - origin)))
    lit.slice(0, count).forEach((l, k) => expect(l.midi).toBe(ons[k]!.note))
    for (const off of offsets) expect(off).toBeLessThan(100)
    expect([...offsets].sort((x, y) => x - y)[Math.floor(count / 2)]).toBeLessThan(35)
    await playback.getByTestId('play-attempt').click()
    expect(await playback.getByTestId('download-midi').getAttribute('href')).toBe(`/api/attempts/${attempt.id}/export.mid`)
  })

  it('takes the teacher from the class table to the same student\'s habits', async () => {
    const { page } = browser
    await signInAs(page, 'teacher@evenhand.test')
    await page.waitForURL(/\/teacher$/)
    await page.getByTestId('class-card').filter({ hasText: 'Tuesday Starters' }).getByRole('link', { name: 'See progress' }).click()
    await page.getByTestId('progress-table').getByRole('link', { name: 'Noor Castellan', exact: true }).click()
    await page.waitForURL(new RegExp(`/teacher/students/${await noor()}$`))
    const habits = page.getByTestId('habits')
    await expect.poll(() => habits.getByTestId('habit-statement').count()).toBe(5)
    expect(await habits.getByTestId('habit-statement').first().textContent()).toMatch(/Noor's thumb is on average \d+ velocity units louder than Noor's other fingers over \d+ attempts/)
  })
})
