// Soft notes and accents through the engine: notation, MusicXML, suggestion, grading and the drill schema.
import { describe, expect, it } from 'vitest'
import { checkFingering } from '../../../shared/engine/check'
import { gradeAttempt } from '../../../shared/engine/grade'
import { importMusicXml } from '../../../shared/engine/musicxml'
import { formatNotation, NOTATION_HELP, parseNotation } from '../../../shared/engine/notation'
import { suggestFingering } from '../../../shared/engine/suggest'
import type { DrillMusic, PlayedEvent } from '../../../shared/engine/types'
import { DrillNote } from '../../../shared/types/drill'

describe('emphasis in the text notation', () => {
  it('reads > as an accent and p as a soft note, in single notes and chord members, and writes them back', () => {
    const notes = parseNotation('C4/1 D4/2p E4/3:1/2> F4p+A4/4> G4', { hand: 'right' })
    expect(notes.map(n => n.emphasis)).toEqual([undefined, 'soft', 'accent', 'soft', 'accent', undefined])
    expect(notes[2]).toMatchObject({ pitch: 'E4', finger: 3, length: 0.5 })
    expect(formatNotation(notes)).toBe('C4/1 D4/2p E4/3:1/2> F4p+A4/4> G4')
    expect(parseNotation(formatNotation(notes), { hand: 'right' })).toEqual(notes)
  })

  it('says how to write it in the help', () => {
    expect(NOTATION_HELP).toContain('C4/3>')
    expect(NOTATION_HELP).toContain('C4/1p')
  })

  it('rejects any other mark with the note named', () => {
    expect(() => parseNotation('C4/1!', { hand: 'right' })).toThrow(/"C4\/1!" is not a note/)
  })
})

describe('emphasis from MusicXML', () => {
  // Written by hand to the MusicXML 4.0 specification: notations/articulations/accent and
  // strong-accent, direction/direction-type/dynamics (p, pp, f, ff, mf) with a staff, notations/dynamics.
  const note = (step: string, extra = ''): string =>
    `<note><pitch><step>${step}</step><octave>4</octave></pitch><duration>1</duration><staff>1</staff>${extra}</note>`
  const dynamics = (mark: string): string => `<direction><direction-type><dynamics><${mark}/></dynamics></direction-type><staff>1</staff></direction>`
  const xml = `<score-partwise version="4.0"><part id="P1"><measure number="1">
    <attributes><divisions>1</divisions></attributes>
    ${note('C')}${note('D', '<notations><articulations><accent/></articulations></notations>')}${note('E', '<notations><articulations><strong-accent type="up"/></articulations></notations>')}
    ${dynamics('pp')}${note('F')}${note('G')}${dynamics('mf')}${note('A')}${dynamics('ff')}${note('B')}
    ${dynamics('p')}${note('C', '<notations><articulations><accent/></articulations></notations>')}${note('D', '<notations><dynamics><f/></dynamics></notations>')}
  </measure></part></score-partwise>`

  it('marks accents, and soft or accented notes after p/pp and f/ff until mp/mf', () => {
    const drill = importMusicXml(xml)
    expect(drill.notes.map(n => n.emphasis ?? null)).toEqual([null, 'accent', 'accent', 'soft', 'soft', null, 'accent', 'accent', 'accent'])
  })
})

