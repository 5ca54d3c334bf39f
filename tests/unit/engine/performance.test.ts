import { describe, expect, it } from 'vitest'
import { pairNoteEvents } from '../../../shared/engine/performance'

describe('pairNoteEvents', () => {
  // MIDI 1.0 specification: a note-on with velocity 0 acts as a note-off.
  it('pairs presses with releases, velocity-0 note-ons included, in time order', () => {
    const notes = pairNoteEvents([
      { note: 62, on: true, velocity: 0, timeMs: 450 },
      { note: 60, on: true, velocity: 80, timeMs: 0 },
      { note: 62, on: true, velocity: 70, timeMs: 200 },
      { note: 60, on: false, timeMs: 220 },
    ])
    expect(notes).toEqual([
      { midi: 60, onMs: 0, offMs: 220, velocity: 80, eventIndex: 1 },
      { midi: 62, onMs: 200, offMs: 450, velocity: 70, eventIndex: 2 },
    ])
  })

  it('drops releases without a press, ends a held key at its next press, keeps a repeat at one time as two notes', () => {
    const notes = pairNoteEvents([
      { note: 64, on: false, timeMs: 0 },
      { note: 64, on: true, velocity: 50, timeMs: 100 },
      { note: 64, on: true, velocity: 60, timeMs: 300 },
      { note: 64, on: true, velocity: 70, timeMs: 500 },
      { note: 64, on: false, timeMs: 500 },
    ])
    expect(notes.map(n => [n.onMs, n.offMs, n.velocity])).toEqual([[100, 300, 50], [300, 500, 60], [500, null, 70]])
  })

  it('keeps a missing velocity as null', () => {
    expect(pairNoteEvents([{ note: 60, on: true, timeMs: 0 }])[0]!.velocity).toBeNull()
  })
})
