import { Note } from 'tonal'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DrillNote } from '../../shared/types/drill'
import { openBrowser, signInAs } from '../support/browser'
import type { BrowserSession } from '../support/browser'
import { FAKE_MIDI_INPUT_NAME, fakeMidiScript } from '../support/fake-midi'
import { closeTestDb, testDb } from '../support/server'

// The demo student is assigned every demo drill (two classes and one drill set of her own),
// so each one can be practised end to end: opened, played on MIDI, graded and saved.
let browser: BrowserSession
let drills: { id: number, title: string, notes: DrillNote[] }[]

beforeAll(async () => {
  const rows = await testDb()('drills').orderBy('id').select('id', 'title', 'notes')
  drills = rows.map(r => ({ id: Number(r.id), title: r.title, notes: typeof r.notes === 'string' ? JSON.parse(r.notes) : r.notes }))
  browser = await openBrowser({ initScript: fakeMidiScript })
  await signInAs(browser.page, 'student@evenhand.test')
  await browser.page.waitForURL(/\/student$/)
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('every demo drill', () => {
  it('has twelve drills to practise', () => {
    expect(drills).toHaveLength(12)
  })

  it.each(Array.from({ length: 12 }, (_, i) => i))('plays, grades and saves demo drill %i', async (i) => {
    const drill = drills[i]!
    const { page } = browser
    await page.goto(`/practice/${drill.id}`)
    await page.getByTestId('drill-title').filter({ hasText: drill.title }).waitFor()
    await page.locator('#midi-input').selectOption({ label: FAKE_MIDI_INPUT_NAME })
    const bpm = Number(await page.locator('#tempo').inputValue())
    await page.getByTestId('start').click()
    await page.getByTestId('phase').filter({ hasText: 'Playing' }).waitFor({ timeout: 15_000 })
    const beatMs = 60_000 / bpm
    const notes = drill.notes.map(n => ({ note: Note.midi(n.pitch)!, velocity: 70, atMs: n.beat * beatMs, holdMs: n.length * beatMs * 0.9 }))
    await page.evaluate(n => (window as unknown as { __fakeMidi: { play: (n: unknown) => Promise<void> } }).__fakeMidi.play(n), notes)
    await page.getByTestId('save-state').filter({ hasText: 'saved' }).waitFor({ timeout: 15_000 })
    expect(await page.getByTestId('attempt-accuracy').textContent()).toContain(`${drill.notes.length} / ${drill.notes.length} right`)
  })
})
