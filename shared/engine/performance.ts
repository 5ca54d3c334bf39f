// From raw key events to notes with a start and an end: the first step of grading and of the
// attempt's MIDI export. Raw events come from browsers and devices, so nothing is assumed about
// their order or completeness.
import type { PlayedEvent } from './types'

export interface PlayedNote {
  midi: number
  onMs: number
  /** Null where the key was never released (the attempt ended while it was held). */
  offMs: number | null
  /** Null where the input had no velocity (on-screen keys without pressure). */
  velocity: number | null
  /** Index of the note-on in the event list it came from. */
  eventIndex: number
}

function isNoteOn(event: PlayedEvent): boolean {
  // MIDI 1.0: a note-on with velocity 0 is a note-off (running-status devices send it that way).
  return event.on && event.velocity !== 0
}

function isUsable(event: PlayedEvent): boolean {
  return Number.isInteger(event.note) && event.note >= 0 && event.note <= 127 && Number.isFinite(event.timeMs)
}

/**
 * Pairs each note-on with the next release of the same key, in time order. At equal times a
 * release is taken before a press, so a fast repeat is two notes; a press of a key already down
 * ends the held note there; releases with no press before them are dropped.
 */
export function pairNoteEvents(events: readonly PlayedEvent[]): PlayedNote[] {
  const order: number[] = []
  const time = new Float64Array(events.length)
  const press = new Uint8Array(events.length)
  for (let i = 0; i < events.length; i++) {
    const event = events[i]!
    if (!isUsable(event)) continue
    order.push(i)
    time[i] = event.timeMs
    press[i] = isNoteOn(event) ? 1 : 0
  }
  order.sort((a, b) => time[a]! - time[b]! || press[a]! - press[b]! || a - b)
  const held: (PlayedNote | undefined)[] = Array.from({ length: 128 })
  const notes: PlayedNote[] = []
  for (const index of order) {
    const event = events[index]!
    const open = held[event.note]
    if (open) {
      open.offMs = event.timeMs
      held[event.note] = undefined
    }
    if (press[index]) {
      const note: PlayedNote = { midi: event.note, onMs: event.timeMs, offMs: null, velocity: event.velocity ?? null, eventIndex: index }
      notes.push(note)
      held[event.note] = note
    }
  }
  return notes
}
