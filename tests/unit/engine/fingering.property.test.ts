import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { inferFingering } from '../../../shared/engine/infer'
import { spanTable, type SpanRow } from '../../../shared/engine/spans'
import { suggestFingering } from '../../../shared/engine/suggest'
import type { Finger, Hand, HandSize, LineItem } from '../../../shared/engine/types'
import { playable, rhKey } from './support/legato'

const FINGERS: Finger[] = [1, 2, 3, 4, 5]
const hands = fc.constantFrom<Hand>('right', 'left')
const sizes = fc.constantFrom<HandSize>('small', 'medium', 'large')

/** A melodic line: a random walk of steps up to a sixth from somewhere on the keyboard. */
const line = fc.tuple(fc.integer({ min: 30, max: 90 }), fc.array(fc.integer({ min: -9, max: 9 }), { minLength: 1, maxLength: 40 }))
  .map(([start, steps]) => steps.reduce((notes, step) => [...notes, notes[notes.length - 1]! + step], [start]))

/** Whether any fingering plays the line legato, found by a reachability sweep independent of the search. */
function somePlayableFingering(table: SpanRow[][], keys: number[]): boolean {
  let reachable = new Set<Finger>(FINGERS)
  for (let i = 1; i < keys.length; i++) {
    const next = new Set<Finger>()
    for (const fb of FINGERS) if ([...reachable].some(fa => playable(table, fa, keys[i - 1]!, fb, keys[i]!))) next.add(fb)
    reachable = next
  }
  return reachable.size > 0
}

/** Whether some pitch-ordered assignment of fingers holds the chord (keys ascending in right-hand space) within the practical spans. */
function somePlayableChord(table: SpanRow[][], keys: number[], from: Finger = 1, prev: { f: Finger, k: number } | null = null): boolean {
  if (keys.length === 0) return true
  return FINGERS.filter(f => f >= from).some(f =>
    (!prev || playable(table, prev.f, prev.k, f, keys[0]!)) && somePlayableChord(table, keys.slice(1), (f + 1) as Finger, { f, k: keys[0]! }))
}

/** Every move of the suggested fingering is playable, where some fingering of the line is. */
function expectPlayableSuggestion(notes: number[], hand: Hand, handSize: HandSize): void {
  const table = spanTable(handSize)
  const keys = notes.map(m => rhKey(hand, m))
  fc.pre(somePlayableFingering(table, keys))
  const fingers = suggestFingering({ hand, notes, handSize }).fingers as Finger[]
  for (let i = 1; i < notes.length; i++) {
    expect(playable(table, fingers[i - 1]!, keys[i - 1]!, fingers[i]!, keys[i]!)).toBe(true)
  }
}

