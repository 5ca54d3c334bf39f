import { describe, expect, it } from 'vitest'
import { quantiseRecording, recordedNotes, trimRecording, type RecordedNote } from '../../../shared/utils/recording'

/** Notes played at `tempoBpm`, each given by its onset and release in beats, nudged by `jitterMs`. */
function played(tempoBpm: number, notes: [midi: number, onBeat: number, offBeat: number, jitterMs?: number][], startMs = 12_345): RecordedNote[] {
  const beatMs = 60_000 / tempoBpm
  return notes.map(([midi, on, off, jitter = 0]) => ({ midi, onMs: startMs + on * beatMs + jitter, offMs: startMs + off * beatMs + jitter }))
}

const beats = (notes: { beat: number }[]): number[] => notes.map(n => n.beat)

describe('quantiseRecording', () => {
  // A triplet divides the beat in three (common practice): at 90 bpm a beat is 666.7 ms, each triplet
  // eighth 222.2 ms. Played a little unevenly, the triplet grid writes thirds of a beat.
  const triplets = played(90, [[60, 0, 1 / 3, 8], [62, 1 / 3, 2 / 3, -15], [64, 2 / 3, 1, 20], [65, 1, 4 / 3, -10], [67, 4 / 3, 5 / 3, 12], [69, 5 / 3, 2, 0], [71, 2, 3, -5]])

  it('writes triplets in thirds of a beat on the triplet grid', () => {
    const notes = quantiseRecording(triplets, { tempoBpm: 90, grid: 'triplet' })
    expect(notes.map(n => n.pitch)).toEqual(['C4', 'D4', 'E4', 'F4', 'G4', 'A4', 'B4'])
    expect(beats(notes)).toEqual([0, 1 / 3, 2 / 3, 1, 4 / 3, 5 / 3, 2])
    expect(notes.map(n => n.length)).toEqual([1 / 3, 1 / 3, 1 / 3, 1 / 3, 1 / 3, 1 / 3, 1])
  })

  it('on a sixteenth grid puts the same triplets on quarter beats, not thirds', () => {
    // 1/3 of a beat lies nearer 1/4 than 1/2, and 2/3 nearer 3/4: a quantiser that ignored the
    // chosen grid could not give both this and the triplet answer above.
    const notes = quantiseRecording(triplets, { tempoBpm: 90, grid: 'sixteenth' })
    expect(beats(notes).slice(0, 4)).toEqual([0, 0.25, 0.75, 1])
  })

  it('writes an uneven run of eighths on the eighth grid and of sixteenths on the sixteenth grid', () => {
    // 120 bpm: an eighth is 250 ms, a sixteenth 125 ms; each note up to 60 ms early or late.
    const eighths = played(120, [[60, 0, 0.5], [62, 0.5, 1, 40], [64, 1, 1.5, -60], [65, 1.5, 2, 55]])
    expect(beats(quantiseRecording(eighths, { tempoBpm: 120, grid: 'eighth' }))).toEqual([0, 0.5, 1, 1.5])
    const sixteenths = played(120, [[60, 0, 0.25], [62, 0.25, 0.5, 30], [64, 0.5, 0.75, -25], [65, 0.75, 1, 20]])
    expect(beats(quantiseRecording(sixteenths, { tempoBpm: 120, grid: 'sixteenth' }))).toEqual([0, 0.25, 0.5, 0.75])
    // The same sixteenths on the eighth grid cannot stay four distinct steps apart.
    expect(beats(quantiseRecording(sixteenths, { tempoBpm: 120, grid: 'eighth' }))).toEqual([0, 0.5, 0.5, 1])
  })

  it('counts beats from the tempo the recording was played at', () => {
    // Quarter notes at 60 bpm are 1000 ms apart; read at 120 bpm the same sound is half notes.
    const quarters = played(60, [[60, 0, 1], [62, 1, 2], [64, 2, 3]])
    expect(beats(quantiseRecording(quarters, { tempoBpm: 60, grid: 'eighth' }))).toEqual([0, 1, 2])
    expect(beats(quantiseRecording(quarters, { tempoBpm: 120, grid: 'eighth' }))).toEqual([0, 2, 4])
  })

  it('starts at beat 0, however late the first note came', () => {
    const late = played(100, [[67, 0, 1], [65, 1, 2]], 987_654)
    expect(beats(quantiseRecording(late, { tempoBpm: 100, grid: 'sixteenth' }))).toEqual([0, 1])
  })

  it('reads onsets against the metronome\'s beats when one clicked, keeping an off-beat start off the beat', () => {
    // The metronome's beat 0 at 10 s; at 100 bpm (600 ms a beat) the drill starts on the "and" of beat 3.
    const zero = 10_000
    const offBeat = played(100, [[60, 2.5, 3], [62, 3, 3.5, 25], [64, 3.5, 4, -30], [65, 4, 5, 10]], zero)
    expect(beats(quantiseRecording(offBeat, { tempoBpm: 100, grid: 'eighth', originMs: zero }))).toEqual([0.5, 1, 1.5, 2])
    // Without the metronome the first note is the drill's beat 0.
    expect(beats(quantiseRecording(offBeat, { tempoBpm: 100, grid: 'eighth' }))).toEqual([0, 0.5, 1, 1.5])
    // A note played a little before the click's beat 0 still lands on it.
    const early = played(100, [[60, 0, 1, -40], [62, 1, 2]], zero)
    expect(beats(quantiseRecording(early, { tempoBpm: 100, grid: 'sixteenth', originMs: zero }))).toEqual([0, 1])
  })

  it('gives a short note one step, a held note its rounded length, and a chord one beat', () => {
    const notes = quantiseRecording(played(120, [[60, 0, 0.05], [64, 1, 2.9], [67, 1, 2.9, 18], [72, 3, 3.4]]), { tempoBpm: 120, grid: 'eighth' })
    expect(notes).toEqual([
      { pitch: 'C4', beat: 0, length: 0.5 },
      { pitch: 'E4', beat: 1, length: 2 },
      { pitch: 'G4', beat: 1, length: 2 },
      { pitch: 'C5', beat: 3, length: 0.5 },
    ])
  })

  it('keeps one note for a key bounced twice onto one step', () => {
    const notes = quantiseRecording(played(120, [[60, 0, 0.02], [60, 0.06, 1]]), { tempoBpm: 120, grid: 'sixteenth' })
    expect(notes).toEqual([{ pitch: 'C4', beat: 0, length: 1 }])
  })

  it('spells black keys as the key signature does', () => {
    // F major has one flat, B♭; E major has four sharps, among them D♯ (any theory handbook).
    expect(quantiseRecording(played(80, [[70, 0, 1]]), { tempoBpm: 80, grid: 'eighth', key: 'F major' })[0]!.pitch).toBe('Bb4')
    expect(quantiseRecording(played(80, [[63, 0, 1]]), { tempoBpm: 80, grid: 'eighth', key: 'E major' })[0]!.pitch).toBe('D#4')
  })
})

