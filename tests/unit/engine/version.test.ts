// ENGINE_VERSION against what the engine computes: a digest of grades, suggestions, hands, inferred
// fingerings and checks over fixed inputs. A change that alters any of them changes the digest; the
// test then fails until a new row with a raised ENGINE_VERSION and the new digest is added below.
import { createHash } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { checkFingering } from '../../../shared/engine/check'
import { ENGINE_VERSION, gradeAttempt } from '../../../shared/engine/grade'
import { suggestHands } from '../../../shared/engine/hands'
import { inferFingering } from '../../../shared/engine/infer'
import { positionStarts } from '../../../shared/engine/positions'
import { suggestFingering } from '../../../shared/engine/suggest'
import type { DrillMusic, PlayedEvent } from '../../../shared/engine/types'

/** Every engine version with the digest of its results, oldest first. Add a row; never edit one. */
const RECORDED: { version: string, digest: string }[] = [
  { version: '1.4.0', digest: 'd0a7323301a88271' },
  { version: '1.5.0', digest: '394c5a7dd63437ea' },
  { version: '1.6.0', digest: '0c44a0e501419131' },
  { version: '1.7.0', digest: '1b8aac23af4ecfac' },
  { version: '1.8.0', digest: '28e74e47d0c228e1' },
  { version: '1.9.0', digest: '8c6fe419a478f021' },
  { version: '1.10.0', digest: '63e9ffe254575302' },
  { version: '1.11.0', digest: '09914aecfc3e2950' },
  { version: '1.11.1', digest: '4c2943585e2c0596' },
  { version: '1.12.0', digest: 'de5804e6544f398c' },
  { version: '1.13.0', digest: '0700c13594df8c68' },
  { version: '1.13.1', digest: '94ebe6da5737666d' },
  { version: '1.14.0', digest: 'bcf0f013b405db95' },
]

/** A reproducible stream of numbers in [0, 1) (a linear congruential generator). */
function random(seed: number): () => number {
  let state = seed
  return () => {
    state = (state * 1664525 + 1013904223) >>> 0
    return state / 2 ** 32
  }
}

