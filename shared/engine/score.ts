// A drill laid out as a score: staves (one per hand on a grand staff), measures by the metre, and in
// each measure the voices a staff needs so that every note keeps its own onset and length. The
// MusicXML exporter writes this layout and the staff view engraves it, so both show the same bars.
//
// Beats are quarter notes, as in MusicXML <divisions> and MIDI ticks per quarter note: a measure of
// 6/8 lasts 3 beats.
import { Key } from 'tonal'
import { drillNoteHands } from './hands'
import { midiFromName, normalizeName } from './pitch'
import type { DrillMusic, Finger, Hand } from './types'

/** Onsets and lengths on a 1/2880-beat grid, fine enough for thirds, fifths and 64ths. */
const GRID = 2880
const onGrid = (beat: number): number => Math.round(beat * GRID) / GRID

export interface ScoreNote {
  /** The spelled pitch, as `F#4`. */
  pitch: string
  midi: number
  /** Index of the drill note this comes from. */
  index: number
  finger: Finger | null
  /** This piece is tied to the next piece of the same note (the note crosses a bar line). */
  tieStart: boolean
  /** This piece continues a note begun earlier. */
  tieStop: boolean
}

export interface ScoreEvent {
  /** Beats from the start of the measure. */
  onset: number
  duration: number
  /** Empty for a rest; low to high for a chord. */
  notes: ScoreNote[]
}

export interface ScoreStaff {
  hand: Hand
  clef: 'treble' | 'bass'
  /** Per measure, the voices; each voice's events fill the measure from its start to its end. */
  measures: ScoreEvent[][][]
}

export interface ScoreLayout {
  /** `beats/beatType` as in the time signature. */
  beats: number
  beatType: number
  /** Length of one measure in quarter-note beats. */
  measureBeats: number
  /** Sharps (positive) or flats (negative) in the key signature. */
  fifths: number
  measureCount: number
  staves: ScoreStaff[]
}

/** `4/4`, `6/8`; anything unreadable is 4/4. */
export function parseMeter(meter: string | null | undefined): { beats: number, beatType: number } {
  const match = /^(\d{1,2})\/(1|2|4|8|16|32)$/.exec(meter?.trim() ?? '')
  return match ? { beats: Number(match[1]), beatType: Number(match[2]) } : { beats: 4, beatType: 4 }
}

