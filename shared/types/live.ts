import type { InputDevice } from './attempt'

/**
 * A key going down or up as it happens, before it is placed on an attempt's time line.
 * `timeStampMs` is on the performance.now() clock and comes from the input event itself
 * (the MIDI message or the DOM event), so handler delays do not show up as unevenness.
 */
export interface LiveNoteEvent {
  note: number
  on: boolean
  /** 0–127; for a release, the release velocity where the device sends one, else 0. */
  velocity: number
  timeStampMs: number
  source: InputDevice
}

/** The sustain pedal (MIDI control change 64) going down or up. */
export interface LivePedalEvent {
  down: boolean
  timeStampMs: number
  source: 'midi'
}
