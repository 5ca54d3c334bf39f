import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { browserForFile, openStudentWithFakeMidi } from '../support/browser'
import { FAKE_MIDI_INPUT_NAME } from '../support/fake-midi'
import { assignedDrill, openDrill, PLAY_WITH_LABEL, playDrill } from '../support/practice'
import type { AssignedDrill, PlayedOn } from '../support/practice'
import { closeTestDb, testDb } from '../support/server'

const browser = browserForFile(openStudentWithFakeMidi)
let drill: AssignedDrill
let studentId: number

beforeAll(async () => {
  drill = await assignedDrill('Five-finger pattern in C, right hand', 'Tuesday Starters')
  studentId = Number((await testDb()('users').where({ email: 'student@evenhand.test' }).first('id')).id)
})
afterAll(closeTestDb)

function openDrillAndPlay(): Promise<void> {
  return playDrill(browser.page, drill, `?assignment=${drill.assignmentId}`)
}

async function latestAttempt(): Promise<{ id: string, score: number, events: unknown[] } | undefined> {
  const row = await testDb()('attempts').where({ student_id: studentId, drill_id: drill.id }).orderBy('created_at', 'desc').first()
  return row && { id: row.id, score: row.score, events: typeof row.events === 'string' ? JSON.parse(row.events) : row.events }
}

describe('practising an assigned drill on a MIDI keyboard', () => {
  it('shows the grade and stores the raw events with the server\'s score', async () => {
    const before = await latestAttempt()
    await openDrillAndPlay()
    const { page } = browser
    await page.getByTestId('save-state').filter({ hasText: 'saved' }).waitFor()
    expect(await page.getByTestId('attempt-accuracy').textContent()).toContain(`${drill.notes.length} / ${drill.notes.length} right`)
    const shown = Number(await page.getByTestId('attempt-score').textContent())
    const stored = await latestAttempt()
    expect(stored?.id).not.toBe(before?.id)
    expect(stored!.events).toHaveLength(drill.notes.length * 2)
    expect(stored!.score).toBe(shown)
    expect(shown).toBeGreaterThan(60)

    // The same attempt sent again (a retry after a lost answer) is stored once.
    const attempt = await testDb()('attempts').where({ id: stored!.id }).first()
    const status = await page.evaluate(async (body) => {
      const res = await fetch('/api/attempts', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) })
      return res.status
    }, {
      id: attempt.id, drillId: drill.id, drillVersion: attempt.drill_version, assignmentId: drill.assignmentId, startedAt: new Date(attempt.started_at).toISOString(),
      tempoBpm: Number(attempt.tempo_bpm), inputDevice: attempt.input_device, events: stored!.events,
    })
    expect(status).toBe(200)
    expect(await testDb()('attempts').where({ id: stored!.id }).count({ n: '*' })).toEqual([{ n: 1 }])
  })

  it('keeps an attempt played while the server is unreachable and saves it when it is back', async () => {
    const { page, context } = browser
    const before = await latestAttempt()
    await context.route('**/api/attempts', route => route.abort('connectionrefused'))
    await openDrillAndPlay()
    await page.getByTestId('save-state').filter({ hasText: 'waiting to save' }).waitFor()
    expect((await latestAttempt())?.id).toBe(before?.id)

    await context.unroute('**/api/attempts')
    await page.reload()
    await expect.poll(async () => (await latestAttempt())?.id, { timeout: 15_000 }).not.toBe(before?.id)
    expect((await latestAttempt())!.events).toHaveLength(drill.notes.length * 2)
  })
})

async function chosenInput(): Promise<string> {
  const { page } = browser
  return page.locator('#play-with').evaluate((el: HTMLSelectElement) => el.selectedOptions[0]?.textContent?.trim() ?? '')
}

