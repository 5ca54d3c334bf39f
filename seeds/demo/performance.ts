// Makes believable raw key events for the demo's past attempts: a student who plays a drill with
// some unevenness in time and touch that shrinks over the weeks. Invented data for the demo only.
import type { PlayedEvent } from '../../shared/types/attempt'
import type { DrillNote } from '../../shared/types/drill'
import { Note } from 'tonal'
import { gaussian } from '../../shared/utils/random'

export interface PerformanceStyle {
  tempoBpm: number
  /** 0 (struggling) to 1 (secure): scales timing scatter, touch scatter and slips. */
  skill: number
  /** A finger the student leans on too heavily, 0 for none. */
  accentFinger: number
}

export function performDrill(notes: DrillNote[], style: PerformanceStyle, random: () => number): PlayedEvent[] {
  const msPerBeat = 60_000 / style.tempoBpm
  const timingSd = 8 + (1 - style.skill) * 45
  const velocitySd = 3 + (1 - style.skill) * 12
  const events: PlayedEvent[] = []
  for (const note of notes) {
    const slip = random()
    if (slip < (1 - style.skill) * 0.04) continue // a missed note
    let midi = Note.midi(note.pitch)!
    if (slip > 1 - (1 - style.skill) * 0.04) midi += random() < 0.5 ? 1 : -1 // a wrong neighbour key
    const onset = note.beat * msPerBeat + gaussian(random) * timingSd
    const base = 68 + (note.finger === style.accentFinger ? 16 : 0) - (note.finger === 4 || note.finger === 5 ? 5 : 0)
    const velocity = Math.max(12, Math.min(127, Math.round(base + gaussian(random) * velocitySd)))
    const held = note.length * msPerBeat * (0.85 + random() * 0.2)
    events.push({ note: midi, on: true, velocity, timeMs: Math.max(0, Math.round(onset)) })
    events.push({ note: midi, on: false, timeMs: Math.max(1, Math.round(onset + held)) })
  }
  return events.sort((a, b) => a.timeMs - b.timeMs)
}
