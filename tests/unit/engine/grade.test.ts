import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { gradeAttempt, SCORE_FORMULA } from '../../../shared/engine/grade'
import type { DrillMusic, Finger, PlayedEvent } from '../../../shared/engine/types'

// C major, right hand, one octave up and down with the standard fingering 1 2 3 1 2 3 4 5 (common practice).
const UP = ['C4', 'D4', 'E4', 'F4', 'G4', 'A4', 'B4', 'C5']
const UP_MIDI = [60, 62, 64, 65, 67, 69, 71, 72]
const UP_FINGERS: Finger[] = [1, 2, 3, 1, 2, 3, 4, 5]
const PITCHES = [...UP, ...UP.slice(0, -1).reverse()]
const MIDIS = [...UP_MIDI, ...UP_MIDI.slice(0, -1).reverse()]
const FINGERS: Finger[] = [...UP_FINGERS, 4, 3, 2, 1, 3, 2, 1]

const scale: DrillMusic = {
  hand: 'right',
  tempoBpm: 100,
  notes: PITCHES.map((pitch, k) => ({ pitch, beat: k / 2, length: 0.5, finger: FINGERS[k] })),
}

/** A performance of `midis`, one note every `stepMs`, legato-ish releases. */
function perform(midis: number[], stepMs: number, velocity: (k: number) => number = () => 70, jitter: (k: number) => number = () => 0): PlayedEvent[] {
  return midis.flatMap((note, k) => [
    { note, on: true, velocity: velocity(k), timeMs: 1000 + k * stepMs + jitter(k) },
    { note, on: false, timeMs: 1000 + k * stepMs + stepMs * 0.9 },
  ])
}

/** A JSON replacer that refuses what JSON cannot keep: NaN, infinities and undefined. */
function strictJson(key: string, value: unknown): unknown {
  if (value === undefined || (typeof value === 'number' && !Number.isFinite(value))) throw new Error(`${key} is ${String(value)}`)
  return value
}

// 100 bpm in quavers: 300 ms per note.
const STEP = 300

