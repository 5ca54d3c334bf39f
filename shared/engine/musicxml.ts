// MusicXML (score-partwise, uncompressed) into a drill, with fast-xml-parser.
//
// Elements read, as the MusicXML 4.0 specification defines them: part, measure,
// attributes (divisions, key/fifths/mode, time/beats/beat-type, staves), note (pitch/step/alter/
// octave, duration, chord, rest, grace, cue, staff, tie, notations/technical/fingering),
// backup and forward (moving the time cursor within a measure), sound@tempo and
// direction/metronome, and emphasis: notations/articulations/accent and strong-accent make an accent;
// the dynamics p and pp (and ppp…) make the notes that follow on their staff soft, f and ff (and
// fff…) make them accents, mp and mf ordinary again (a dynamics element inside a note's notations
// marks that note alone). Beats are quarter notes, as in <divisions> and <sound tempo>.
// Staff 1 is the right hand and staff 2 the left, as on a grand staff.
import { XMLParser, XMLValidator } from 'fast-xml-parser'
import { Note } from 'tonal'
import { ImportError, drillTempo, finishImport, roundBeat } from './importing'
import { midiFromName } from './pitch'
import type { DrillNote, Emphasis, Finger, Hand, ImportedDrill } from './types'

export interface MusicXmlImportOptions {
  /** The hand of a one-staff part (or of the one staff chosen); right when absent. */
  hand?: Hand
  /** Which part to read, numbered from 1 as a teacher counts them; the first when absent. */
  part?: number
  /** One staff of a grand staff (1 upper, 2 lower), or both; both when absent. */
  staff?: 1 | 2 | 'both'
  /** The measures to read, counted from 1 in the order they stand in the part, both ends included. */
  measures?: { from: number, to: number }
  /** Asked once per measure; true stops the import (a time limit on parsing). */
  isLate?: () => boolean
}

/** A part as the preview lists it, so the teacher can choose one. */
export interface MusicXmlPart {
  number: number
  id: string
  name: string
  staves: number
  measures: number
}

/** A parsed score, read once and then listed or imported. */
export interface MusicXmlDocument {
  root: XNode
}

/** fast-xml-parser's ordered form: one key naming the element, its children, and ':@' for attributes. */
type XNode = Record<string, unknown>

function tagOf(node: XNode): string {
  return Object.keys(node).find(k => k !== ':@') ?? ''
}
function childrenOf(node: XNode): XNode[] {
  const value = node[tagOf(node)]
  return Array.isArray(value) ? (value as XNode[]) : []
}
function attr(node: XNode, name: string): string | undefined {
  const attrs = node[':@'] as Record<string, string> | undefined
  return attrs?.[name]
}
function child(node: XNode, name: string): XNode | undefined {
  return childrenOf(node).find(c => tagOf(c) === name)
}
function all(node: XNode, name: string): XNode[] {
  return childrenOf(node).filter(c => tagOf(c) === name)
}
function textOf(node: XNode | undefined): string | undefined {
  if (!node) return undefined
  return childrenOf(node).map(c => c['#text']).filter(t => t !== undefined).join('').trim()
}
function numberIn(node: XNode | undefined, name: string): number | undefined {
  const text = node ? textOf(child(node, name)) : undefined
  if (text === undefined || text === '') return undefined
  const value = Number(text)
  return Number.isFinite(value) ? value : undefined
}

/** Quarter notes per minute for one metronome beat unit (MusicXML note-type values). */
const BEAT_UNIT_QUARTERS: Record<string, number> = { 'whole': 4, 'half': 2, 'quarter': 1, 'eighth': 0.5, '16th': 0.25 }

function metronomeBpm(metronome: XNode): number | undefined {
  const perMinute = numberIn(metronome, 'per-minute')
  const unit = BEAT_UNIT_QUARTERS[textOf(child(metronome, 'beat-unit')) ?? '']
  if (perMinute === undefined || unit === undefined) return undefined
  const dotted = child(metronome, 'beat-unit-dot') ? 1.5 : 1
  return perMinute * unit * dotted
}

