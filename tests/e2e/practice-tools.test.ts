import { Note } from 'tonal'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { DrillNote } from '../../shared/types/drill'
import { browserForFile, openStudentWithFakeMidi } from '../support/browser'
import { assignedDrill, openDrill, PLAY_WITH_LABEL, playDrill, startPlaying } from '../support/practice'
import type { AssignedDrill } from '../support/practice'
import { closeTestDb, testDb } from '../support/server'

const browser = browserForFile(openStudentWithFakeMidi)
let studentId: number
let five: AssignedDrill
let both: AssignedDrill

beforeAll(async () => {
  studentId = Number((await testDb()('users').where({ email: 'student@evenhand.test' }).first('id')).id)
  five = await assignedDrill('Five-finger pattern in C, right hand', 'Tuesday Starters')
  both = await assignedDrill('D major scale, hands together', 'Thursday Developing')
})
afterAll(closeTestDb)

function fakeMidiPlay(page: Page, notes: DrillNote[], beatMs: number): Promise<void> {
  const timed = notes.map(n => ({ note: Note.midi(n.pitch)!, velocity: 72, atMs: n.beat * beatMs, holdMs: n.length * beatMs * 0.92 }))
  return page.evaluate(n => (window as unknown as { __fakeMidi: { play: (n: unknown) => Promise<void> } }).__fakeMidi.play(n), timed)
}

async function latestAttempts(drillId: number, n: number): Promise<{ tempo_bpm: number, part_from_bar: number | null, part_to_bar: number | null, part_hand: string | null, total: number, created_at: Date }[]> {
  const rows = await testDb()('attempts').where({ student_id: studentId, drill_id: drillId }).orderBy('created_at', 'desc').limit(n)
  return rows.map(r => ({ ...r, tempo_bpm: Number(r.tempo_bpm), total: (typeof r.result === 'string' ? JSON.parse(r.result) : r.result).accuracy.total }))
}

async function openTools(page: Page): Promise<void> {
  await page.getByTestId('practice-tools').locator('summary').click()
}

/** The drill's page for its assignment, played on the MIDI keyboard, with the tools unfolded. */
async function openWithTools(page: Page, drill: AssignedDrill): Promise<void> {
  await openDrill(page, drill, `?assignment=${drill.assignmentId}`)
  await page.locator('#play-with').selectOption({ label: PLAY_WITH_LABEL.midi })
  await openTools(page)
}

/** The five-finger drill with its first bar chosen and looped; returns that bar's notes. */
async function loopFirstBar(page: Page): Promise<DrillNote[]> {
  await openWithTools(page, five)
  await page.locator('#to-bar').selectOption('1')
  await page.getByTestId('loop').check()
  return five.notes.filter(n => n.beat < 4)
}

