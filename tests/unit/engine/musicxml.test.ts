import { describe, expect, it } from 'vitest'
import { importMusicXml } from '../../../shared/engine/musicxml'
import { ImportError } from '../../../shared/engine/importing'

const note = (step: string, octave: number, duration: number, extra = ''): string =>
  `<note><pitch><step>${step}</step><octave>${octave}</octave></pitch><duration>${duration}</duration>${extra}</note>`
const fingered = (f: number): string => `<notations><technical><fingering>${f}</fingering></technical></notations>`

// Written by hand to the MusicXML 4.0 specification's elements: score-partwise, part-list/score-part,
// part, measure, attributes (divisions, key/fifths/mode, time/beats/beat-type, staves, clef),
// note (pitch/step/alter/octave, duration, chord, rest, staff, tie), backup, direction/sound@tempo,
// and notations/technical/fingering.
const GRAND_STAFF = `<?xml version="1.0" encoding="UTF-8" standalone="no"?>
<!DOCTYPE score-partwise PUBLIC "-//Recordare//DTD MusicXML 4.0 Partwise//EN" "http://www.musicxml.org/dtds/partwise.dtd">
<score-partwise version="4.0">
  <work><work-title>Five-finger warm-up</work-title></work>
  <part-list><score-part id="P1"><part-name>Piano</part-name></score-part></part-list>
  <part id="P1">
    <measure number="1">
      <attributes>
        <divisions>2</divisions>
        <key><fifths>-1</fifths><mode>major</mode></key>
        <time><beats>4</beats><beat-type>4</beat-type></time>
        <staves>2</staves>
        <clef number="1"><sign>G</sign><line>2</line></clef>
        <clef number="2"><sign>F</sign><line>4</line></clef>
      </attributes>
      <direction placement="above"><direction-type><words>Gently</words></direction-type><sound tempo="84"/></direction>
      <note><pitch><step>F</step><octave>4</octave></pitch><duration>1</duration><voice>1</voice><type>eighth</type><staff>1</staff>${fingered(1)}</note>
      <note><pitch><step>G</step><octave>4</octave></pitch><duration>1</duration><voice>1</voice><type>eighth</type><staff>1</staff>${fingered(2)}</note>
      <note><pitch><step>A</step><octave>4</octave></pitch><duration>1</duration><voice>1</voice><type>eighth</type><staff>1</staff>${fingered(3)}</note>
      <note><pitch><step>B</step><alter>-1</alter><octave>4</octave></pitch><duration>1</duration><voice>1</voice><type>eighth</type><staff>1</staff>${fingered(4)}</note>
      <note><rest/><duration>2</duration><voice>1</voice><type>quarter</type><staff>1</staff></note>
      <note><pitch><step>C</step><octave>5</octave></pitch><duration>2</duration><tie type="start"/><voice>1</voice><type>quarter</type><staff>1</staff><notations><tied type="start"/><technical><fingering>5</fingering></technical></notations></note>
      <backup><duration>8</duration></backup>
      <note><pitch><step>F</step><octave>3</octave></pitch><duration>4</duration><voice>2</voice><type>half</type><staff>2</staff>${fingered(5)}</note>
      <note><chord/><pitch><step>A</step><octave>3</octave></pitch><duration>4</duration><voice>2</voice><type>half</type><staff>2</staff>${fingered(3)}</note>
      <note><chord/><pitch><step>C</step><octave>4</octave></pitch><duration>4</duration><voice>2</voice><type>half</type><staff>2</staff>${fingered(1)}</note>
      <note><rest/><duration>4</duration><voice>2</voice><type>half</type><staff>2</staff></note>
    </measure>
    <measure number="2">
      <note><pitch><step>C</step><octave>5</octave></pitch><duration>2</duration><tie type="stop"/><voice>1</voice><type>quarter</type><staff>1</staff></note>
      <note><pitch><step>F</step><alter>1</alter><octave>4</octave></pitch><duration>6</duration><voice>1</voice><type>half</type><dot/><staff>1</staff>${fingered(2)}</note>
      <backup><duration>8</duration></backup>
      <note><pitch><step>F</step><octave>2</octave></pitch><duration>8</duration><voice>2</voice><type>whole</type><staff>2</staff></note>
    </measure>
  </part>
</score-partwise>`