describe('trimRecording', () => {
  const six = played(120, [[60, 0, 1], [62, 1, 2], [64, 2, 3], [65, 3, 4], [67, 4, 5], [69, 5, 6]])

  it('keeps the first and the last note it is given, both counted from 1', () => {
    expect(trimRecording(six, 2, 5).map(n => n.midi)).toEqual([62, 64, 65, 67])
    expect(trimRecording(six, 1, 6).map(n => n.midi)).toEqual([60, 62, 64, 65, 67, 69])
    expect(trimRecording(six, 3, 3).map(n => n.midi)).toEqual([64])
  })

  it('brings bounds outside the recording inside it, and keeps nothing for a start after the end', () => {
    expect(trimRecording(six, 0, 99).map(n => n.midi)).toEqual([60, 62, 64, 65, 67, 69])
    expect(trimRecording(six, 5, 2)).toEqual([])
  })

  it('puts the first kept note on beat 0 once quantised', () => {
    const notes = quantiseRecording(trimRecording(six, 3, 6), { tempoBpm: 120, grid: 'eighth' })
    expect(notes.map(n => [n.pitch, n.beat])).toEqual([['E4', 0], ['F4', 1], ['G4', 2], ['A4', 3]])
  })
})

describe('recordedNotes', () => {
  it('pairs presses and releases, holds a key still down to the end, and drops a lone release', () => {
    const notes = recordedNotes([
      { note: 64, on: false, timeStampMs: 90 },
      { note: 60, on: true, timeStampMs: 100 },
      { note: 62, on: true, timeStampMs: 300 },
      { note: 60, on: false, timeStampMs: 350 },
      { note: 60, on: true, timeStampMs: 400 },
      { note: 62, on: false, timeStampMs: 500 },
    ], 900)
    expect(notes).toEqual([
      { midi: 60, onMs: 100, offMs: 350 },
      { midi: 62, onMs: 300, offMs: 500 },
      { midi: 60, onMs: 400, offMs: 900 },
    ])
  })
})