describe('the practice tools', () => {
  it('loops a bar, saving each pass as an attempt of that bar, on a ladder that climbs after a good pass', async () => {
    const { page } = browser
    const bar1 = await loopFirstBar(page)
    await page.getByTestId('ladder').check()
    await page.getByLabel('After').selectOption('70')
    const start = Math.round(five.targetBpm * 0.7)
    expect(Number(await page.locator('#tempo').inputValue())).toBe(start)

    const beatMs = await startPlaying(page)
    await page.getByTestId('announcer').filter({ hasText: 'Play now.' }).waitFor()
    await fakeMidiPlay(page, bar1, beatMs)
    await page.getByRole('heading', { name: 'Pass 1' }).waitFor({ timeout: 15_000 })
    // The next pass counts in by itself, one step of the ladder faster.
    await page.getByTestId('phase').filter({ hasText: 'Playing' }).waitFor({ timeout: 15_000 })
    expect(Number(await page.locator('#tempo').inputValue())).toBe(start + 4)
    await fakeMidiPlay(page, bar1, 60_000 / (start + 4))
    await page.getByRole('heading', { name: 'Pass 2' }).waitFor({ timeout: 15_000 })
    await page.getByRole('button', { name: 'Stop, don\'t keep' }).click()

    await expect.poll(async () => (await latestAttempts(five.id, 2)).map(a => a.tempo_bpm), { timeout: 15_000 }).toEqual([start + 4, start])
    for (const a of await latestAttempts(five.id, 2)) {
      expect([a.part_from_bar, a.part_to_bar, a.part_hand, a.total]).toEqual([1, 1, null, bar1.length])
    }
  })

  it('loops without a count-in: the next pass starts one beat after the last, and each pass is saved', async () => {
    const { page } = browser
    const bar1 = await loopFirstBar(page)
    await page.getByTestId('loop-count-in').uncheck()
    const before = (await latestAttempts(five.id, 1))[0]?.created_at ?? new Date(0)

    const beatMs = await startPlaying(page)
    // From here on, every text the status and the beat show, with the page's own clock.
    await page.evaluate(() => {
      const seen: { at: number, phase: string, beat: string }[] = []
      ;(window as unknown as { __seen: typeof seen }).__seen = seen
      const read = (): void => {
        seen.push({ at: performance.now(), phase: document.querySelector('[data-testid="phase"]')!.textContent!.trim(), beat: document.querySelector('[data-testid="beat"]')!.textContent!.trim() })
      }
      new MutationObserver(read).observe(document.querySelector('[data-testid="phase"]')!.parentElement!, { subtree: true, childList: true, characterData: true })
    })
    await fakeMidiPlay(page, bar1, beatMs)
    await page.getByRole('heading', { name: 'Pass 1' }).waitFor({ timeout: 15_000 })
    await page.getByTestId('phase').filter({ hasText: 'Playing' }).waitFor({ timeout: 15_000 })
    const seen = await page.evaluate(() => (window as unknown as { __seen: { at: number, phase: string, beat: string }[] }).__seen)
    await fakeMidiPlay(page, bar1, beatMs)
    await page.getByRole('heading', { name: 'Pass 2' }).waitFor({ timeout: 15_000 })
    await page.getByRole('button', { name: 'Stop, don\'t keep' }).click()

    // Between the passes: no count-in (no "Count-in…", no countdown), and playing again one beat after the first
    // pass ended; a count-in would have taken a whole bar more.
    const between = seen.slice(seen.findIndex(s => s.phase.startsWith('Playing')) + 1)
    const ended = between.find(s => !s.phase.startsWith('Playing'))!
    const again = between.find(s => s.at > ended.at && s.phase.startsWith('Playing'))!
    expect(between.map(s => s.phase)).not.toContain('Count-in…')
    expect(between.filter(s => /^\d+$/.test(s.beat))).toEqual([])
    expect(again.at - ended.at).toBeGreaterThanOrEqual(beatMs * 0.9)
    expect(again.at - ended.at).toBeLessThan(beatMs * 3.5)

    await expect.poll(async () => (await latestAttempts(five.id, 2)).filter(a => a.created_at > before).length, { timeout: 15_000 }).toBe(2)
    for (const a of await latestAttempts(five.id, 2)) {
      expect([a.part_from_bar, a.part_to_bar, a.total]).toEqual([1, 1, bar1.length])
    }
    await page.getByTestId('loop').uncheck()
  })

  it('plays one hand of a both-hands drill while the app sounds the other, graded on that hand alone', async () => {
    const { page } = browser
    await openWithTools(page, both)
    await page.locator('#hand').selectOption('right')
    expect(await page.getByTestId('other-hand').isChecked()).toBe(true)
    const right = both.notes.filter(n => n.hand === 'right')
    // Only the right hand's notes are left to play.
    expect(await page.getByTestId('note-strip').locator('li').count()).toBe(right.length)
    const beatMs = await startPlaying(page)
    await fakeMidiPlay(page, right, beatMs)
    await page.getByTestId('attempt-report').waitFor({ timeout: 15_000 })
    await page.getByTestId('save-state').filter({ hasText: 'saved' }).waitFor()
    const [stored] = await latestAttempts(both.id, 1)
    expect([stored!.part_hand, stored!.total]).toEqual(['right', right.length])
    expect(stored!.tempo_bpm).toBeLessThanOrEqual(both.targetBpm)
  })

  it('practises a both-hands drill hands apart, in a loop on a ladder, on a phone held sideways', async () => {
    const { page } = browser
    await page.setViewportSize({ width: 844, height: 390 })
    try {
      await openWithTools(page, both)
      await page.locator('#hand').selectOption('right')
      await page.getByTestId('loop').check()
      await page.getByTestId('ladder').check()
      await page.getByLabel('After').selectOption('70')
      const start = Math.round(both.targetBpm * 0.7)
      expect(Number(await page.locator('#tempo').inputValue())).toBe(start)
      expect(await page.getByTestId('other-hand').isChecked()).toBe(true)
      const right = both.notes.filter(n => n.hand === 'right')
      const before = (await latestAttempts(both.id, 1))[0]?.created_at ?? new Date(0)

      const beatMs = await startPlaying(page)
      // While it plays, the keys take the phone's width and what the player reads is music-stand size (18 px or more).
      expect((await page.getByTestId('keyboard').boundingBox())!.width).toBeGreaterThan(500)
      const sizes = await page.evaluate(() => [document.querySelector('[data-testid="phase"]')!, document.querySelector('[data-testid="note-strip"] li span')!]
        .map(el => Number.parseFloat(getComputedStyle(el).fontSize)))
      expect(Math.min(...sizes)).toBeGreaterThanOrEqual(18)
      await fakeMidiPlay(page, right, beatMs)
      await page.getByRole('heading', { name: 'Pass 1' }).waitFor({ timeout: 15_000 })
      // The grade in sentences first; its formula only behind "How is this scored?".
      expect(await page.getByTestId('grade-sentences').locator('li').count()).toBeGreaterThan(0)
      expect(await page.getByTestId('score-formula').isVisible()).toBe(false)
      await page.getByText('How is this scored?').click()
      expect(await page.getByTestId('score-formula').isVisible()).toBe(true)
      // The next pass counts in by itself, one step of the ladder faster, the left hand sounded again.
      await page.getByTestId('phase').filter({ hasText: 'Playing' }).waitFor({ timeout: 15_000 })
      expect(Number(await page.locator('#tempo').inputValue())).toBe(start + 4)
      await fakeMidiPlay(page, right, 60_000 / (start + 4))
      await page.getByRole('heading', { name: 'Pass 2' }).waitFor({ timeout: 15_000 })
      await page.getByRole('button', { name: 'Stop, don\'t keep' }).click()

      await expect.poll(async () => (await latestAttempts(both.id, 2)).filter(a => a.created_at > before).map(a => a.tempo_bpm), { timeout: 15_000 }).toEqual([start + 4, start])
      for (const a of await latestAttempts(both.id, 2)) {
        expect([a.part_hand, a.total]).toEqual(['right', right.length])
        expect(a.tempo_bpm).toBeLessThanOrEqual(both.targetBpm)
      }
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(844)
      await page.getByTestId('loop').uncheck()
      await page.getByTestId('ladder').uncheck()
    }
    finally {
      await page.setViewportSize({ width: 1280, height: 720 })
    }
  })

  it('listens first: the app plays the drill, lighting its keys as it goes, then hands over', async () => {
    const { page } = browser
    await openDrill(page, five, `?assignment=${five.assignmentId}`)
    await page.getByTestId('start').filter({ hasText: 'Start' }).waitFor({ timeout: 20_000 })
    // Every key the page lights while listening, in order.
    await page.evaluate(() => {
      const seen: number[] = []
      ;(window as unknown as { __lit: number[] }).__lit = seen
      new MutationObserver((changes) => {
        for (const c of changes) {
          const el = c.target as HTMLElement
          if (el.hasAttribute('data-pressed') && seen.at(-1) !== Number(el.dataset.midi)) seen.push(Number(el.dataset.midi))
        }
      }).observe(document.querySelector('[data-testid="keyboard"]')!, { attributes: true, subtree: true, attributeFilter: ['data-pressed'] })
    })
    await openTools(page)
    await page.getByTestId('listen').click()
    await page.getByTestId('phase').filter({ hasText: 'Listening' }).waitFor()
    await page.getByTestId('announcer').filter({ hasText: 'Your turn.' }).waitFor({ timeout: 20_000 })
    const lit = await page.evaluate(() => (window as unknown as { __lit: number[] }).__lit)
    expect(lit).toEqual(five.notes.map(n => Note.midi(n.pitch)))
    expect(await page.locator('[data-testid="keyboard"] [data-pressed]').count()).toBe(0)
  })

  it('in focus mode shows only the drill, the keys, the status and the caution while playing', async () => {
    const { page } = browser
    await openDrill(page, five)
    await page.getByTestId('focus-mode').check()
    await startPlaying(page)
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false)
    expect(await page.getByTestId('practice-tools').count()).toBe(0)
    expect(await page.locator('#play-with').count()).toBe(0)
    for (const id of ['note-strip', 'keyboard', 'phase']) expect(await page.getByTestId(id).isVisible(), id).toBe(true)
    expect(await page.getByRole('complementary', { name: 'Practise safely' }).isVisible()).toBe(true)
    await page.getByRole('button', { name: 'Stop, don\'t keep' }).click()
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(true)
    await page.getByTestId('focus-mode').uncheck()
  })
})

