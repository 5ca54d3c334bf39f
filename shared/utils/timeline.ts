import type { InputDevice, PedalEvent, PlayedEvent } from '../types/attempt'
import type { LiveNoteEvent, LivePedalEvent } from '../types/live'

/** How far before beat 0 notes still count: the count-in's last beat. */
function countInGraceMs(tempoBpm: number): number {
  return 60_000 / tempoBpm
}

/** Rounds to a tenth of a millisecond: finer than any player, and keeps the saved copy small. */
function relativeMs(timeStampMs: number, timeZeroMs: number): number {
  return Math.round((timeStampMs - timeZeroMs) * 10) / 10
}

/**
 * Places raw notes on an attempt's time line (ms from beat 0). Notes from before the count-in's
 * last beat are the student settling their hand, not the drill, so they are left out, and so
 * is the release of any note they started.
 */
export function toPlayedEvents(notes: readonly LiveNoteEvent[], timeZeroMs: number, tempoBpm: number): PlayedEvent[] {
  const earliestMs = -countInGraceMs(tempoBpm)
  const dropped = new Set<number>()
  const events: PlayedEvent[] = []
  for (const n of notes) {
    const timeMs = relativeMs(n.timeStampMs, timeZeroMs)
    if (n.on) {
      if (timeMs < earliestMs) {
        dropped.add(n.note)
        continue
      }
      dropped.delete(n.note)
    }
    else if (dropped.delete(n.note)) {
      continue
    }
    if (timeMs < earliestMs) continue
    // Only a MIDI keyboard measures how hard a key was struck; a computer key or a tap on the screen
    // plays a fixed or guessed loudness, which would make any touch look perfectly even.
    events.push(n.source === 'midi' ? { note: n.note, on: n.on, velocity: n.velocity, timeMs } : { note: n.note, on: n.on, timeMs })
  }
  // Inputs are merged as they arrive; a MIDI message can be stamped slightly before a key event.
  return events.sort((a, b) => a.timeMs - b.timeMs)
}

/** Pedal changes on the same time line, from the count-in's last beat on. */
export function toPedalEvents(pedal: readonly LivePedalEvent[], timeZeroMs: number, tempoBpm: number): PedalEvent[] {
  const earliestMs = -countInGraceMs(tempoBpm)
  return pedal
    .map(p => ({ down: p.down, timeMs: relativeMs(p.timeStampMs, timeZeroMs) }))
    .filter(p => p.timeMs >= earliestMs)
}

/**
 * The input an attempt was played on: the one that played most of its key presses (the first of
 * them on a tie), or `chosen` when nothing was pressed.
 */
export function playedInput(notes: readonly LiveNoteEvent[], chosen: InputDevice): InputDevice {
  const counts = new Map<InputDevice, number>()
  for (const n of notes) if (n.on) counts.set(n.source, (counts.get(n.source) ?? 0) + 1)
  let best: InputDevice = chosen
  let most = 0
  for (const [source, count] of counts) {
    if (count > most) {
      best = source
      most = count
    }
  }
  return best
}

/** The events the server grades: velocities kept only from a MIDI keyboard, the one input that measures them. */
export function trustedEvents(events: readonly PlayedEvent[], inputDevice: InputDevice): PlayedEvent[] {
  return inputDevice === 'midi' ? [...events] : events.map(({ velocity: _velocity, ...rest }) => rest)
}
