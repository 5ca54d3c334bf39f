import { describe, expect, it } from 'vitest'
import { gradeAttempt } from '../../../shared/engine'
import type { DrillMusic } from '../../../shared/types/drill'
import type { PlayedEvent } from '../../../shared/types/attempt'
import { gradeSentences } from '../../../utils/gradeSentences'

// C D E F G, fingers 1–5, one note a beat at 60 bpm: a five-finger pattern (common practice).
const drill: DrillMusic = {
  hand: 'right',
  tempoBpm: 60,
  notes: ['C4', 'D4', 'E4', 'F4', 'G4'].map((pitch, i) => ({ pitch, beat: i, length: 1, finger: i + 1 })),
}
const pitches = drill.notes.map(n => n.pitch)
const MIDI = [60, 62, 64, 65, 67]

function play(velocities: (number | undefined)[], skip: number[] = []): PlayedEvent[] {
  return MIDI.flatMap((note, i) => (skip.includes(i)
    ? []
    : [{ note, on: true, velocity: velocities[i], timeMs: i * 1000 }, { note, on: false, velocity: 0, timeMs: i * 1000 + 900 }]))
}

describe('the grade in sentences', () => {
  it('says a clean run was right and steady, and names a heavy thumb', () => {
    const result = gradeAttempt(drill, play([104, 70, 71, 69, 70]), { targetBpm: 60 })
    const sentences = gradeSentences(result, pitches, 'the tempo your teacher set')
    expect(sentences[0]).toBe('Every note was right.')
    expect(sentences).toContain('Steady timing.')
    expect(sentences).toContain('Your thumb played louder than your other fingers.')
    expect(sentences.at(-1)).toBe('You played at about 60 bpm; the grade compares this with 60 bpm, the tempo your teacher set.')
  })

  it('says touch was not graded when the input had no velocity', () => {
    const result = gradeAttempt(drill, play([undefined, undefined, undefined, undefined, undefined]))
    expect(gradeSentences(result, pitches)).toContain('Touch was not graded: this input cannot tell how hard a key was struck.')
  })

  it('counts a missed note and points at the first slip', () => {
    const result = gradeAttempt(drill, play([70, 70, 70, 70, 70], [2]))
    expect(gradeSentences(result, pitches)[0]).toBe('4 of 5 notes were right (1 missed note). The first slip was note 3 (E4).')
  })
})
