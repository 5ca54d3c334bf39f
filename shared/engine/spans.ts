// How far apart two fingers of one hand can comfortably be, per finger pair.
import type { Finger, HandSize } from './types'

/** [MinPrac, MinComf, MinRel, MaxRel, MaxComf, MaxPrac] in semitones, from the lower finger's key to the higher finger's key. */
export type SpanRow = readonly [number, number, number, number, number, number]

export type FingerPair = '1-2' | '1-3' | '1-4' | '1-5' | '2-3' | '2-4' | '2-5' | '3-4' | '3-5' | '4-5'

/**
 * Parncutt, Sloboda, Clarke, Raekallio & Desain 1997, Music Perception 14(4), Table 1 (right hand;
 * the left hand is its mirror image). Written from memory of the published table, then compared with
 * four independent public transcriptions of Table 1 in research code (fingering tools, which the project
 * does not name): every figure here agrees with at least three of them (one gives 1–5 MaxRel 11 and
 * another 4–5 MaxPrac 6). The printed page itself was not at hand, so the figures stay marked "from
 * memory". tests/unit/engine/ergonomics.test.ts holds a second copy as a guard against accidental edits;
 * it is no outside check. Conventions that override a figure (an arpeggio's thumb passing) are rules of
 * their own in ergonomics.ts, never edits here.
 * Negative values mean the higher-numbered finger plays below the lower one (a crossing with the thumb).
 *
 * Distances stay in semitones, as published. Jacobs 2001 (Music Perception 18(4)) proposed measuring
 * them by physical key position instead; we did not adopt that for the span rules, because the table
 * is calibrated in semitones and on physical positions a white–black neighbour (half a white key,
 * 0.86 "semitone-equivalents") would fall below the 2–3, 3–4 and 4–5 MinPrac of 1 and make chromatic
 * fingerings look impractical. Physical positions (keyCenterMm) are used where no calibration is
 * needed: telling repeated shapes apart (suggest.ts).
 */
export const PARNCUTT_SPANS: Readonly<Record<FingerPair, SpanRow>> = {
  '1-2': [-5, -3, 1, 5, 8, 10],
  '1-3': [-4, -2, 3, 7, 10, 12],
  '1-4': [-3, -1, 5, 9, 12, 14],
  '1-5': [-1, 1, 7, 10, 13, 15],
  '2-3': [1, 1, 1, 2, 3, 5],
  '2-4': [1, 1, 3, 4, 5, 7],
  '2-5': [2, 2, 5, 6, 8, 10],
  '3-4': [1, 1, 1, 2, 2, 4],
  '3-5': [1, 1, 3, 4, 5, 7],
  '4-5': [1, 1, 1, 2, 3, 5],
}

/**
 * Common practice: a fifth between thumb and index is a normal, relaxed extension (teachers finger
 * five-note chords and broken fifths 1–2 without comment), so the 1–2 MaxRel is raised from 5 to 7.
 */
const RELAXED_FIFTH_1_2 = 7

/**
 * Reach scale per hand size (our own choice, no published source): a "small" hand reaches a little
 * less than an octave between 1 and 5 (15 × 0.8 = 12), a "large" one a tenth and more
 * (15 × 1.15 ≈ 17). Only the reaching columns scale, i.e. the Max columns and the negative
 * (crossing) Min columns; the small positive minimums are set by finger width, not hand size.
 */
export const HAND_SIZE_FACTOR: Readonly<Record<HandSize, number>> = { small: 0.8, medium: 1, large: 1.15 }

export const MIN_PRAC = 0
export const MIN_COMF = 1
export const MIN_REL = 2
export const MAX_REL = 3
export const MAX_COMF = 4
export const MAX_PRAC = 5

/** The same finger on two keys has no span at all: any distance is out of every range. */
const SAME_FINGER: SpanRow = [0, 0, 0, 0, 0, 0]

function scaleRow(row: SpanRow, factor: number): SpanRow {
  const reach = (v: number): number => (v < 0 ? v * factor : v)
  return [reach(row[0]), reach(row[1]), reach(row[2]), row[3] * factor, row[4] * factor, row[5] * factor]
}

const tables = new Map<HandSize, SpanRow[][]>()

/**
 * The span table used by the model for one hand size, indexed [lower finger][higher finger]
 * (fingers 1–5; a same-finger entry is all zeros). Built once per hand size and shared: read it, never
 * change it.
 */
export function spanTable(handSize: HandSize = 'medium'): SpanRow[][] {
  let table = tables.get(handSize)
  if (!table) {
    table = buildSpanTable(handSize)
    tables.set(handSize, table)
  }
  return table
}

function buildSpanTable(handSize: HandSize): SpanRow[][] {
  const factor = HAND_SIZE_FACTOR[handSize]
  const table: SpanRow[][] = []
  for (let lo = 0; lo <= 5; lo++) {
    const row: SpanRow[] = []
    for (let hi = 0; hi <= 5; hi++) {
      const key = `${lo}-${hi}` as FingerPair
      const published = PARNCUTT_SPANS[key]
      if (!published) {
        row.push(SAME_FINGER)
        continue
      }
      const adjusted: SpanRow = key === '1-2'
        ? [published[0], published[1], published[2], RELAXED_FIFTH_1_2, published[4], published[5]]
        : published
      row.push(scaleRow(adjusted, factor))
    }
    table.push(row)
  }
  return table
}

/**
 * The span from finger a on key ka to finger b on key kb, measured (as in the table) from the lower
 * finger to the higher one, in right-hand space. Returns the row and the signed distance.
 */
export function pairSpan(table: SpanRow[][], a: Finger, ka: number, b: Finger, kb: number): { row: SpanRow, s: number } {
  return a <= b ? { row: table[a]![b]!, s: kb - ka } : { row: table[b]![a]!, s: ka - kb }
}
