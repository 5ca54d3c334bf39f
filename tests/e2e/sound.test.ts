// The practice page's piano, heard through chromium's own Web Audio graph: every connection to the
// loudspeaker is also fed to analysers (audio-tap.ts), and fake MIDI keys play the sampled piano.
import { Note } from 'tonal'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import type { Page } from 'playwright-core'
import { audioTapScript } from '../support/audio-tap'
import { browserForFile, openStudentWithFakeMidi } from '../support/browser'
import { FAKE_MIDI_INPUT_NAME } from '../support/fake-midi'
import { assignedDrill, openDrill } from '../support/practice'
import { closeTestDb, testDb } from '../support/server'
import type { DrillNote } from '../../shared/types/drill'

interface Heard { level: number, pitchHz: number, after: number }
interface Followed { atMs: number, hz: number, db: number }
interface AudioTap {
  running: () => number
  peakLevel: (ms: number) => Promise<number>
  strongestBetween: (lowHz: number, highHz: number) => number
  follow: (lowHz: number, highHz: number, ms: number, everyMs: number) => Promise<Followed[]>
}

// Equal temperament from A4 = 440 Hz (ISO 16) with MIDI note 69 = A4 (MIDI 1.0 note numbers).
const hz = (midi: number): number => 440 * 2 ** ((midi - 69) / 12)
/** A quarter of a semitone: any mistuned sample or wrong stretch is a semitone or more out. */
const QUARTER_SEMITONE = 2 ** (1 / 48) - 1

const browser = browserForFile(() => openStudentWithFakeMidi([audioTapScript]))

/** Follows the loudest pitch between `lowHz` and `highHz` for `ms`, every 20 ms. */
function follow(page: Page, lowHz: number, highHz: number, ms: number): Promise<Followed[]> {
  return page.evaluate(({ lowHz, highHz, ms }) => (window as unknown as { __audioTap: AudioTap }).__audioTap.follow(lowHz, highHz, ms, 20), { lowHz, highHz, ms })
}

/** The notes heard, in order: each reading within 25 dB of the loudest, at its nearest MIDI note, repeats merged. */
function melody(heard: Followed[]): number[] {
  const loudest = Math.max(...heard.map(h => h.db))
  const notes = heard.filter(h => h.db > loudest - 25).map(h => Math.round(69 + 12 * Math.log2(h.hz / 440)))
  return notes.filter((n, i) => i === 0 || n !== notes[i - 1])
}

/** Whether `part` appears in `whole` in order, other notes allowed between. */
function inOrder(part: number[], whole: number[]): boolean {
  let k = 0
  for (const n of whole) if (n === part[k]) k++
  return k === part.length
}

const midiOf = (notes: DrillNote[]): number[] => notes.map(n => Note.midi(n.pitch)!)

/**
 * Presses `note` with `velocity` (and the sustain pedal first, if `pedal`), reads the loudest level
 * while it is held and its pitch near the expected one, releases it, and reads the level `afterMs`
 * later (the piano's dampers take 0.4 s).
 */
function strike(page: Page, note: number, velocity: number, options: { pedal?: boolean, holdMs?: number, afterMs?: number } = {}): Promise<Heard> {
  const args = { note, velocity, expectHz: hz(note), pedal: options.pedal ?? false, holdMs: options.holdMs ?? 400, afterMs: options.afterMs ?? 800 }
  return page.evaluate(async ({ note, velocity, expectHz, pedal, holdMs, afterMs }) => {
    const w = window as unknown as {
      __fakeMidi: { send: (data: number[]) => void }
      __audioTap: AudioTap
    }
    if (pedal) w.__fakeMidi.send([0xB0, 64, 127])
    w.__fakeMidi.send([0x90, note, velocity])
    const level = await w.__audioTap.peakLevel(holdMs)
    const pitchHz = w.__audioTap.strongestBetween(expectHz * 0.85, expectHz * 1.15)
    w.__fakeMidi.send([0x80, note, 0])
    await new Promise(r => setTimeout(r, afterMs))
    const after = await w.__audioTap.peakLevel(50)
    return { level, pitchHz, after }
  }, args)
}

beforeAll(async () => {
  const row = await testDb()('drills').where({ title: 'C major scale, right hand' }).first('id')
  const { page } = browser
  await page.goto(`/practice/${row.id}`)
  await page.locator('#play-with').selectOption({ label: `${FAKE_MIDI_INPUT_NAME} (MIDI)` })
  await page.getByTestId('drill-title').click() // a user gesture, which browsers want before audio
  await page.waitForFunction(() => (window as unknown as { __audioTap: AudioTap }).__audioTap.running() > 0)
  // The samples load in the background; a key sounds once they are decoded.
  await vi.waitFor(async () => {
    if ((await strike(page, 60, 100, { holdMs: 150, afterMs: 500 })).level < 0.001) throw new Error('The piano is still silent')
  }, { timeout: 20_000, interval: 200 })
})
afterAll(closeTestDb)

