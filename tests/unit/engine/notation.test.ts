import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { formatNotation, NOTATION_HELP, NotationError, parseNotation } from '../../../shared/engine/notation'
import type { DrillNote } from '../../../shared/types/drill'
import { DrillNote as DrillNoteSchema } from '../../../shared/types/drill'
import { midiFromName as midiOf } from '../../../shared/engine/pitch'

describe('parseNotation', () => {
  it('reads notes with fingers and a sticky length', () => {
    expect(parseNotation('C4/1:1/2 D4/2 E4/3:1 F4', { hand: 'right' })).toEqual([
      { pitch: 'C4', beat: 0, length: 0.5, finger: 1 },
      { pitch: 'D4', beat: 0.5, length: 0.5, finger: 2 },
      { pitch: 'E4', beat: 1, length: 1, finger: 3 },
      { pitch: 'F4', beat: 2, length: 1 },
    ])
  })

  it('reads rests, chords, bar lines, comments and spelled accidentals', () => {
    const notes = parseNotation('c4/1+e4/3+g4/5:2 r:1 F##4/2 | Bb4/4:4 ; a comment\n| Cb5/5', { hand: 'right', beatsPerBar: 4 })
    expect(notes).toEqual([
      { pitch: 'C4', beat: 0, length: 2, finger: 1 },
      { pitch: 'E4', beat: 0, length: 2, finger: 3 },
      { pitch: 'G4', beat: 0, length: 2, finger: 5 },
      { pitch: 'F##4', beat: 3, length: 1, finger: 2 },
      { pitch: 'Bb4', beat: 4, length: 4, finger: 4 },
      { pitch: 'Cb5', beat: 8, length: 4, finger: 5 },
    ])
  })

  it('lets a chord hold one note while the next moves, and @ jump back', () => {
    const notes = parseNotation('C4/1:4+E4/3:1 F4/4 @0 G3/5:2', { hand: 'right' })
    expect(notes.map(n => [n.pitch, n.beat, n.length])).toEqual([['C4', 0, 4], ['E4', 0, 1], ['F4', 1, 1], ['G3', 0, 2]])
  })

  it('gives each hand its own beats in a both-hands drill', () => {
    const notes = parseNotation('RH C5/1 D5/2\nLH C3/5 D3/4', { hand: 'both' })
    expect(notes).toEqual([
      { pitch: 'C5', beat: 0, length: 1, hand: 'right', finger: 1 },
      { pitch: 'D5', beat: 1, length: 1, hand: 'right', finger: 2 },
      { pitch: 'C3', beat: 0, length: 1, hand: 'left', finger: 5 },
      { pitch: 'D3', beat: 1, length: 1, hand: 'left', finger: 4 },
    ])
  })

  it('keeps triplets exact', () => {
    const notes = parseNotation('C4:1/3 D4 E4 F4:1', { hand: 'left' })
    expect(notes[3]!.beat).toBe(1)
  })

  it.each([
    ['C4/1 H4/2', 1, 6, /not a note/],
    ['C4/6', 1, 4, /Finger 6/],
    ['C4:0', 1, 4, /more than 0/],
    ['C4:x', 1, 4, /not a number/],
    ['C4:1/0', 1, 4, /divides by zero/],
    ['C4\n  D4 G#9', 2, 6, /MIDI range/],
    ['C4:4 | D4:1 E4 E4 |', 1, 19, /falls 3 beats into a 4-beat bar/],
    ['LH C3', 1, 1, /right hand/],
    ['C4/1+E4/3+X4', 1, 11, /"X4" is not a note/],
  ])('rejects %j at line %i, column %i', (text, line, column, message) => {
    const error = (() => {
      try {
        parseNotation(text, { hand: 'right', beatsPerBar: 4 })
      }
      catch (e) {
        return e
      }
    })()
    expect(error).toBeInstanceOf(NotationError)
    expect((error as NotationError).message).toMatch(message)
    expect([(error as NotationError).line, (error as NotationError).column]).toEqual([line, column])
  })

  it('asks for a hand marker in a both-hands drill', () => {
    expect(() => parseNotation('C4', { hand: 'both' })).toThrow(/RH or LH/)
  })

  it('accepts an upbeat before the first bar line', () => {
    expect(parseNotation('G3 | C4:4 | D4', { hand: 'right', beatsPerBar: 4 })).toHaveLength(3)
  })

  it('documents every token kind in the help text', () => {
    for (const token of ['/1', ':', 'r', '+', '|', 'RH', 'LH', '@', ';']) expect(NOTATION_HELP).toContain(token)
  })
})

describe('formatNotation', () => {
  it('writes compact notation with bar lines', () => {
    const notes = parseNotation('C4/1:1/2 D4/2 E4/3 F4/1 G4/2 A4/3 B4/4 C5/5', { hand: 'right' })
    expect(formatNotation(notes, { beatsPerBar: 2 })).toBe('C4/1:1/2 D4/2 E4/3 F4/1 | G4/2 A4/3 B4/4 C5/5')
  })

  it('round-trips a both-hands drill with chords, rests and overlaps', () => {
    const text = 'RH C5/1+E5/3:2 r:1 D5/2:1/2 E5/3 |\nLH C3/5:3/4 G3/1:1/4 @0.5 E3/3:1 r:1/3 F3/2'
    const notes = parseNotation(text, { hand: 'both' })
    const canonical = (ns: DrillNote[]): DrillNote[] => [...ns].sort((a, b) => a.hand!.localeCompare(b.hand!) || a.beat - b.beat || a.pitch.localeCompare(b.pitch))
    expect(canonical(parseNotation(formatNotation(notes), { hand: 'both' }))).toEqual(canonical(notes))
  })

  const voice = fc.array(fc.record({
    pitch: fc.constantFrom('C4', 'D#4', 'Eb4', 'F##3', 'Cb5', 'B3', 'G-1', 'G9'),
    gap: fc.constantFrom(0, 0.25, 1 / 3, 1, 1.5),
    length: fc.constantFrom(0.25, 0.5, 1 / 3, 1, 2, 3.75),
    finger: fc.option(fc.integer({ min: 1, max: 5 }), { nil: undefined }),
  }), { minLength: 1, maxLength: 30 })

  it('parse(format(notes)) gives the notes back', () => {
    fc.assert(fc.property(voice, (spec) => {
      let beat = 0
      const notes: DrillNote[] = spec.map((s) => {
        beat += s.gap
        return DrillNoteSchema.parse({ pitch: s.pitch, beat, length: s.length, ...(s.finger ? { finger: s.finger } : {}) })
      })
      const back = parseNotation(formatNotation(notes, { beatsPerBar: 4 }), { hand: 'right' })
      const canonical = [...notes].sort((a, b) => a.beat - b.beat || midiOf(a.pitch) - midiOf(b.pitch))
      expect(back).toHaveLength(notes.length)
      back.forEach((n, k) => {
        expect(n.beat).toBeCloseTo(canonical[k]!.beat, 6)
        expect(n.length).toBeCloseTo(canonical[k]!.length, 6)
      })
      expect(new Set(back.map(n => `${n.beat.toFixed(6)} ${n.pitch} ${n.finger}`))).toEqual(new Set(notes.map(n => `${n.beat.toFixed(6)} ${n.pitch} ${n.finger}`)))
    }))
  })
})
