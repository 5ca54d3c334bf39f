// The practice page's piano, heard through chromium's own Web Audio graph: every connection to the
// loudspeaker is also fed to analysers (audio-tap.ts), and fake MIDI keys play the sampled piano.
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import type { Page } from 'playwright-core'
import { audioTapScript } from '../support/audio-tap'
import { openStudentWithFakeMidi } from '../support/browser'
import type { BrowserSession } from '../support/browser'
import { FAKE_MIDI_INPUT_NAME } from '../support/fake-midi'
import { closeTestDb, testDb } from '../support/server'

interface Heard { level: number, pitchHz: number, after: number }
interface AudioTap { running: () => number, peakLevel: (ms: number) => Promise<number>, strongestBetween: (lowHz: number, highHz: number) => number }

// Equal temperament from A4 = 440 Hz (ISO 16) with MIDI note 69 = A4 (MIDI 1.0 note numbers).
const hz = (midi: number): number => 440 * 2 ** ((midi - 69) / 12)
/** A quarter of a semitone: any mistuned sample or wrong stretch is a semitone or more out. */
const QUARTER_SEMITONE = 2 ** (1 / 48) - 1

let browser: BrowserSession

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
  browser = await openStudentWithFakeMidi([audioTapScript])
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
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

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
