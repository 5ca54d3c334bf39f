import { getAllNotes, parse, validate } from 'musicxml-io'
import { describe, expect, it } from 'vitest'
import { exportDrillMusicXml, importMusicXml, parseNotation, type DrillNote } from '../../../shared/engine'

/**
 * Reads our export back with musicxml-io, a MusicXML reader from npm that shares no code with ours:
 * each sounding note as [staff, pitch, beat, length, finger], tied pieces joined into one note
 * (MusicXML 4.0: <tie> joins notes of one pitch; <fingering> inside <technical>).
 */
function readBack(xml: string): (string | number | null)[][] {
  const score = parse(xml)
  const part = score.parts[0]!
  const divisions = Number(part.measures[0]!.attributes?.divisions)
  const measureBeats = Number(part.measures[0]!.attributes?.time?.beats) * 4 / Number(part.measures[0]!.attributes?.time?.beatType)
  const open = new Map<string, (string | number | null)[]>()
  const out: (string | number | null)[][] = []
  for (const { note, measure, position } of getAllNotes(score)) {
    if (!note.pitch) continue
    const m = part.measures.indexOf(measure)
    const alter = { 1: '#', 2: '##', [-1]: 'b', [-2]: 'bb' }[note.pitch.alter ?? 0] ?? ''
    const pitch = `${note.pitch.step}${alter}${note.pitch.octave}`
    const beat = m * measureBeats + position / divisions
    const length = note.duration / divisions
    const key = `${note.staff ?? 1}:${pitch}`
    const ties = note.ties?.map(t => t.type) ?? (note.tie ? [note.tie.type] : [])
    const continued = open.get(key)
    if (ties.includes('stop') && continued) {
      continued[3] = (continued[3] as number) + length
      if (!ties.includes('start')) open.delete(key)
      continue
    }
    const finger = note.notations?.find(n => n.type === 'technical' && n.technical === 'fingering')
    const row = [note.staff ?? 1, pitch, beat, length, finger && 'text' in finger ? Number(finger.text) : null]
    out.push(row)
    if (ties.includes('start')) open.set(key, row)
  }
  return out.sort((a, b) => (a[0] as number) - (b[0] as number) || (a[2] as number) - (b[2] as number) || String(a[1]).localeCompare(String(b[1])))
}

const rows = (notes: DrillNote[], staffOf: (n: DrillNote) => number): (string | number | null)[][] =>
  notes.map(n => [staffOf(n), n.pitch, n.beat, n.length, n.finger ?? null])
    .sort((a, b) => (a[0] as number) - (b[0] as number) || (a[2] as number) - (b[2] as number) || String(a[1]).localeCompare(String(b[1])))

describe('exportDrillMusicXml', () => {
  it('writes a grand staff that musicxml-io reads back with the same notes, lengths and fingers', () => {
    // Chords, a rest, a note tied over the bar line (C5 from beat 3 for 2 beats), a held note under
    // moving ones (the left hand's G2 under A2 B2), and triplet eighths.
    const notes = parseNotation([
      'RH E4/1:1/2 G4/2 r:1 B4/4:1 C5/5:2 | @5 D5/4:1/3 C5/3 B4/2 A4/1:1 G4/1+B4/2+D5/4:1',
      'LH C3/5+G3/1:4 | G2/5:4 @4 A2/4:1 B2/3:1 C3/2:1',
    ].join('\n'), { hand: 'both', beatsPerBar: 4 })
    const drill = { hand: 'both' as const, tempoBpm: 84, notes }
    const xml = exportDrillMusicXml(drill, { title: 'Round trip', key: 'G major', meter: '4/4' })
    const result = validate(parse(xml))
    expect(result.errors).toEqual([])
    expect(readBack(xml)).toEqual(rows(notes, n => (n.hand === 'left' ? 2 : 1)))
  })

  it('writes one hand on one staff in its clef, with the key, metre and tempo', () => {
    const notes = parseNotation('F3/1:1 E3/2 D3/3 | C3/4:3', { hand: 'left', beatsPerBar: 3 })
    const xml = exportDrillMusicXml({ hand: 'left', tempoBpm: 66, notes }, { key: 'F major', meter: '3/4' })
    const score = parse(xml)
    const attributes = score.parts[0]!.measures[0]!.attributes!
    // F major has one flat: fifths -1 (MusicXML 4.0 <key>).
    expect(attributes.key?.fifths).toBe(-1)
    expect(attributes.clef?.[0]).toMatchObject({ sign: 'F', line: 4 })
    expect(readBack(xml)).toEqual(rows(notes, () => 1))
    // And our own importer reads our export back to the same drill.
    expect(importMusicXml(xml, { hand: 'left' })).toMatchObject({ hand: 'left', tempoBpm: 66, meter: '3/4', key: 'F major', notes })
  })
})