const ACCIDENTALS: Record<number, string> = { [-2]: 'bb', [-1]: 'b', 0: '', 1: '#', 2: '##' }

/** The planned finger: the first <fingering> that is neither a substitution nor an alternative. */
function fingerOf(note: XNode): Finger | undefined {
  for (const notations of all(note, 'notations')) {
    for (const technical of all(notations, 'technical')) {
      for (const fingering of all(technical, 'fingering')) {
        if (attr(fingering, 'substitution') === 'yes' || attr(fingering, 'alternate') === 'yes') continue
        const digit = /[1-5]/.exec(textOf(fingering) ?? '')
        if (digit) return Number(digit[0])
      }
    }
  }
  return undefined
}

/** The emphasis a <dynamics> element gives: soft for p, pp…, accent for f, ff…, none for mp and mf; undefined when it names none of these. */
function dynamicsEmphasis(dynamics: XNode): Emphasis | null | undefined {
  for (const mark of childrenOf(dynamics).map(tagOf)) {
    if (/^p+$/.test(mark)) return 'soft'
    if (/^f+$/.test(mark)) return 'accent'
    if (mark === 'mp' || mark === 'mf') return null
  }
  return undefined
}

/** A note's own emphasis: an accent or strong accent among its articulations, or dynamics in its notations. */
function noteEmphasis(note: XNode): Emphasis | null | undefined {
  for (const notations of all(note, 'notations')) {
    for (const articulations of all(notations, 'articulations')) {
      if (child(articulations, 'accent') || child(articulations, 'strong-accent')) return 'accent'
    }
    for (const dynamics of all(notations, 'dynamics')) {
      const emphasis = dynamicsEmphasis(dynamics)
      if (emphasis !== undefined) return emphasis
    }
  }
  return undefined
}

function tieTypes(note: XNode): Set<string> {
  return new Set(all(note, 'tie').map(t => attr(t, 'type') ?? ''))
}

/**
 * Entity declarations are refused before parsing: an external entity could name a local file or an
 * address (XXE), and nested internal ones expand exponentially (billion laughs). MusicXML needs
 * neither; its DOCTYPE line only names the public DTD, which is never fetched.
 */
const ENTITY_DECLARATION = /<!ENTITY/i

function parseDocument(text: string): XNode {
  if (text.startsWith('PK')) throw new ImportError('This is a compressed MusicXML file (.mxl); export it as uncompressed MusicXML (.musicxml or .xml)')
  if (ENTITY_DECLARATION.test(text)) throw new ImportError('the file declares XML entities (<!ENTITY …>), which are not accepted in a MusicXML upload')
  const valid = XMLValidator.validate(text)
  if (valid !== true) throw new ImportError(`This is not well-formed XML (line ${valid.err.line}, column ${valid.err.col}: ${valid.err.msg})`)
  const parser = new XMLParser({ preserveOrder: true, ignoreAttributes: false, attributeNamePrefix: '', parseTagValue: false, processEntities: true })
  const nodes = parser.parse(text) as XNode[]
  const root = nodes.find(n => !tagOf(n).startsWith('?') && !tagOf(n).startsWith('!') && tagOf(n) !== '#text')
  const tag = root ? tagOf(root) : '(none)'
  if (tag === 'score-timewise') throw new ImportError('score-timewise is not supported: export the score as partwise MusicXML (score-partwise)')
  if (!root || tag !== 'score-partwise') throw new ImportError(`This is not a MusicXML partwise score (the root element is <${tag}>, not <score-partwise>)`)
  return root
}

function keyName(fifths: number, mode: string | undefined): string {
  const minor = mode === 'minor'
  return `${Note.transposeFifths(minor ? 'A' : 'C', fifths)} ${minor ? 'minor' : 'major'}`
}

export function parseMusicXml(text: string): MusicXmlDocument {
  return { root: parseDocument(text.replace(/^\uFEFF/, '').trimStart()) }
}