describe('choosing what to play with', () => {
  it('switches from MIDI to the computer keys and back, on the practice page and in the settings, across reloads', async () => {
    const { page } = browser
    const errors: string[] = []
    page.on('pageerror', e => errors.push(e.message))
    await openDrill(page, drill)
    await expect.poll(() => page.locator('#play-with option').evaluateAll(all => all.map(o => o.textContent?.trim()))).toContain(PLAY_WITH_LABEL.midi)
    await page.locator('#play-with').selectOption({ label: PLAY_WITH_LABEL.midi })
    expect(await chosenInput()).toBe(PLAY_WITH_LABEL.midi)

    await page.locator('#play-with').selectOption({ label: PLAY_WITH_LABEL['computer-keys'] })
    expect(await chosenInput()).toBe(PLAY_WITH_LABEL['computer-keys'])
    // The key map shows on the practice page while the computer keys are the input.
    await page.getByTestId('key-map').waitFor()
    await page.reload()
    await expect.poll(() => page.locator('#play-with option').evaluateAll(all => all.map(o => o.textContent?.trim()))).toContain(PLAY_WITH_LABEL.midi)
    expect(await chosenInput()).toBe(PLAY_WITH_LABEL['computer-keys'])

    await page.goto('/settings')
    await expect.poll(() => page.locator('#play-with option').evaluateAll(all => all.map(o => o.textContent?.trim()))).toContain(PLAY_WITH_LABEL.midi)
    expect(await chosenInput()).toBe(PLAY_WITH_LABEL['computer-keys'])
    await page.locator('#play-with').selectOption({ label: PLAY_WITH_LABEL.midi })
    await page.reload()
    await expect.poll(() => page.getByTestId('midi-status').textContent()).toContain(`Listening to “${FAKE_MIDI_INPUT_NAME}”`)
    expect(await chosenInput()).toBe(PLAY_WITH_LABEL.midi)
    await page.locator('#play-with').selectOption({ label: PLAY_WITH_LABEL.screen })

    await openDrill(page, drill)
    await expect.poll(() => page.locator('#play-with option').evaluateAll(all => all.map(o => o.textContent?.trim()))).toContain(PLAY_WITH_LABEL.midi)
    expect(await chosenInput()).toBe(PLAY_WITH_LABEL.screen)
    expect(await page.getByTestId('key-map').count()).toBe(0)
    expect(errors).toEqual([])
  })

  it('opens at the teacher’s target tempo and says the grade compares with it', async () => {
    const { page } = browser
    await openDrill(page, drill, `?assignment=${drill.assignmentId}`)
    expect(Number(await page.locator('#tempo').inputValue())).toBe(drill.targetBpm)
    expect(await page.locator('#tempo').getAttribute('max')).toBe(String(drill.targetBpm))
    expect(await page.locator('#tempo-ceiling').textContent()).toContain(`Up to ${drill.targetBpm} bpm, the tempo your teacher set`)
  })
})

describe('the input an attempt records', () => {
  async function latest(): Promise<{ input_device: string, events: { velocity?: number }[], result: { scoreParts: { loudness: { weight: number } } } }> {
    const row = await testDb()('attempts').where({ student_id: studentId, drill_id: drill.id }).orderBy('created_at', 'desc').first()
    const parse = (v: unknown): never => (typeof v === 'string' ? JSON.parse(v) : v) as never
    return { input_device: row.input_device, events: parse(row.events), result: parse(row.result) }
  }

  it.each<[PlayedOn, boolean]>([
    ['computer-keys', false],
    ['screen', false],
    ['midi', true],
  ])('stores an attempt played on %s as such, with touch graded only from MIDI', async (on, hasTouch) => {
    const { page } = browser
    await playDrill(page, drill, `?assignment=${drill.assignmentId}`, on)
    await page.getByTestId('save-state').filter({ hasText: 'saved' }).waitFor()
    const stored = await latest()
    expect(stored.input_device).toBe(on)
    expect(stored.events.some(e => e.velocity !== undefined)).toBe(hasTouch)
    expect(stored.result.scoreParts.loudness.weight > 0).toBe(hasTouch)
    const summary = await page.getByTestId('touch-summary').textContent()
    if (hasTouch) expect(summary).toContain('Key velocities varied')
    else expect(summary).toContain('touch is not part of this score')
  })
})
