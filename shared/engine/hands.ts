import type { DrillMusic, DrillNote, Hand } from './types'

/** Middle C, where a grand staff splits the hands when a note does not say which plays it. */
const SPLIT_MIDI = 60

/** The hand that plays a drill note: its own mark, the drill's hand, or (both-hands drills) its side of middle C. */
export function noteHand(drillHand: DrillMusic['hand'], note: Pick<DrillNote, 'hand'>, midi: number): Hand {
  return note.hand ?? (drillHand === 'both' ? (midi >= SPLIT_MIDI ? 'right' : 'left') : drillHand)
}