describe('emphasis in the suggestion', () => {
  it('moves the thumb off a soft passing note where another fingering serves', () => {
    // Right hand G4 down to A3: the model's 4 3 2 1 3 2 1 puts the thumb on D4; with D4 soft the
    // thumb goes to C4 instead (common practice: the thumb is the heaviest finger).
    const notes = [67, 65, 64, 62, 60, 59, 57]
    expect(suggestFingering({ hand: 'right', notes }).fingers[3]).toBe(1)
    const soft = suggestFingering({ hand: 'right', notes, emphasis: [null, null, null, 'soft', null, null, null] }).fingers
    expect(soft[3]).not.toBe(1)
    expect(soft).toContain(1)
  })

  it('puts an accent on a strong finger where one serves', () => {
    // E4 up to D5: the model's 1 2 3 1 2 3 4 ends on 4; an accented D5 takes 3 (common practice).
    const notes = [64, 65, 67, 69, 71, 72, 74]
    expect(suggestFingering({ hand: 'right', notes }).fingers[6]).toBe(4)
    expect(suggestFingering({ hand: 'right', notes, emphasis: [null, null, null, null, null, null, 'accent'] }).fingers[6]).toBeLessThanOrEqual(3)
  })

  it('does not move the hand for an accent', () => {
    // C E F G F E C in one five-finger position: an accented G keeps 4 rather than a position change.
    const notes = [60, 64, 65, 67, 65, 64, 60]
    const result = suggestFingering({ hand: 'right', notes, emphasis: [null, null, null, 'accent', null, null, null] })
    expect(result.positionChanges).toBe(0)
  })

  it('is named by the check', () => {
    const issues = checkFingering({ hand: 'right', notes: [67, 65, 64, 62, 60], fingers: [5, 4, 3, 1, 2], emphasis: [null, null, null, 'soft', 'accent'] })
    expect(issues.map(i => i.rule)).toContain('softThumb')
    const accent = checkFingering({ hand: 'right', notes: [60, 62, 64, 65, 67], fingers: [1, 2, 3, 4, 5], emphasis: [null, null, null, null, 'accent'] })
    expect(accent.map(i => [i.rule, i.index])).toEqual([['weakAccent', 4]])
  })
})

describe('emphasis in grading', () => {
  // Eight quavers C4 to C5 at 100 bpm, the fourth and eighth accented, the sixth soft.
  const drill: DrillMusic = {
    hand: 'right',
    tempoBpm: 100,
    notes: ['C4', 'D4', 'E4', 'F4', 'G4', 'A4', 'B4', 'C5'].map((pitch, k) => ({
      pitch,
      beat: k / 2,
      length: 0.5,
      ...(k === 3 || k === 7 ? { emphasis: 'accent' as const } : k === 5 ? { emphasis: 'soft' as const } : {}),
    })),
  }
  const play = (velocity: (k: number) => number): PlayedEvent[] => [60, 62, 64, 65, 67, 69, 71, 72].flatMap((note, k) => [
    { note, on: true, velocity: velocity(k), timeMs: 1000 + k * 300 },
    { note, on: false, timeMs: 1000 + k * 300 + 280 },
  ])

  it('counts planned accents and soft notes as even when each group is even', () => {
    const result = gradeAttempt(drill, play(k => (k === 3 || k === 7 ? 96 : k === 5 ? 48 : 70)))
    expect(result.loudness.sd).toBeCloseTo(0, 9)
    expect(result.loudness.emphasis).toEqual({ accentLift: 26, softDrop: 22, accentsStandOut: true, softStaysSoft: true })
    expect(result.scoreParts.loudness.value).toBeCloseTo(1, 9)
  })

  it('says when accents do not stand out and soft notes are not soft, and marks it down', () => {
    const flat = gradeAttempt(drill, play(() => 70))
    expect(flat.loudness.sd).toBeCloseTo(0, 9)
    expect(flat.loudness.emphasis).toEqual({ accentLift: 0, softDrop: 0, accentsStandOut: false, softStaysSoft: false })
    // Two checks failed, a quarter each (SCORE_FORMULA).
    expect(flat.scoreParts.loudness.value).toBeCloseTo(0.5, 9)
  })

  it('measures unevenness within a group, not between groups', () => {
    // Ordinary notes alternating 60 and 80: an SD of 10 among them, whatever the accents do.
    const result = gradeAttempt(drill, play(k => (k === 3 || k === 7 ? 100 : k === 5 ? 40 : k % 2 ? 80 : 60)))
    expect(result.loudness.sd).toBeGreaterThan(5)
    expect(result.loudness.emphasis.accentsStandOut).toBe(true)
  })

  it('leaves the checks out of a drill without marks', () => {
    const plain: DrillMusic = { ...drill, notes: drill.notes.map(({ emphasis: _, ...n }) => n) }
    expect(gradeAttempt(plain, play(() => 70)).loudness.emphasis).toEqual({ accentLift: null, softDrop: null, accentsStandOut: null, softStaysSoft: null })
  })
})

describe('the drill-note schema', () => {
  it('accepts soft and accent and nothing else', () => {
    expect(DrillNote.parse({ pitch: 'C4', beat: 0, length: 1, emphasis: 'soft' }).emphasis).toBe('soft')
    expect(DrillNote.safeParse({ pitch: 'C4', beat: 0, length: 1, emphasis: 'loud' }).success).toBe(false)
  })
})
