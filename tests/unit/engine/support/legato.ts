// Whether a move can be played legato, by the published spans and the thumb-passing rule beside them
// (ergonomics.ts), judged apart from the search that chooses fingerings, for tests of what it chose.
import { arpeggioPassReach } from '../../../../shared/engine/ergonomics'
import { MAX_PRAC, MIN_PRAC, pairSpan, type SpanRow } from '../../../../shared/engine/spans'
import type { Finger, Hand } from '../../../../shared/engine/types'

/** Right-hand space, as the model sees a line: the left hand mirrored around D4 (see touches.ts). */
export const rhKey = (hand: Hand, midi: number): number => (hand === 'left' ? 124 - midi : midi)

/**
 * Legato-playable: a repeated key (with any finger), different fingers within the practical span, or
 * an arpeggio's thumb passing (the separate rule beside the published spans, ergonomics.ts).
 */
export function playable(table: SpanRow[][], fa: Finger, ka: number, fb: Finger, kb: number): boolean {
  if (ka === kb) return true
  if (fa === fb) return false
  const { row, s } = pairSpan(table, fa, ka, fb, kb)
  const thumbPassing = (fa === 1 || fb === 1) && s < 0 && -s <= arpeggioPassReach(fa === 1 ? fb : fa)
  return thumbPassing || (s >= row[MIN_PRAC] && s <= row[MAX_PRAC])
}
