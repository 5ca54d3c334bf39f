import { describe, expect, it } from 'vitest'
import type { LiveNoteEvent } from '../../../shared/types/live'
import { playedInput, toPedalEvents, toPlayedEvents, trustedEvents } from '../../../shared/utils/timeline'

function note(n: number, on: boolean, timeStampMs: number): LiveNoteEvent {
  return { note: n, on, velocity: on ? 80 : 0, timeStampMs, source: 'midi' }
}

describe('toPlayedEvents', () => {
  it('keeps the count-in’s last beat and drops what came before it, releases included', () => {
    // At 60 bpm a beat is 1000 ms: -1500 is in the beat before the last, -800 in the last one.
    const events = toPlayedEvents([
      note(50, true, 3500),
      note(52, true, 4200),
      note(50, false, 4300),
      note(52, false, 5100),
    ], 5000, 60)
    expect(events).toEqual([
      { note: 52, on: true, velocity: 80, timeMs: -800 },
      { note: 52, on: false, velocity: 0, timeMs: 100 },
    ])
  })

  it('keeps a key struck again after a dropped press', () => {
    const events = toPlayedEvents([note(50, true, 0), note(50, false, 100), note(50, true, 4900), note(50, false, 5200)], 5000, 60)
    expect(events.map(e => [e.on, e.timeMs])).toEqual([[true, -100], [false, 200]])
  })

  it('puts events from different inputs in time order, to a tenth of a millisecond', () => {
    const events = toPlayedEvents([note(60, true, 1010.26), note(62, true, 1005.01)], 1000, 100)
    expect(events.map(e => [e.note, e.timeMs])).toEqual([[62, 5], [60, 10.3]])
  })
})

describe('toPedalEvents', () => {
  it('keeps pedal changes from the count-in’s last beat on', () => {
    const pedal = toPedalEvents([
      { down: true, timeStampMs: 100, source: 'midi' },
      { down: false, timeStampMs: 700, source: 'midi' },
      { down: true, timeStampMs: 1600, source: 'midi' },
    ], 1000, 120)
    expect(pedal).toEqual([{ down: false, timeMs: -300 }, { down: true, timeMs: 600 }])
  })
})

describe('what an attempt says about its input', () => {
  const press = (source: LiveNoteEvent['source'], t: number): LiveNoteEvent => ({ note: 60, on: true, velocity: 80, timeStampMs: t, source })

  it('keeps velocities only from a MIDI keyboard', () => {
    const events = toPlayedEvents([press('midi', 1000), press('computer-keys', 1100), press('screen', 1200)], 1000, 60)
    expect(events.map(e => e.velocity)).toEqual([80, undefined, undefined])
    expect(events.filter(e => 'velocity' in e)).toHaveLength(1)
  })

  it('names the input that played most of the presses, and the chosen one when nothing was played', () => {
    expect(playedInput([press('computer-keys', 1), press('computer-keys', 2), press('midi', 3)], 'midi')).toBe('computer-keys')
    expect(playedInput([press('screen', 1), { ...press('midi', 2), on: false }], 'midi')).toBe('screen')
    expect(playedInput([], 'computer-keys')).toBe('computer-keys')
  })

  it('drops velocities a client sent for an input that has none, before the server grades', () => {
    const events = [{ note: 60, on: true, velocity: 90, timeMs: 0 }, { note: 60, on: false, velocity: 0, timeMs: 300 }]
    expect(trustedEvents(events, 'computer-keys')).toEqual([{ note: 60, on: true, timeMs: 0 }, { note: 60, on: false, timeMs: 300 }])
    expect(trustedEvents(events, 'midi')).toEqual(events)
  })
})
