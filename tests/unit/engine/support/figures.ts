// The figures the simulated player plays, in right-hand space (the left hand plays their mirror
// image, see player.ts). Fingerings are the printed ones where a handbook has one (named beside it);
// the lifted variants are what a student does who runs out of fingers.
import type { Finger } from '../../../../shared/engine/types'
import type { Figure } from './player'

const MAJOR_SCALE = [0, 2, 4, 5, 7, 9, 11, 12]
const FIVE_FINGER = [0, 2, 4, 5, 7]

const f = (...fingers: number[]): Finger[] => fingers as Finger[]

/** Major scales over one octave, up and down, with the printed right-hand fingering (common practice). */
function scales(): Figure[] {
  const out: Figure[] = []
  // C, G, D, A and E major share 1 2 3 1 2 3 4 5; F major goes 1 2 3 4 1 2 3 4 (common practice).
  const tonics: [string, number, Finger[], Finger[]][] = [
    ['C', 60, f(1, 2, 3, 1, 2, 3, 4, 5), f(5, 4, 3, 2, 1, 3, 2, 1)],
    ['G', 55, f(1, 2, 3, 1, 2, 3, 4, 5), f(5, 4, 3, 2, 1, 3, 2, 1)],
    ['D', 62, f(1, 2, 3, 1, 2, 3, 4, 5), f(5, 4, 3, 2, 1, 3, 2, 1)],
    ['A', 57, f(1, 2, 3, 1, 2, 3, 4, 5), f(5, 4, 3, 2, 1, 3, 2, 1)],
    ['E', 64, f(1, 2, 3, 1, 2, 3, 4, 5), f(5, 4, 3, 2, 1, 3, 2, 1)],
    ['F', 65, f(1, 2, 3, 4, 1, 2, 3, 4), f(4, 3, 2, 1, 4, 3, 2, 1)],
  ]
  for (const [name, tonic, up, down] of tonics) {
    const rising = MAJOR_SCALE.map(d => tonic + d)
    out.push({ name: `${name} major up and down`, category: 'scale', midi: [...rising, ...rising.slice(0, -1).reverse()], fingers: [...up, ...down.slice(1)] })
    // Out of fingers: the five fingers up, then the hand jumps to the sixth degree.
    out.push({ name: `${name} major up, lifted at the sixth`, category: 'scale', midi: rising, fingers: f(1, 2, 3, 4, 5, 1, 2, 3), lifts: [5] })
    out.push({ name: `${name} major up, lifted at the fifth`, category: 'scale', midi: rising, fingers: f(1, 2, 3, 4, 1, 2, 3, 4), lifts: [4] })
  }
  return out
}

/** Five-finger patterns in major keys on white keys, clean in one position or joined by a move. */
function fiveFinger(): Figure[] {
  const out: Figure[] = []
  for (const [name, tonic] of [['C', 60], ['D', 62], ['E', 64], ['F', 65], ['G', 67], ['A', 57]] as const) {
    const at = (...degrees: number[]): number[] => degrees.map(d => tonic + FIVE_FINGER[d]!)
    out.push({ name: `${name} five-finger up and down`, category: 'fiveFinger', midi: at(0, 1, 2, 3, 4, 3, 2, 1, 0), fingers: f(1, 2, 3, 4, 5, 4, 3, 2, 1) })
    out.push({ name: `${name} five-finger in thirds`, category: 'fiveFinger', midi: at(0, 2, 1, 3, 2, 4, 3, 1, 0), fingers: f(1, 3, 2, 4, 3, 5, 4, 2, 1) })
    out.push({ name: `${name} five-finger turns`, category: 'fiveFinger', midi: at(4, 3, 4, 2, 3, 1, 2, 0, 1, 0), fingers: f(5, 4, 5, 3, 4, 2, 3, 1, 2, 1) })
  }
  // One pattern after another a step higher: the thumb moves a step (same finger) to the new position.
  const c = FIVE_FINGER.map(d => 60 + d)
  const d = FIVE_FINGER.map(x => 62 + x)
  const upDown = (keys: number[]): number[] => [...keys, ...keys.slice(0, -1).reverse()]
  out.push({ name: 'C then D five-finger', category: 'fiveFinger', midi: [...upDown(c), ...upDown(d)], fingers: f(1, 2, 3, 4, 5, 4, 3, 2, 1, 1, 2, 3, 4, 5, 4, 3, 2, 1) })
  // A leap of a fourth to the next pattern: the hand is lifted there.
  const g = FIVE_FINGER.map(x => 65 + x)
  out.push({ name: 'C then F five-finger', category: 'fiveFinger', midi: [...upDown(c), ...upDown(g)], fingers: f(1, 2, 3, 4, 5, 4, 3, 2, 1, 1, 2, 3, 4, 5, 4, 3, 2, 1), lifts: [9] })
  return out
}

