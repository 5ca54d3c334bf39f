// Playing a drill on the practice page through the fake Web MIDI input, as a student would:
// open it, pick the keyboard, start the count-in, then press every note evenly at the page's tempo.
import { Note } from 'tonal'
import type { Page } from 'playwright-core'
import type { DrillNote } from '../../shared/types/drill'
import { FAKE_MIDI_INPUT_NAME } from './fake-midi'

export async function playDrill(page: Page, drill: { id: number, notes: DrillNote[], title?: string }, query = ''): Promise<void> {
  await page.goto(`/practice/${drill.id}${query}`)
  await page.getByTestId('drill-title').filter({ hasText: drill.title ?? '' }).waitFor()
  await page.locator('#midi-input').selectOption({ label: FAKE_MIDI_INPUT_NAME })
  const beatMs = 60_000 / Number(await page.locator('#tempo').inputValue())
  await page.getByTestId('start').click()
  // The count-in counts down the bar's beats beside the metronome's dot, then playing starts.
  await page.getByTestId('beat').filter({ hasText: /^\s*\d+\s*$/ }).waitFor({ timeout: 15_000 })
  await page.getByTestId('phase').filter({ hasText: 'Playing' }).waitFor({ timeout: 15_000 })
  const notes = drill.notes.map(n => ({ note: Note.midi(n.pitch)!, velocity: 72, atMs: n.beat * beatMs, holdMs: n.length * beatMs * 0.92 }))
  await page.evaluate(n => (window as unknown as { __fakeMidi: { play: (n: unknown) => Promise<void> } }).__fakeMidi.play(n), notes)
  await page.getByTestId('attempt-report').waitFor({ timeout: 15_000 })
}