describe('waiting and refusals on the practice page', () => {
  it('keeps the start waiting while the piano loads, showing how far it is', async () => {
    const { page, context } = browser
    let release: () => void = () => {}
    const held = new Promise<void>(r => (release = r))
    await context.route('**/samples/*.ogg', async (route) => {
      await held
      await route.continue()
    })
    await openDrill(page, five)
    const start = page.getByTestId('start')
    await start.filter({ hasText: /Piano loading · \d+ %/ }).waitFor()
    expect(await start.isDisabled()).toBe(true)
    release()
    await start.filter({ hasText: 'Start with count-in' }).waitFor({ timeout: 20_000 })
    expect(await start.isEnabled()).toBe(true)
    await context.unroute('**/samples/*.ogg')
  })

  it('shows an attempt the server refused, with its reason, until the student discards it', async () => {
    const { page, context } = browser
    const reason = 'drillVersion: This version of the drill does not exist'
    await context.route('**/api/attempts', route => (route.request().method() === 'POST'
      ? route.fulfill({ status: 400, contentType: 'application/json', body: JSON.stringify({ statusCode: 400, message: reason }) })
      : route.continue()))
    await playDrill(page, five, '', 'midi')
    await page.getByTestId('save-state').filter({ hasText: `not saved: ${reason}` }).waitFor()
    await context.unroute('**/api/attempts')
    const row = page.getByTestId('outbox-rejected')
    expect(await row.textContent()).toContain(reason)
    await row.getByRole('button', { name: 'Discard' }).click()
    expect(await page.getByTestId('outbox').count()).toBe(0)
    expect(await page.evaluate(() => Object.keys(localStorage).filter(k => k.startsWith('evenhand.outbox.')))).toEqual([])
  })
})