function results(): unknown[] {
  const next = random(42)
  const scale = [60, 62, 64, 65, 67, 69, 71, 72, 74, 76, 77, 79, 81, 83, 84]
  const upDown = [...scale, ...scale.slice(0, -1).reverse()]
  const walk = Array.from({ length: 200 }, () => 48 + Math.floor(next() * 36))
  const drill: DrillMusic = {
    hand: 'both',
    tempoBpm: 96,
    notes: [
      ...upDown.map((m, k) => ({ pitch: ['C', 'C#', 'D', 'D#', 'E', 'F', 'F#', 'G', 'G#', 'A', 'A#', 'B'][m % 12]! + String(Math.floor(m / 12) - 1), beat: k / 2, length: 0.5, ...(k % 7 === 3 ? { emphasis: 'accent' as const } : {}) })),
      ...[36, 43, 48, 43].flatMap((m, k) => [{ pitch: ['C2', 'G2', 'C3', 'G2'][k]!, beat: k * 2, length: 2, ...(m === 48 ? { emphasis: 'soft' as const } : {}) }]),
    ],
  }
  const events: PlayedEvent[] = []
  drill.notes.forEach((n, k) => {
    const on = 1000 + n.beat * 625 + Math.round((next() - 0.5) * 40)
    const note = k < upDown.length ? upDown[k]! : [36, 43, 48, 43][k - upDown.length]!
    events.push({ note, on: true, velocity: 50 + Math.floor(next() * 50), timeMs: on }, { note, on: false, timeMs: on + 280 })
  })
  const performed = upDown.map((midi, k) => ({ midi, onMs: k * 300 + (k === 10 ? 60 : 0), offMs: k * 300 + (k === 9 ? 200 : 310), velocity: 64 }))
  return [
    gradeAttempt(drill, events.sort((a, b) => a.timeMs - b.timeMs)),
    suggestFingering({ hand: 'right', notes: upDown }),
    suggestFingering({ hand: 'left', notes: walk }),
    suggestFingering({ hand: 'right', notes: [[60, 64, 67], 65, [62, 67, 71], 72, 76, 79, 84] }),
    suggestHands({ notes: walk }),
    inferFingering('right', performed),
    checkFingering({ hand: 'right', notes: walk.slice(0, 40), fingers: walk.slice(0, 40).map((_, k) => ((k % 5) + 1) as 1 | 2 | 3 | 4 | 5) }),
    // From 1.6.0 on: an arpeggio, a broken chord, a trill after a run and a sequence.
    suggestFingering({ hand: 'left', notes: [36, 40, 43, 48, 52, 55, 60, 55, 52, 48, 43, 40, 36] }),
    suggestFingering({ hand: 'right', notes: [64, 67, 72, 67, 64] }),
    suggestFingering({ hand: 'right', notes: [...scale.slice(0, 10), 77, 76, 77, 76, 77, 76, 77] }),
    suggestFingering({ hand: 'left', notes: [0, 1, 2, 3, 4].flatMap(g => [scale[g]!, scale[g + 1]!, scale[g + 2]!, scale[g]!].map(m => m - 24)) }),
    // From 1.7.0 on: the left hand's D major arpeggio (3 onto the black third).
    suggestFingering({ hand: 'left', notes: [38, 42, 45, 50, 54, 57, 62, 57, 54, 50, 45, 42, 38] }),
    // From 1.8.0 on: a left-hand sequence of rising threes, the hand lifted before each group.
    inferFingering('left', [0, 1, 2, 3, 4].flatMap(g => [scale[g]!, scale[g + 1]!, scale[g + 2]!]).map((m, k) => {
      const late = 40 * Math.floor(k / 3)
      const lift = k % 3 === 2 && k < 12
      return { midi: m - 24, onMs: k * 300 + late, offMs: k * 300 + late + (lift ? 200 : 320), velocity: 64, beat: k / 2 }
    })),
    // From 1.9.0 on: F♯ melodic minor, right hand, one octave up and down (the thumb moves with the way).
    suggestFingering({ hand: 'right', notes: [66, 68, 69, 71, 73, 75, 77, 78, 76, 74, 73, 71, 69, 68, 66] }),
    // From 1.10.0 on: D major's second inversion, right hand (1 2 4 5), and E♭ minor, right hand (all black).
    suggestFingering({ hand: 'right', notes: [69, 74, 78, 81, 86, 90, 93, 90, 86, 81, 78, 74, 69] }),
    suggestFingering({ hand: 'right', notes: [63, 66, 70, 75, 78, 82, 87, 82, 78, 75, 70, 66, 63] }),
    // From 1.11.0 on: a stretch within the practical span stays in position (A minor's 2–3 major third).
    positionStarts('right', [57, 60, 64, 69, 72, 76, 81], [1, 2, 3, 1, 2, 3, 5]),
    // From 1.12.0 on: the left hand's G major down into an F♯–G trill, and two octaves of C major up into a D–C trill.
    suggestFingering({ hand: 'left', notes: [55, 54, 52, 50, 48, 47, 45, 43, 42, 43, 42, 43, 42, 43] }),
    suggestFingering({ hand: 'right', notes: [...scale, 86, 84, 86, 84, 86, 84, 86] }),
    // From 1.13.0 on: the left hand's C major down, then leaps back up (the run keeps its fingering).
    suggestFingering({ hand: 'left', notes: [60, 59, 57, 55, 53, 52, 50, 48, 47, 45, 48, 52, 57] }),
    // From 1.13.1 on: a small left hand down a run into a tritone leap it could not reach on the run's pattern.
    suggestFingering({ hand: 'left', notes: [30, 29, 27, 26, 25, 23, 20, 18, 12], handSize: 'small' }),
    // From 1.14.0 on: C major down into an F–E trill (the run's last note hands over legato), and a small
    // hand's minor-third trill followed by a leap beyond the pair's reach.
    suggestFingering({ hand: 'right', notes: [84, 83, 81, 79, 77, 76, 74, 72, 71, 69, 67, 65, 64, 65, 64, 65, 64, 65] }),
    suggestFingering({ hand: 'right', notes: [30, 27, 30, 27, 30, 36, 37, 37], handSize: 'small' }),
  ]
}

describe('ENGINE_VERSION', () => {
  it('names the engine whose results it stamps (raise it and add a row when the digest changes)', () => {
    const digest = createHash('sha256').update(JSON.stringify(results())).digest('hex').slice(0, 16)
    const latest = RECORDED[RECORDED.length - 1]!
    expect({ version: ENGINE_VERSION, digest }).toEqual(latest)
  })

  it('is raised with every recorded change', () => {
    expect(new Set(RECORDED.map(r => r.version)).size).toBe(RECORDED.length)
    expect(new Set(RECORDED.map(r => r.digest)).size).toBe(RECORDED.length)
  })
})
