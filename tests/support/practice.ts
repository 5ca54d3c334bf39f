// Playing a drill on the practice page as a student would: open it, pick the input, start the
// count-in, then press every note evenly at the page's tempo, on the fake MIDI keyboard, the
// computer keys or the on-screen keys.
import { Note } from 'tonal'
import type { Page } from 'playwright-core'
import type { DrillNote } from '../../shared/types/drill'
import { COMPUTER_KEY_MAP } from '../../composables/useComputerKeys'
import { FAKE_MIDI_INPUT_NAME } from './fake-midi'
import { testDb } from './server'

export interface AssignedDrill { id: number, title: string, notes: DrillNote[], assignmentId: number, targetBpm: number }

/** A demo drill by title, with its assignment to a class and the target tempo set there. */
export async function assignedDrill(title: string, className: string): Promise<AssignedDrill> {
  const db = testDb()
  const row = await db('drills').where({ title }).first('id', 'notes', 'title')
  const item = await db('assignments as a').join('drill_set_items as i', 'i.drill_set_id', 'a.drill_set_id')
    .join('classes as c', 'c.id', 'a.class_id').where('i.drill_id', row.id).where('c.name', className).first('a.id', 'i.target_tempo_bpm')
  return { id: Number(row.id), title: row.title, notes: typeof row.notes === 'string' ? JSON.parse(row.notes) : row.notes, assignmentId: Number(item.id), targetBpm: Number(item.target_tempo_bpm) }
}

export type PlayedOn = 'midi' | 'computer-keys' | 'screen'

/** The "Play with" choice for each input, as the practice page and the settings label it. */
export const PLAY_WITH_LABEL: Record<PlayedOn, string> = {
  'midi': `${FAKE_MIDI_INPUT_NAME} (MIDI)`,
  'computer-keys': 'The computer keys',
  'screen': 'The on-screen keys',
}

export async function openDrill(page: Page, drill: { id: number, title?: string }, query = ''): Promise<void> {
  await page.goto(`/practice/${drill.id}${query}`)
  await page.getByTestId('drill-title').filter({ hasText: drill.title ?? '' }).waitFor()
}

/** Starts the count-in (once the piano is loaded) and waits until playing begins; gives one beat in ms. */
export async function startPlaying(page: Page): Promise<number> {
  const beatMs = 60_000 / Number(await page.locator('#tempo').inputValue())
  await page.getByTestId('start').filter({ hasText: 'Start' }).or(page.getByTestId('start').filter({ hasText: 'Play again' })).click({ timeout: 20_000 })
  // The count-in counts down the bar's beats beside the metronome's dot, then playing starts.
  await page.getByTestId('beat').filter({ hasText: /^\s*\d+\s*$/ }).waitFor({ timeout: 15_000 })
  await page.getByTestId('phase').filter({ hasText: 'Playing' }).waitFor({ timeout: 15_000 })
  return beatMs
}

/** The computer key (KeyboardEvent.code) that plays a note at the key map's default octave (A = C4). */
function computerKeyFor(midi: number): string {
  const key = COMPUTER_KEY_MAP.find(k => 60 + k.semitone === midi)
  if (!key) throw new Error(`No computer key plays MIDI note ${midi} at the default octave`)
  return key.code
}

/** Plays the notes now (playing must have started), as `playDrill` does after its count-in. */
export async function playNotes(page: Page, notes: DrillNote[], beatMs: number, on: PlayedOn): Promise<void> {
  const timed = notes.map(n => ({ note: Note.midi(n.pitch)!, velocity: 72, atMs: n.beat * beatMs, holdMs: n.length * beatMs * 0.92 }))
  if (on === 'midi') {
    await page.evaluate(n => (window as unknown as { __fakeMidi: { play: (n: unknown) => Promise<void> } }).__fakeMidi.play(n), timed)
    return
  }
  // Keys and pointers are driven from the test, one note after the other, at the drill's pace.
  const t0 = Date.now()
  for (const n of timed) {
    await new Promise(r => setTimeout(r, Math.max(0, t0 + n.atMs - Date.now())))
    if (on === 'computer-keys') {
      const code = computerKeyFor(n.note)
      await page.keyboard.down(code)
      await new Promise(r => setTimeout(r, n.holdMs * 0.5))
      await page.keyboard.up(code)
    }
    else {
      const key = page.locator(`[data-testid="keyboard"] [data-midi="${n.note}"]`)
      await key.dispatchEvent('pointerdown', { button: 0, pointerId: 1, isPrimary: true })
      await new Promise(r => setTimeout(r, n.holdMs * 0.5))
      await key.dispatchEvent('pointerup', { button: 0, pointerId: 1, isPrimary: true })
    }
  }
}

export async function playDrill(page: Page, drill: { id: number, notes: DrillNote[], title?: string }, query = '', on: PlayedOn = 'midi'): Promise<void> {
  await openDrill(page, drill, query)
  await page.locator('#play-with').selectOption({ label: PLAY_WITH_LABEL[on] })
  const beatMs = await startPlaying(page)
  await playNotes(page, drill.notes, beatMs, on)
  await page.getByTestId('attempt-report').waitFor({ timeout: 15_000 })
}
