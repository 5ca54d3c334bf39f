// No attempt a student played is lost, and none is stored twice, whatever happens while it is saved:
// the page reloaded mid-save, the browser offline when the attempt ends, MariaDB stopped and started again,
// the same attempt sent from two tabs at once. Chromium through playwright-core, the built server, and the
// test stack's own MariaDB; each case ends with exactly one row holding the events the browser recorded.
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import type { Page, Request, Response, Route } from 'playwright-core'
import type { PlayedEvent } from '../../shared/types/attempt'
import { openStudentWithFakeMidi } from '../support/browser'
import type { BrowserSession } from '../support/browser'
import { attemptBody, scaleDrill } from '../support/attempts'
import { startTestMariadb, stopTestMariadb, testMariadb } from '../support/mariadb'
import { assignedDrill, openDrill, PLAY_WITH_LABEL, playDrill, playNotes, startPlaying } from '../support/practice'
import type { AssignedDrill } from '../support/practice'
import { Client, closeTestDb, testDb } from '../support/server'

interface OutboxEntry { attempt: { id: string, events: PlayedEvent[] }, lastError: string | null, tries: number }

let browser: BrowserSession
let drill: AssignedDrill

beforeAll(async () => {
  drill = await assignedDrill('Five-finger pattern in C, right hand', 'Tuesday Starters')
  browser = await openStudentWithFakeMidi()
})
// A case that failed leaves its attempt behind; the next case starts from an empty outbox all the same.
// The app is left first (a live outbox would write its entries back), then the storage is emptied on a
// page of the same origin that runs none of the app's scripts.
afterEach(async () => {
  await browser.page.goto('about:blank')
  await browser.page.goto('/api/health')
  await browser.page.evaluate(() => Object.keys(localStorage).filter(k => k.startsWith('evenhand.outbox.')).forEach(k => localStorage.removeItem(k)))
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

const sleep = (ms: number): Promise<void> => new Promise(r => setTimeout(r, ms))

function isAttemptSave(request: Request): boolean {
  return request.method() === 'POST' && new URL(request.url()).pathname === '/api/attempts'
}

/**
 * Every POST /api/attempts of the browser goes through `handle`; anything else goes on. Returns the
 * function that removes the interception.
 */
async function interceptSaves(handle: (route: Route) => void): Promise<() => Promise<void>> {
  const matcher = (url: URL): boolean => url.pathname === '/api/attempts'
  await browser.context.route(matcher, route => (isAttemptSave(route.request()) ? handle(route) : route.fallback()))
  return () => browser.context.unroute(matcher)
}

/** What the page's outbox keeps in localStorage (one key per attempt). */
function outbox(page: Page): Promise<OutboxEntry[]> {
  return page.evaluate(() => Object.keys(localStorage).filter(k => k.startsWith('evenhand.outbox.'))
    .map(k => JSON.parse(localStorage.getItem(k)!) as OutboxEntry))
}

/** The stored rows with this id, events parsed. */
async function stored(id: string): Promise<{ events: PlayedEvent[] }[]> {
  const rows = await testDb()('attempts').where({ id }).select('events')
  return rows.map(r => ({ events: typeof r.events === 'string' ? JSON.parse(r.events) : r.events }))
}

/** The one attempt waiting in the outbox, checked to hold every key press and release. */
async function onlyWaiting(page: Page): Promise<OutboxEntry> {
  const entries = await outbox(page)
  expect(entries).toHaveLength(1)
  expect(entries[0]!.attempt.events.filter(e => e.on)).toHaveLength(drill.notes.length)
  expect(entries[0]!.attempt.events).toHaveLength(drill.notes.length * 2)
  return entries[0]!
}

/** The outbox of every page empties, and the attempt is stored exactly once with the events the browser kept. */
async function storedOnce(entry: OutboxEntry, pages: Page[], timeout = 30_000): Promise<void> {
  for (const page of pages) await expect.poll(async () => (await outbox(page)).length, { timeout }).toBe(0)
  const rows = await stored(entry.attempt.id)
  expect(rows).toHaveLength(1)
  expect(rows[0]!.events).toEqual(entry.attempt.events)
}

const query = (): string => `?assignment=${drill.assignmentId}`

describe('an attempt whose page is reloaded while it is saving', () => {
  it.each([
    ['before the request reached the server', false],
    ['after the server stored it, its answer lost', true],
  ])('is kept and stored once: %s', async (_, reached) => {
    const { page } = browser
    const held: Route[] = []
    const release = await interceptSaves(route => void held.push(route))
    await playDrill(page, drill, query())
    await expect.poll(() => held.length).toBe(1)
    // The attempt is on the device before its request left.
    const entry = await onlyWaiting(page)
    if (reached) {
      const answer = await held[0]!.fetch()
      expect(answer.status()).toBe(201)
      expect(await stored(entry.attempt.id)).toHaveLength(1)
    }
    else {
      expect(await stored(entry.attempt.id)).toHaveLength(0)
    }
    await release()
    // The student reloads before any answer arrives; the app sends what waits as soon as it is up again.
    await page.reload()
    await storedOnce(entry, [page])
  })
})

describe('an attempt that ends while the browser is offline', () => {
  it('waits on the device and is stored once when the connection is back', async () => {
    const { page, context } = browser
    await openDrill(page, drill, query())
    await page.locator('#play-with').selectOption({ label: PLAY_WITH_LABEL.midi })
    const beatMs = await startPlaying(page)
    await context.setOffline(true)
    try {
      await playNotes(page, drill.notes, beatMs, 'midi')
      await page.getByTestId('save-state').filter({ hasText: 'waiting to save' }).waitFor()
      const entry = await onlyWaiting(page)
      expect(entry.lastError).toMatch(/No connection/)
      expect(await stored(entry.attempt.id)).toHaveLength(0)
      // Offline a while longer: a retry in the meantime fails again and keeps it.
      await expect.poll(async () => (await outbox(page))[0]?.tries ?? 0, { timeout: 15_000 }).toBeGreaterThanOrEqual(2)
      expect(await stored(entry.attempt.id)).toHaveLength(0)
      await context.setOffline(false)
      await storedOnce(entry, [page])
    }
    finally {
      await context.setOffline(false)
    }
  })
})

describe('attempts saved while MariaDB is stopped and started again', () => {
  it('answers 503 with Retry-After during the outage, then stores every attempt once, without restarting the app', async () => {
    const { page } = browser
    const student = await new Client().signIn('student@evenhand.test')
    const scale = await scaleDrill(student)
    const replies: { status: number, retryAfter: number }[] = []
    const acknowledged = new Map<string, PlayedEvent[]>()
    let running = true
    // A second student device saving all along, as the outbox does: each attempt again with the same id
    // until the server takes it, after the pause Retry-After asks for (at most a second here).
    const device = (async () => {
      while (running) {
        const body = attemptBody(scale)
        for (;;) {
          const res = await student.post('/api/attempts', body)
          replies.push({ status: res.status, retryAfter: Number(res.headers.get('retry-after')) })
          if (res.status === 201 || res.status === 200) break
          if (res.status !== 503) throw new Error(`unexpected ${res.status}: ${JSON.stringify(res.body)}`)
          await sleep(Math.min(1000, replies.at(-1)!.retryAfter * 1000))
        }
        acknowledged.set(String(body.id), body.events as PlayedEvent[])
        await sleep(150)
      }
    })()
    await expect.poll(() => acknowledged.size).toBeGreaterThanOrEqual(3)

    await openDrill(page, drill, query())
    await page.locator('#play-with').selectOption({ label: PLAY_WITH_LABEL.midi })
    const beatMs = await startPlaying(page)
    const mariadb = await testMariadb()
    await stopTestMariadb(mariadb)
    let entry: OutboxEntry | undefined
    try {
      // The attempt ends with MariaDB down: the server says 503 and the browser keeps it.
      await playNotes(page, drill.notes, beatMs, 'midi')
      await page.getByTestId('save-state').filter({ hasText: 'waiting to save' }).waitFor({ timeout: 30_000 })
      entry = await onlyWaiting(page)
      await expect.poll(() => replies.filter(r => r.status === 503).length, { timeout: 30_000 }).toBeGreaterThanOrEqual(3)
      const health = await fetch(`${process.env.EVENHAND_TEST_URL}/api/health`)
      expect(health.status).toBe(503)
    }
    finally {
      await startTestMariadb(mariadb)
      // The test's own pool held connections to the stopped server.
      await closeTestDb()
    }

    await storedOnce(entry!, [page], 60_000)
    const countBefore = acknowledged.size
    await expect.poll(() => acknowledged.size, { timeout: 30_000 }).toBeGreaterThan(countBefore + 2)
    running = false
    await device

    // Every refusal was a 503 with a Retry-After; nothing else failed.
    const refused = replies.filter(r => r.status !== 201 && r.status !== 200)
    expect(refused.length).toBeGreaterThanOrEqual(3)
    expect(new Set(refused.map(r => r.status))).toEqual(new Set([503]))
    expect(refused.every(r => r.retryAfter >= 1)).toBe(true)
    // Each acknowledged attempt is stored exactly once with its events.
    const rows = await testDb()('attempts').whereIn('id', [...acknowledged.keys()]).select('id', 'events')
    expect(rows.map(r => r.id).sort()).toEqual([...acknowledged.keys()].sort())
    for (const row of rows) {
      expect(typeof row.events === 'string' ? JSON.parse(row.events) : row.events).toEqual(acknowledged.get(row.id))
    }
    expect((await fetch(`${process.env.EVENHAND_TEST_URL}/api/health`)).status).toBe(200)
  })
})

describe('one attempt sent from two tabs at once', () => {
  it('is stored once, one tab told it was made and the other that it exists, and both let it go', async () => {
    const { page, context } = browser
    let mode: 'refuse' | 'hold' = 'refuse'
    const held: Route[] = []
    const release = await interceptSaves((route) => {
      if (mode === 'refuse') void route.abort('connectionrefused')
      else held.push(route)
    })
    const second = await context.newPage()
    let onResponse: ((res: Response) => void) | undefined
    try {
      await playDrill(page, drill, query())
      await page.getByTestId('save-state').filter({ hasText: 'waiting to save' }).waitFor()
      const entry = await onlyWaiting(page)
      mode = 'hold'
      // The second tab reads the attempt from the storage both share and sends it as soon as it is up;
      // the first tab's outbox sends it again on its next retry.
      await second.goto('/student')
      await expect.poll(() => new Set(held.map(r => r.request().frame().page())).size, { timeout: 30_000 }).toBe(2)
      expect(held.map(r => (r.request().postDataJSON() as { id: string }).id)).toEqual([entry.attempt.id, entry.attempt.id])
      const statuses: number[] = []
      onResponse = (res) => {
        if (isAttemptSave(res.request())) statuses.push(res.status())
      }
      context.on('response', onResponse)
      // Both copies reach the server together.
      await Promise.all(held.map(r => r.continue()))
      await expect.poll(() => statuses.length, { timeout: 15_000 }).toBe(2)
      expect(statuses.sort()).toEqual([200, 201])
      await storedOnce(entry, [page, second])
    }
    finally {
      if (onResponse) context.off('response', onResponse)
      await release()
      await second.close()
    }
  })
})