describe('importMusicXml', () => {
  it('reads a grand-staff file with fingers, chords, rests, ties, backup, tempo, key and metre', () => {
    const drill = importMusicXml(GRAND_STAFF)
    expect(drill.hand).toBe('both')
    expect(drill.tempoBpm).toBe(84)
    expect(drill.key).toBe('F major')
    expect(drill.meter).toBe('4/4')
    expect(drill.title).toBe('Five-finger warm-up')
    const right = drill.notes.filter(n => n.hand === 'right')
    const left = drill.notes.filter(n => n.hand === 'left')
    expect(right).toEqual([
      { pitch: 'F4', beat: 0, length: 0.5, hand: 'right', finger: 1 },
      { pitch: 'G4', beat: 0.5, length: 0.5, hand: 'right', finger: 2 },
      { pitch: 'A4', beat: 1, length: 0.5, hand: 'right', finger: 3 },
      { pitch: 'Bb4', beat: 1.5, length: 0.5, hand: 'right', finger: 4 },
      // The tie across the bar line makes one note of two beats.
      { pitch: 'C5', beat: 3, length: 2, hand: 'right', finger: 5 },
      { pitch: 'F#4', beat: 5, length: 3, hand: 'right', finger: 2 },
    ])
    expect(left.map(n => [n.pitch, n.beat, n.length, n.finger])).toEqual([
      ['F3', 0, 2, 5], ['A3', 0, 2, 3], ['C4', 0, 2, 1], ['F2', 4, 4, undefined],
    ])
  })

  it('gives a one-staff part to the hand asked for, tempo from a metronome mark', () => {
    const xml = `<score-partwise version="4.0"><part id="P1"><measure number="1">
      <attributes><divisions>1</divisions><time><beats>3</beats><beat-type>4</beat-type></time></attributes>
      <direction><direction-type><metronome><beat-unit>half</beat-unit><per-minute>40</per-minute></metronome></direction-type></direction>
      ${note('E', 3, 1, fingered(3))}${note('D', 3, 1, fingered(4))}${note('C', 3, 1, fingered(5))}
    </measure></part></score-partwise>`
    const drill = importMusicXml(xml, { hand: 'left' })
    expect(drill.hand).toBe('left')
    // MusicXML 4.0 <metronome>: a half-note beat at 40 per minute is 80 quarter notes per minute.
    expect(drill.tempoBpm).toBe(80)
    expect(drill.meter).toBe('3/4')
    expect(drill.notes.map(n => [n.pitch, n.beat, n.finger])).toEqual([['E3', 0, 3], ['D3', 1, 4], ['C3', 2, 5]])
    expect(drill.notes[0]).not.toHaveProperty('hand')
  })

  it('gives a grand staff with notes on the lower staff only to the left hand', () => {
    const xml = `<score-partwise version="4.0"><part id="P1"><measure number="1">
      <attributes><divisions>1</divisions><staves>2</staves></attributes>
      ${note('C', 3, 1, '<staff>2</staff>')}${note('D', 3, 1, '<staff>2</staff>')}
    </measure></part></score-partwise>`
    const drill = importMusicXml(xml)
    expect(drill.hand).toBe('left')
    expect(drill.notes.every(n => n.hand === undefined)).toBe(true)
  })

  it.each([
    ['plain text', 'hello', /not well-formed XML|not a MusicXML/],
    ['broken XML', '<score-partwise><part></score-partwise>', /not well-formed XML \(line 1/],
    ['another XML format', '<svg xmlns="http://www.w3.org/2000/svg"></svg>', /root element is <svg>/],
    ['a timewise score', '<score-timewise version="4.0"></score-timewise>', /score-timewise is not supported/],
    ['a compressed file', 'PK\u0003\u0004rest-of-zip', /compressed MusicXML/],
    ['a score without notes', '<score-partwise><part id="P1"><measure number="1"/></part></score-partwise>', /no notes/],
    ['a duration before divisions', `<score-partwise><part id="P1"><measure number="7">${note('C', 4, 1)}</measure></part></score-partwise>`, /Measure 7: .*divisions/],
    ['a part that is not there', '<score-partwise><part id="P1"/></score-partwise>', /Part 2 does not exist/],
  ])('rejects %s with a clear error', (_, xml, message) => {
    const run = (): unknown => importMusicXml(xml, { part: xml.includes('<part id="P1"/>') ? 2 : 1 })
    expect(run).toThrow(ImportError)
    expect(run).toThrow(message)
  })
})