export function musicXmlParts(doc: MusicXmlDocument): MusicXmlPart[] {
  const names = new Map<string, string>()
  for (const scorePart of all(child(doc.root, 'part-list') ?? {}, 'score-part')) {
    names.set(attr(scorePart, 'id') ?? '', textOf(child(scorePart, 'part-name')) ?? '')
  }
  return all(doc.root, 'part').map((part, k) => {
    const id = attr(part, 'id') ?? ''
    const measures = all(part, 'measure')
    const staves = Math.max(1, ...measures.flatMap(m => all(m, 'attributes').map(a => numberIn(a, 'staves') ?? 1)))
    return { number: k + 1, id, name: names.get(id) || `Part ${k + 1}`, staves, measures: measures.length }
  })
}

export function importMusicXml(source: string | MusicXmlDocument, options: MusicXmlImportOptions = {}): ImportedDrill {
  const root = typeof source === 'string' ? parseMusicXml(source).root : source.root
  const parts = all(root, 'part')
  const partNumber = options.part ?? 1
  const part = parts[partNumber - 1]
  if (!part) throw new ImportError(parts.length === 0 ? 'The score has no <part>' : `Part ${partNumber} does not exist: the score has ${parts.length} part${parts.length === 1 ? '' : 's'} (1 to ${parts.length})`)
  const allMeasures = all(part, 'measure')
  const from = options.measures?.from ?? 1
  const to = Math.min(options.measures?.to ?? allMeasures.length, allMeasures.length)
  if (from < 1 || from > allMeasures.length || to < from) {
    throw new ImportError(`measures ${from} to ${options.measures?.to ?? to} are not in part ${partNumber}, which has ${allMeasures.length} measure${allMeasures.length === 1 ? '' : 's'}`)
  }
  const wantedStaff = options.staff ?? 'both'

  let divisions: number | undefined
  let staves = 1
  let key: string | null = null
  let meter: string | null = null
  let tempo: number | undefined
  const notes: (DrillNote & { staff: number })[] = []
  const openTies = new Map<string, DrillNote>()
  // The dynamic level in force on each staff, as an emphasis (null: ordinary).
  const levels = new Map<number, Emphasis | null>()
  let measureStart = 0
  let rangeStart = 0

  for (const [ordinal, measure] of allMeasures.entries()) {
    if (ordinal + 1 > to) break
    if (options.isLate?.()) throw new ImportError('reading the score took too long; upload a shorter extract')
    const inRange = ordinal + 1 >= from
    if (ordinal + 1 === from) rangeStart = measureStart
    const label = attr(measure, 'number') ?? '?'
    const fail = (why: string): never => {
      throw new ImportError(`Measure ${label}: ${why}`)
    }
    const beatsOf = (element: XNode): number => {
      const duration = numberIn(element, 'duration')
      if (duration === undefined || duration < 0) fail(`<${tagOf(element)}> has no valid <duration>`)
      if (divisions === undefined) fail('a duration comes before <divisions> says how long a quarter note is')
      return duration! / divisions!
    }
    let position = 0
    let furthest = 0
    let chordOnset = 0
    for (const element of childrenOf(measure)) {
      const tag = tagOf(element)
      if (tag === 'attributes') {
        const d = numberIn(element, 'divisions')
        if (d !== undefined) {
          if (d <= 0) fail('<divisions> must be positive')
          divisions = d
        }
        staves = numberIn(element, 'staves') ?? staves
        const keyElement = child(element, 'key')
        const fifths = keyElement ? numberIn(keyElement, 'fifths') : undefined
        if (key === null && fifths !== undefined) key = keyName(fifths, textOf(child(keyElement!, 'mode')))
        const time = child(element, 'time')
        const beats = time ? textOf(child(time, 'beats')) : undefined
        const beatType = time ? textOf(child(time, 'beat-type')) : undefined
        if (meter === null && beats && beatType) meter = `${beats}/${beatType}`
      }
      else if (tag === 'backup') {
        position = Math.max(0, position - beatsOf(element))
      }
      else if (tag === 'forward') {
        position += beatsOf(element)
        furthest = Math.max(furthest, position)
      }
      else if (tag === 'sound' || tag === 'direction') {
        for (const type of tag === 'direction' ? all(element, 'direction-type') : []) {
          for (const dynamics of all(type, 'dynamics')) {
            const emphasis = dynamicsEmphasis(dynamics)
            if (emphasis !== undefined) levels.set(numberIn(element, 'staff') ?? 1, emphasis)
          }
        }
        const sound = tag === 'sound' ? element : child(element, 'sound')
        const metronome = tag === 'direction' ? all(element, 'direction-type').map(d => child(d, 'metronome')).find(Boolean) : undefined
        const bpm = Number(sound ? attr(sound, 'tempo') : undefined) || (metronome ? metronomeBpm(metronome) : undefined)
        if (tempo === undefined && bpm) tempo = bpm
      }
      else if (tag === 'note') {
        // Grace notes take no time in the bar, so they cannot be graded against a beat.
        if (child(element, 'grace')) continue
        const isChord = child(element, 'chord') !== undefined
        const length = beatsOf(element)
        const onset = isChord ? chordOnset : position
        if (!isChord) {
          chordOnset = position
          position += length
          furthest = Math.max(furthest, position)
        }
        const pitch = child(element, 'pitch')
        if (!pitch || child(element, 'cue') || !inRange) continue
        const step = textOf(child(pitch, 'step'))?.toUpperCase() ?? ''
        const alter = Math.round(numberIn(pitch, 'alter') ?? 0)
        const octave = numberIn(pitch, 'octave')
        const accidental = ACCIDENTALS[alter]
        if (!/^[A-G]$/.test(step) || octave === undefined || accidental === undefined) fail(`a note has an unreadable pitch (step "${step}", alter ${alter}, octave ${octave})`)
        const name = `${step}${accidental}${octave}`
        let midi = 0
        try {
          midi = midiFromName(name)
        }
        catch (error) {
          fail(error instanceof Error ? error.message : String(error))
        }
        const staff = numberIn(element, 'staff') ?? 1
        if (wantedStaff !== 'both' && staff !== wantedStaff) continue
        const tieKey = `${staff}:${midi}`
        const ties = tieTypes(element)
        const open = openTies.get(tieKey)
        if (ties.has('stop') && open) {
          open.length = roundBeat(open.length + length)
          if (!ties.has('start')) openTies.delete(tieKey)
          continue
        }
        const finger = fingerOf(element)
        const own = noteEmphasis(element)
        const emphasis = own === undefined ? levels.get(staff) : own
        const note = { pitch: name, beat: roundBeat(measureStart - rangeStart + onset), length: roundBeat(length), staff, ...(finger ? { finger } : {}), ...(emphasis ? { emphasis } : {}) }
        notes.push(note)
        if (ties.has('start')) openTies.set(tieKey, note)
      }
    }
    measureStart += furthest
  }

  if (notes.length === 0) {
    const range = options.measures ? ` in measures ${from} to ${to}` : ''
    throw new ImportError(`there are no notes in part ${partNumber}${wantedStaff === 'both' ? '' : `, staff ${wantedStaff}`}${range}`)
  }
  const used = new Set(notes.map(n => n.staff))
  const twoStaves = used.size >= 2
  // One staff of a grand staff in use: that staff's hand unless the teacher chose one; a one-staff part: the hand asked for.
  const onlyStaff = used.values().next().value ?? 1
  const singleHand: Hand = options.hand ?? (staves >= 2 ? (onlyStaff === 1 ? 'right' : 'left') : 'right')
  const workTitle = textOf(child(child(root, 'work') ?? {}, 'work-title'))
  return finishImport({
    hand: twoStaves ? 'both' : singleHand,
    tempoBpm: drillTempo(tempo),
    notes: notes.map(({ staff, ...n }) => (twoStaves ? { ...n, hand: staff === 1 ? 'right' : 'left' } : n)),
    key,
    meter,
    title: workTitle || textOf(child(root, 'movement-title')) || null,
    kind: 'MusicXML file',
  })
}