describe('suggestion properties', () => {
  it('is playable whenever any playable fingering exists', () => {
    fc.assert(fc.property(line, hands, sizes, expectPlayableSuggestion), { numRuns: 300 })
  })

  it('leaves a run\'s pattern where the hand could not reach the leap after it (found with seed 2144543997)', () => {
    // A small left hand down a run, then a tritone leap: the run's pattern ends on 3, which cannot
    // stretch to 5 a tritone below (the practical span of 3–5 in a small hand is under six semitones).
    expectPlayableSuggestion([30, 29, 27, 26, 25, 23, 20, 18, 12], 'left', 'small')
  })

  it('leaves a trill\'s pair where a small hand could not reach it or on from it (found with seeds 2024529373 and -373400881)', () => {
    // A minor-third trill, then a leap up a fourth beyond both strong pairs' reach from the trill's last note.
    expectPlayableSuggestion([30, 27, 30, 27, 30, 36, 37, 37], 'right', 'small')
    // A leap down a tritone onto a semitone trill: the note before it cannot join either pair legato.
    expectPlayableSuggestion([30, 29, 23, 22, 23, 22, 23, 23], 'right', 'small')
  })

  it('fingers chords in pitch order within the practical spans', () => {
    // Close-position chords of two to four notes, each within an octave.
    const chord = fc.tuple(fc.integer({ min: 40, max: 80 }), fc.uniqueArray(fc.integer({ min: 1, max: 12 }), { minLength: 1, maxLength: 3 }))
      .map(([root, above]) => [root, ...above.map(a => root + a)])
    fc.assert(fc.property(fc.array(chord, { minLength: 1, maxLength: 8 }), hands, (chords, hand) => {
      const table = spanTable('medium')
      fc.pre(chords.every(c => somePlayableChord(table, c.map(m => rhKey(hand, m)).sort((a, b) => a - b))))
      const result = suggestFingering({ hand, notes: chords })
      result.fingers.forEach((fingers, i) => {
        const f = fingers as Finger[]
        const pitches = [...chords[i]!].sort((a, b) => a - b)
        expect(f).toHaveLength(pitches.length)
        for (let j = 1; j < f.length; j++) {
          // Right hand: fingers rise with pitch; left hand: they fall.
          expect(hand === 'right' ? f[j]! > f[j - 1]! : f[j]! < f[j - 1]!).toBe(true)
          expect(playable(table, f[j - 1]!, rhKey(hand, pitches[j - 1]!), f[j]!, rhKey(hand, pitches[j]!))).toBe(true)
        }
      })
    }), { numRuns: 200 })
  })

  it('gives the left hand the mirror image of the right hand', () => {
    // Mirroring around D4 (2 · 62 − midi) keeps the black/white pattern and every distance.
    fc.assert(fc.property(line, sizes, (notes, handSize) => {
      const right = suggestFingering({ hand: 'right', notes, handSize })
      const left = suggestFingering({ hand: 'left', notes: notes.map(m => 124 - m), handSize })
      expect(left.fingers).toEqual(right.fingers)
      expect(left.positions).toEqual(right.positions)
      expect(left.cost).toBeCloseTo(right.cost)
    }), { numRuns: 200 })
  })

  it('never throws and answers every item, whatever it is given', () => {
    const item: fc.Arbitrary<LineItem> = fc.oneof(
      fc.integer({ min: -20, max: 150 }),
      fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, 60.4),
      fc.array(fc.integer({ min: -20, max: 150 }), { maxLength: 8 }),
    )
    fc.assert(fc.property(fc.array(item, { maxLength: 30 }), hands, sizes, (notes, hand, handSize) => {
      const result = suggestFingering({ hand, notes, handSize })
      expect(result.fingers).toHaveLength(notes.length)
      expect(Number.isFinite(result.cost)).toBe(true)
      for (const p of result.positions) expect(p).toBeGreaterThan(0)
    }), { numRuns: 300 })
  })
})

describe('inference properties', () => {
  const performed = fc.array(fc.record({
    midi: fc.integer({ min: 0, max: 127 }),
    gapMs: fc.integer({ min: 0, max: 600 }),
    lengthMs: fc.option(fc.integer({ min: -50, max: 900 }), { nil: null }),
    velocity: fc.integer({ min: 0, max: 127 }),
  }), { maxLength: 40 }).map((raw) => {
    let on = 0
    return raw.map((n) => {
      on += n.gapMs
      return { midi: n.midi, onMs: on, offMs: n.lengthMs === null ? null : on + n.lengthMs, velocity: n.velocity }
    })
  })

  it('never throws, answers each note once with a confidence in [0, 1], and places positions on notes', () => {
    fc.assert(fc.property(performed, hands, sizes, (notes, hand, handSize) => {
      const result = inferFingering(hand, notes, handSize)
      expect(result.fingers).toHaveLength(notes.length)
      for (const { finger, confidence } of result.fingers) {
        expect(FINGERS).toContain(finger)
        expect(confidence).toBeGreaterThanOrEqual(0)
        expect(confidence).toBeLessThanOrEqual(1)
      }
      for (const p of result.positions) {
        expect(p).toBeGreaterThan(0)
        expect(p).toBeLessThan(notes.length)
      }
    }), { numRuns: 150 })
  })
})