/** Key signature fifths of `Eb major`, `d minor`, `F#`; 0 (no signature) when the key is unknown. */
export function keyFifths(key: string | null | undefined): number {
  const spelled = (key ?? '').replace(/ sharp\b/i, '#').replace(/ flat\b/i, 'b')
  const match = /^\s*([A-Ga-g](?:#|b)?)\s*(major|minor|maj|min|m)?\s*$/.exec(spelled)
  if (!match) return 0
  const tonic = match[1]![0]!.toUpperCase() + match[1]!.slice(1)
  const minor = match[2] !== undefined && match[2].startsWith('m') && !match[2].startsWith('maj')
  const alteration = minor ? Key.minorKey(tonic).alteration : Key.majorKey(tonic).alteration
  // Keys beyond seven sharps or flats have no signature of their own.
  return Math.abs(alteration) <= 7 ? alteration : 0
}

interface Group { beat: number, length: number, notes: ScoreNote[] }

/** Notes struck together with the same length are one chord; the rest go to further voices. */
function voicesOf(groups: Group[]): Group[][] {
  const voices: { end: number, groups: Group[] }[] = []
  for (const group of groups) {
    const free = voices.find(v => v.end <= group.beat)
    const voice = free ?? { end: 0, groups: [] }
    if (!free) voices.push(voice)
    voice.groups.push(group)
    voice.end = onGrid(group.beat + group.length)
  }
  return voices.map(v => v.groups)
}

/** One voice cut into measures: rests fill the gaps, and notes across a bar line are tied pieces. */
function measuresOf(groups: Group[], measureBeats: number, measureCount: number): ScoreEvent[][] {
  const measures: ScoreEvent[][] = Array.from({ length: measureCount }, () => [])
  const cursor = new Array<number>(measureCount).fill(0)
  const place = (m: number, onset: number, duration: number, notes: ScoreNote[]): void => {
    if (onset > cursor[m]!) measures[m]!.push({ onset: cursor[m]!, duration: onGrid(onset - cursor[m]!), notes: [] })
    measures[m]!.push({ onset, duration, notes })
    cursor[m] = onGrid(onset + duration)
  }
  for (const group of groups) {
    let start = group.beat
    const end = onGrid(group.beat + group.length)
    let first = true
    while (start < end) {
      const m = Math.floor(onGrid(start / measureBeats))
      const measureEnd = (m + 1) * measureBeats
      const pieceEnd = Math.min(end, measureEnd)
      const last = pieceEnd >= end
      place(m, onGrid(start - m * measureBeats), onGrid(pieceEnd - start), group.notes.map(n => ({ ...n, tieStop: !first, tieStart: !last })))
      start = pieceEnd
      first = false
    }
  }
  measures.forEach((events, m) => {
    if (cursor[m]! < measureBeats) events.push({ onset: cursor[m]!, duration: onGrid(measureBeats - cursor[m]!), notes: [] })
  })
  return measures
}

export function scoreLayout(drill: DrillMusic & { meter?: string | null, key?: string | null }): ScoreLayout {
  const { beats, beatType } = parseMeter(drill.meter)
  const measureBeats = onGrid((beats * 4) / beatType)
  const hands = drillNoteHands(drill)
  const notes = drill.notes.map((n, index) => ({ n, index, midi: midiFromName(n.pitch), hand: hands[index]! }))
  const end = Math.max(...notes.map(({ n }) => n.beat + n.length), 0)
  const measureCount = Math.max(1, Math.ceil(onGrid(end / measureBeats)))
  const staffHands: Hand[] = drill.hand === 'both' ? ['right', 'left'] : [drill.hand]

  const staves = staffHands.map((hand): ScoreStaff => {
    const own = notes.filter(x => x.hand === hand).sort((a, b) => a.n.beat - b.n.beat || a.n.length - b.n.length || a.midi - b.midi)
    const groups: Group[] = []
    for (const { n, index, midi } of own) {
      const beat = onGrid(n.beat)
      const length = onGrid(n.length)
      const last = groups[groups.length - 1]
      const note: ScoreNote = { pitch: normalizeName(n.pitch), midi, index, finger: n.finger ?? null, tieStart: false, tieStop: false }
      if (last && last.beat === beat && last.length === length) last.notes.push(note)
      else groups.push({ beat, length, notes: [note] })
    }
    const voices = voicesOf(groups).map(v => measuresOf(v, measureBeats, measureCount))
    if (voices.length === 0) voices.push(measuresOf([], measureBeats, measureCount))
    const mean = own.reduce((s, x) => s + x.midi, 0) / Math.max(1, own.length)
    const clef = drill.hand === 'both' ? (hand === 'right' ? 'treble' : 'bass') : (own.length && mean < 60 ? 'bass' : 'treble')
    return { hand, clef, measures: Array.from({ length: measureCount }, (_, m) => voices.map(v => v[m]!)) }
  })
  return { beats, beatType, measureBeats, fifths: keyFifths(drill.key), measureCount, staves }
}

/** Written note values in quarter-note beats, longest first, with their MusicXML <type> names. */
export const NOTE_TYPES: readonly { type: string, beats: number }[] = [
  { type: 'whole', beats: 4 }, { type: 'half', beats: 2 }, { type: 'quarter', beats: 1 },
  { type: 'eighth', beats: 0.5 }, { type: '16th', beats: 0.25 }, { type: '32nd', beats: 0.125 }, { type: '64th', beats: 0.0625 },
]

/** The written value of a duration: a note type and up to two dots, or null where none is exact (a tuplet). */
export function noteType(beats: number): { type: string, dots: number } | null {
  for (const t of NOTE_TYPES) {
    for (const dots of [0, 1, 2]) {
      const value = t.beats * (2 - 2 ** -dots)
      if (Math.abs(value - beats) < 1e-6) return { type: t.type, dots }
    }
  }
  return null
}