/** Sequences: one group repeated a step higher or lower, each group in the same fingering, the hand lifted between groups. */
function sequences(): Figure[] {
  const out: Figure[] = []
  const white = [48, 50, 52, 53, 55, 57, 59, 60, 62, 64, 65, 67, 69, 71, 72, 74, 76, 77, 79, 81, 83, 84]
  for (const start of [7, 8, 11]) {
    const rising: number[] = []
    const risingLifts: number[] = []
    for (let g = 0; g < 5; g++) {
      if (g > 0) risingLifts.push(rising.length)
      rising.push(white[start + g]!, white[start + g + 1]!, white[start + g + 2]!)
    }
    out.push({ name: `rising threes from ${white[start]}`, category: 'sequence', midi: rising, fingers: rising.map((_, i) => ([1, 2, 3] as Finger[])[i % 3]!), lifts: risingLifts, fingersTold: false })
    const falling: number[] = []
    const fallingLifts: number[] = []
    for (let g = 0; g < 4; g++) {
      if (g > 0) fallingLifts.push(falling.length)
      const top = start + 7 - g
      falling.push(white[top]!, white[top - 1]!, white[top - 2]!, white[top - 3]!)
    }
    out.push({ name: `falling fours from ${white[start + 7]}`, category: 'sequence', midi: falling, fingers: falling.map((_, i) => ([5, 4, 3, 2] as Finger[])[i % 4]!), lifts: fallingLifts, fingersTold: false })
  }
  return out
}

/** Short passages with a rhythm of their own. */
function passages(): Figure[] {
  return [
    {
      name: 'broken chord, then a lift to the dominant',
      category: 'passage',
      midi: [60, 64, 67, 65, 64, 62, 60, 67, 69, 71, 72, 71, 69, 67],
      fingers: f(1, 3, 5, 4, 3, 2, 1, 1, 2, 3, 4, 3, 2, 1),
      beats: [1, 0.5, 0.5, 0.5, 0.5, 0.5, 1, 0.5, 0.5, 0.5, 1, 0.5, 0.5, 1],
      lifts: [7],
    },
    {
      // Two octaves of C major up with the printed crossings (common practice), then down a fifth.
      name: 'scale run over two octaves',
      category: 'passage',
      midi: [60, 62, 64, 65, 67, 69, 71, 72, 74, 76, 77, 79, 81, 83, 84, 83, 81, 79, 77],
      fingers: f(1, 2, 3, 1, 2, 3, 4, 1, 2, 3, 1, 2, 3, 4, 5, 4, 3, 2, 1),
      beats: [0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 1, 0.5, 0.5, 0.5, 1],
    },
    {
      name: 'melody out of fingers',
      category: 'passage',
      midi: [60, 62, 64, 65, 67, 69, 71, 72, 71, 69],
      fingers: f(1, 2, 3, 4, 5, 1, 2, 3, 2, 1),
      beats: [0.5, 0.5, 0.5, 0.5, 1, 0.5, 0.5, 1, 0.5, 1],
      lifts: [5],
    },
  ]
}

export const FIGURES: readonly Figure[] = [...scales(), ...fiveFinger(), ...sequences(), ...passages()]