describe('gradeAttempt', () => {
  it('gives an even, accurate performance at tempo timing SD ≈ 0 and a high score', () => {
    const result = gradeAttempt(scale, perform(MIDIS, STEP))
    // The stamp is the engine's own version (version.test.ts ties that to the engine's results).
    expect(result.engineVersion).toMatch(/^\d+\.\d+\.\d+$/)
    expect(result.accuracy).toEqual({ correct: 15, wrong: 0, extra: 0, missed: 0, total: 15 })
    expect(result.timing.sdMs).toBeCloseTo(0, 6)
    expect(result.timing.cvPercent).toBeCloseTo(0, 6)
    expect(result.timing.ioiVariationPercent).toBeCloseTo(0, 6)
    expect(result.tempo.playedBpm).toBeCloseTo(100, 6)
    expect(result.loudness.sd).toBe(0)
    expect(result.score).toBeGreaterThanOrEqual(90)
    expect(result.inferredFingers).toHaveLength(15)
    expect(result.notes.every(n => n.outcome === 'correct')).toBe(true)
  })

  it('reports half the tempo when played at half speed', () => {
    const result = gradeAttempt(scale, perform(MIDIS, STEP * 2))
    expect(result.tempo.targetBpm).toBe(100)
    expect(result.tempo.playedBpm).toBeCloseTo(50, 6)
    expect(result.scoreParts.tempo.value).toBeCloseTo(0.5, 6)
  })

  it('uses the practice tempo as the target when given', () => {
    const result = gradeAttempt(scale, perform(MIDIS, STEP * 2), { targetBpm: 50 })
    expect(result.tempo.targetBpm).toBe(50)
    expect(result.scoreParts.tempo.value).toBeCloseTo(1, 6)
  })

  it('measures uneven timing in ms and as a share of the note step', () => {
    // Every other note 30 ms late: residuals ±15 ms around the fitted line, so SD = 15 ms = 5 % of 300 ms.
    const result = gradeAttempt(scale, perform(MIDIS, STEP, () => 70, k => (k % 2 ? 30 : 0)))
    expect(result.timing.sdMs).toBeCloseTo(15, 0)
    expect(result.timing.cvPercent).toBeCloseTo(5, 0)
    // Intervals alternate 330 / 270 ms: each change is 60 ms, 20 % of the 300 ms mean.
    expect(result.timing.ioiVariationPercent).toBeCloseTo(20, 0)
  })

  it('names an accented thumb as the loudest finger', () => {
    const events = perform(MIDIS, STEP, k => (FINGERS[k] === 1 ? 105 : 65))
    const result = gradeAttempt(scale, events)
    const thumbs = result.inferredFingers.filter((f, k) => FINGERS[k] === 1 && f.finger === 1)
    expect(thumbs.length).toBeGreaterThanOrEqual(3)
    expect(result.loudness.loudestFinger).toBe(1)
    expect(result.loudness.byFinger[1]).toBeGreaterThan(20)
  })

  it('counts a wrong note and a missed note and says which', () => {
    const played = [...MIDIS]
    played[2] = 63 // E4 played as Eb4
    played.splice(9, 1) // A4 on the way down left out
    const result = gradeAttempt(scale, perform(played, STEP))
    expect(result.accuracy).toEqual({ correct: 13, wrong: 1, extra: 0, missed: 1, total: 15 })
    expect(result.notes[2]).toMatchObject({ outcome: 'wrong', playedNote: 63 })
    expect(result.notes[9]).toEqual({ outcome: 'missed', eventIndex: null, playedNote: null })
    expect(result.inferredFingers[9]).toEqual({ finger: null, confidence: 0 })
    expect(result.timing.deviationsMs[9]).toBeNull()
    expect(result.loudness.velocities[9]).toBeNull()
  })

  it('lets timing decide which of a repeated key was missed', () => {
    const repeated: DrillMusic = { hand: 'right', tempoBpm: 100, notes: [0, 1, 2, 3, 4, 5].map(k => ({ pitch: 'G4', beat: k, length: 1, finger: 3 })) }
    const events = [0, 600, 1800, 2400, 3000].flatMap(t => [
      { note: 67, on: true, velocity: 64, timeMs: t },
      { note: 67, on: false, timeMs: t + 500 },
    ])
    const result = gradeAttempt(repeated, events)
    expect(result.notes.map(n => n.outcome)).toEqual(['correct', 'correct', 'missed', 'correct', 'correct', 'correct'])
    expect(result.timing.sdMs).toBeCloseTo(0, 6)
  })

  it('matches a doubled last note by its time, counting the stutter as extra', () => {
    const events = perform([...MIDIS, 60], STEP)
    events[events.length - 2]!.timeMs = 1000 + 14 * STEP + 120
    const result = gradeAttempt(scale, events)
    expect(result.accuracy.extra).toBe(1)
    expect(result.timing.sdMs).toBeCloseTo(0, 6)
  })

  it('names extra notes by their event index', () => {
    const events = perform(MIDIS, STEP)
    events.splice(4, 0, { note: 90, on: true, velocity: 50, timeMs: 1650 }, { note: 90, on: false, timeMs: 1700 })
    const result = gradeAttempt(scale, events)
    expect(result.accuracy.extra).toBe(1)
    expect(result.extras).toEqual([4])
    expect(result.notes[2]!.eventIndex).toBe(6)
    expect(result.notes[3]!.eventIndex).toBe(8)
  })

  it('counts planned position changes from the drill fingering', () => {
    const result = gradeAttempt(scale, perform(MIDIS, STEP))
    // The thumb passes under to F4 going up and the third finger crosses over to E4 going down.
    expect(result.positionChanges.plannedAt).toContain(3)
    expect(result.positionChanges.planned).toBe(result.positionChanges.plannedAt.length)
    expect(result.positionChanges.played).toBe(result.positionChanges.at.length)
  })

  it('plans positions from the suggested fingering where the teacher left fingers open', () => {
    const open: DrillMusic = { ...scale, notes: scale.notes.map(({ finger: _, ...n }) => n) }
    const result = gradeAttempt(open, perform(MIDIS, STEP))
    // An octave of C major cannot be played in one five-finger position (common practice).
    expect(result.positionChanges.planned).toBeGreaterThan(0)
  })

  it('treats a note-on with velocity 0 as a release', () => {
    const events = perform(MIDIS, STEP).map(e => (e.on ? e : { ...e, on: true, velocity: 0 }))
    const result = gradeAttempt(scale, events)
    expect(result.accuracy.correct).toBe(15)
    expect(result.accuracy.extra).toBe(0)
  })

  it('grades both hands, each hand inferred on its own', () => {
    const drill: DrillMusic = {
      hand: 'both',
      tempoBpm: 90,
      notes: [
        ...['C5', 'D5', 'E5', 'F5', 'G5'].map((pitch, k) => ({ pitch, beat: k, length: 1, hand: 'right' as const, finger: (k + 1) as Finger })),
        ...['C3', 'D3', 'E3', 'F3', 'G3'].map((pitch, k) => ({ pitch, beat: k, length: 1, hand: 'left' as const, finger: (5 - k) as Finger })),
      ],
    }
    const events = [0, 1, 2, 3, 4].flatMap(k => [
      { note: [72, 74, 76, 77, 79][k]!, on: true, velocity: 70, timeMs: k * 667 },
      { note: [48, 50, 52, 53, 55][k]!, on: true, velocity: 70, timeMs: k * 667 + 5 },
      { note: [72, 74, 76, 77, 79][k]!, on: false, timeMs: k * 667 + 600 },
      { note: [48, 50, 52, 53, 55][k]!, on: false, timeMs: k * 667 + 600 },
    ])
    const result = gradeAttempt(drill, events)
    expect(result.accuracy.correct).toBe(10)
    expect(result.inferredFingers.every(f => f.finger !== null)).toBe(true)
    expect(result.tempo.playedBpm).toBeCloseTo(90, 0)
  })

  it('returns zeros and nulls for an empty attempt', () => {
    const result = gradeAttempt(scale, [])
    expect(result.score).toBe(0)
    expect(result.accuracy).toEqual({ correct: 0, wrong: 0, extra: 0, missed: 15, total: 15 })
    expect(result.timing).toMatchObject({ sdMs: null, cvPercent: null, ioiVariationPercent: null })
    expect(result.loudness).toMatchObject({ sd: null, mean: null, loudestFinger: null, softestFinger: null })
    expect(result.tempo.playedBpm).toBeNull()
  })

  it('drops loudness from the score when no note carried a velocity', () => {
    const events = perform(MIDIS, STEP).map(({ velocity: _, ...e }) => e)
    const result = gradeAttempt(scale, events)
    expect(result.scoreParts.loudness.weight).toBe(0)
    const weights = Object.values(result.scoreParts).reduce((s, p) => s + p.weight, 0)
    expect(weights).toBeCloseTo(1, 9)
    expect(result.score).toBeGreaterThanOrEqual(90)
  })

  it('documents its score formula with the weights it uses', () => {
    const result = gradeAttempt(scale, perform(MIDIS, STEP))
    expect(result.scoreFormula).toBe(SCORE_FORMULA)
    for (const part of Object.values(result.scoreParts)) expect(SCORE_FORMULA).toContain(`${part.weight}·`)
    const recomputed = Object.values(result.scoreParts).reduce((s, p) => s + p.value * p.weight, 0) * 100
    expect(result.score).toBeCloseTo(recomputed, 1)
  })

  it('reads no tempo from onsets less than a millisecond apart, so every figure stays finite', () => {
    // The property below found it (seed 1349076985): a second onset at -2e-323 ms gave an infinite tempo and NaN figures.
    const result = gradeAttempt(scale, [{ note: 0, on: true, timeMs: 0 }, { note: 0, on: true, timeMs: -2e-323 }])
    expect(result.tempo.playedBpm).toBeNull()
    expect(Number.isFinite(result.score)).toBe(true)
    expect(() => JSON.stringify(result, strictJson)).not.toThrow()
  })

  it('never throws on any event list', () => {
    const event = fc.record({
      note: fc.integer({ min: 0, max: 127 }),
      on: fc.boolean(),
      velocity: fc.option(fc.integer({ min: 0, max: 127 }), { nil: undefined }),
      timeMs: fc.oneof(fc.double({ min: -60_000, max: 3_600_000, noNaN: true }), fc.integer({ min: 0, max: 5000 })),
    }).map(e => (e.velocity === undefined ? { note: e.note, on: e.on, timeMs: e.timeMs } : e))
    const nearScale = fc.record({
      k: fc.integer({ min: 0, max: 14 }),
      on: fc.boolean(),
      timeMs: fc.integer({ min: 0, max: 6000 }),
    }).map(({ k, on, timeMs }): PlayedEvent => ({ note: MIDIS[k]!, on, velocity: 64, timeMs }))
    fc.assert(fc.property(fc.array(fc.oneof(event, nearScale), { maxLength: 120 }), (events) => {
      const result = gradeAttempt(scale, events)
      expect(result.score).toBeGreaterThanOrEqual(0)
      expect(result.score).toBeLessThanOrEqual(100)
      expect(result.inferredFingers).toHaveLength(15)
      expect(result.notes).toHaveLength(15)
      // Stored as JSON: nothing may be NaN, infinite or undefined, which JSON would turn into null or drop.
      expect(() => JSON.stringify(result, strictJson)).not.toThrow()
    }), { numRuns: 300 })
  })
})