describe('the piano on the practice page', () => {
  it('sounds a sampled key at its pitch, and a key between samples stretched to its own pitch', async () => {
    // One context for the piano and metronome: tone's own, made on import, is closed.
    expect(await browser.page.evaluate(() => (window as unknown as { __audioTap: AudioTap }).__audioTap.running())).toBe(1)
    const c4 = await strike(browser.page, 60, 110) // C4 has a sample of its own
    const d4 = await strike(browser.page, 62, 110) // D4 has none: tone's sampler stretches C4 or D♯4
    expect(c4.level).toBeGreaterThan(0.01)
    expect(Math.abs(c4.pitchHz / hz(60) - 1)).toBeLessThan(QUARTER_SEMITONE)
    expect(d4.level).toBeGreaterThan(0.01)
    expect(Math.abs(d4.pitchHz / hz(62) - 1)).toBeLessThan(QUARTER_SEMITONE)
  })

  it('plays louder for a harder key press and stops when the key is released', async () => {
    const soft = await strike(browser.page, 60, 30)
    const loud = await strike(browser.page, 60, 110)
    // The sampler's gain follows velocity in proportion: 110 / 30 ≈ 3.7.
    expect(loud.level / soft.level).toBeGreaterThan(2.5)
    expect(loud.level / soft.level).toBeLessThan(5)
    expect(loud.after).toBeLessThan(loud.level * 0.02)
  })

  it('keeps a released key sounding while the sustain pedal is down, and stops it when the pedal lifts', async () => {
    const { page } = browser
    const released = await strike(page, 64, 110)
    const held = await strike(page, 64, 110, { pedal: true })
    // The string rings on, fading as a piano's does, where without the pedal it was damped.
    expect(held.after).toBeGreaterThan(released.after * 5)
    expect(held.after).toBeGreaterThan(held.level * 0.03)
    await page.evaluate(() => (window as unknown as { __fakeMidi: { send: (d: number[]) => void } }).__fakeMidi.send([0xB0, 64, 0]))
    await page.waitForTimeout(800)
    const after = await page.evaluate(() => (window as unknown as { __audioTap: AudioTap }).__audioTap.peakLevel(50))
    expect(after).toBeLessThan(held.level * 0.02)
  })

  it('is silent with the piano sound turned off', async () => {
    const { page } = browser
    const sound = page.getByLabel('Piano sound')
    await sound.uncheck()
    const muted = await strike(page, 60, 110)
    await sound.check()
    const heard = await strike(page, 60, 110)
    expect(muted.level).toBeLessThan(heard.level * 0.01)
  })
})

describe('the app\'s own playing', () => {
  it('plays the drill for "listen first", each note at its pitch in the drill\'s order', async () => {
    const { page } = browser
    const five = await assignedDrill('Five-finger pattern in C, right hand', 'Tuesday Starters')
    await openDrill(page, five, `?assignment=${five.assignmentId}`)
    await page.getByTestId('start').filter({ hasText: 'Start' }).waitFor({ timeout: 20_000 })
    const beatMs = 60_000 / Number(await page.locator('#tempo').inputValue())
    const lastMs = Math.max(...five.notes.map(n => (n.beat + n.length) * beatMs))
    await page.getByTestId('practice-tools').locator('summary').click()
    await page.getByTestId('listen').click()
    // C4 to G4, a little either side; the notes' overtones lie above.
    const heard = await follow(page, hz(60) * 0.95, hz(67) * 1.05, lastMs + 1200)
    expect(Math.max(...heard.map(h => h.db))).toBeGreaterThan(-60)
    const notes = melody(heard)
    expect(inOrder(midiOf(five.notes), notes), `heard ${notes.join(' ')}`).toBe(true)
    await page.getByTestId('announcer').filter({ hasText: 'Your turn.' }).waitFor({ timeout: 20_000 })
  })

  it('sounds the other hand at tempo while the student plays one hand, and nothing there when it is set silent', async () => {
    const { page } = browser
    const both = await assignedDrill('D major scale, hands together', 'Thursday Developing')
    const left = both.notes.filter(n => n.hand === 'left')
    // The left hand's register below the right hand's first note (D4), which the left hand ends on too.
    const below = left.filter(n => Note.midi(n.pitch)! < 62)
    const [lowHz, highHz] = [hz(Note.midi(below[0]!.pitch)!) * 0.95, hz(61) * 1.03]
    await openDrill(page, both, `?assignment=${both.assignmentId}`)
    await page.getByTestId('start').filter({ hasText: 'Start' }).waitFor({ timeout: 20_000 })
    await page.getByTestId('practice-tools').locator('summary').click()
    await page.locator('#hand').selectOption('right')
    const beatMs = 60_000 / Number(await page.locator('#tempo').inputValue())
    const spanMs = Math.max(...left.map(n => (n.beat + n.length) * beatMs))

    /** One pass in which the student plays nothing: what the left hand's register holds from the start to the end. */
    const pass = async (): Promise<Followed[]> => {
      await page.getByTestId('start').click()
      await page.getByTestId('phase').filter({ hasText: 'Playing' }).waitFor({ timeout: 15_000 })
      const heard = await follow(page, lowHz, highHz, spanMs + 600)
      await page.getByRole('button', { name: 'Stop, don\'t keep' }).click()
      return heard
    }

    expect(await page.getByTestId('other-hand').isChecked()).toBe(true)
    const sounded = await pass()
    const notes = melody(sounded)
    expect(inOrder(midiOf(below), notes), `heard ${notes.join(' ')}`).toBe(true)
    await page.getByTestId('other-hand').uncheck()
    const silent = await pass()
    // Only the metronome's clicks (C6 and G6) reach that register when the other hand is silent.
    expect(Math.max(...silent.map(h => h.db))).toBeLessThan(Math.max(...sounded.map(h => h.db)) - 20)
    await page.getByTestId('other-hand').check()
  })
})
