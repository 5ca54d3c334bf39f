// Evenhand's text notation for typing a drill: one token per note, finger after a slash.
//
//   C4/1 D4/2 E4/3        notes: pitch (C4 = middle C, # and b, ## and bb), then / and the planned finger
//   C4/1:1/2  G4:1.5      a length in beats after ':' (whole, decimal or fraction); it carries on
//                         to the following notes until another is written; the first is 1 beat
//   C4/3>  C4/1p          emphasis, last in the note: '>' an accent (the printed accent sign), 'p' a
//                         soft note (piano); in a chord each note carries its own
//   r  r:2                a rest of the current length, or of the given one
//   C4/1+E4/3+G4/5:2      a chord: notes joined by '+', struck together; a length on the last
//                         note is the chord's, another note may carry its own (C4:4+E4:1 holds
//                         C4 under E4), and the next note comes after the shortest of them
//   |                     a bar line; with a bar length given, each bar is checked (the first bar
//                         line may come early, for an upbeat)
//   @6                    jump to beat 6 of the current hand (for a note that starts under a held one)
//   RH  LH                the hand of the notes that follow; each hand counts its own beats from 0,
//                         so a both-hands drill is usually one RH line and one LH line
//   ; a comment           ignored to the end of the line
//
// Why this shape: a teacher types it on a phone as easily as on a desk, every note carries its
// finger where printed fingering puts it (next to the note), and sticky lengths keep a scale in
// even quavers as short as the note names themselves.
import { z } from 'zod'
import type { DrillHand, DrillNote, Emphasis, Finger, Hand } from '../types/drill'
import { midiFromName, normalizeName, PitchError } from './pitch'

/** The summary the drill editor shows beside the text box. */
export const NOTATION_HELP = `Type the notes one after another, separated by spaces.
• C4/1 — a note and its finger (C4 is middle C; write sharps with #, flats with b, e.g. F#4/2, Bb3/4). The finger may be left out.
• C4/1:1/2 — a length in beats after a colon (1, 2, 1.5, 1/2, 1/3 …). It stays until you write another; the first note lasts 1 beat.
• C4/3> or C4/1p — an accented note (>) or a soft one (p), written last, after the finger and length.
• r or r:2 — a rest.
• C4/1+E4/3+G4/5:2 — a chord: notes joined by +; a length at the end is the whole chord's.
• | — a bar line. It is checked against the drill's metre.
• RH or LH — the hand for the notes that follow. Both-hands drills: one line starting with RH, one with LH.
• @6 — start the next note on beat 6 (for a note that begins while another is held).
• ; — everything after it on the line is a comment.`

export class NotationError extends Error {
  override name = 'NotationError'
  constructor(message: string, readonly line: number, readonly column: number) {
    super(`Line ${line}, column ${column}: ${message}`)
  }
}

export interface NotationOptions {
  /** The drill's hand: 'both' requires RH/LH markers, one hand forbids the other's marker. */
  hand: DrillHand
  /** Beats per bar, to check bar lines (4 for 4/4, 3 for 6/8 counted in quavers…). */
  beatsPerBar?: number
}
const NotationOptionsSchema = z.object({
  hand: z.enum(['right', 'left', 'both']),
  beatsPerBar: z.number().positive().max(64).optional(),
})

const MAX_BEAT = 100_000
const MAX_LENGTH = 64
/**
 * Beats are snapped to multiples of 1/GRID after each step, so sums of thirds, fifths or
 * sixty-fourths land exactly on the beat they mean (GRID = 4 × lcm(1…16) holds them all).
 */
const GRID = 2_882_880
const snap = (beat: number): number => Math.round(beat * GRID) / GRID

const NUMBER = /^(\d+(?:\.\d+)?|\d+\/\d+)$/
const MEMBER = /^([A-Ga-g](?:##|#|bb|b)?-?\d+)(?:\/(\d+))?(?::(.*))?$/

interface Token { text: string, line: number, column: number }

function tokenize(text: string): Token[] {
  const tokens: Token[] = []
  text.split(/\r?\n/).forEach((content, l) => {
    const code = content.split(';', 1)[0]!
    for (const m of code.matchAll(/\||[^\s|]+/g)) tokens.push({ text: m[0], line: l + 1, column: m.index + 1 })
  })
  return tokens
}

function parseNumber(text: string, at: Token, offset: number, what: string): number {
  const fail = (why: string): never => {
    throw new NotationError(`${what} "${text}" ${why}`, at.line, at.column + offset)
  }
  if (!NUMBER.test(text)) fail('is not a number: write 1, 1.5 or 1/2')
  const [num, den] = text.split('/').map(Number) as [number, number | undefined]
  if (den === 0) fail('divides by zero')
  return den === undefined ? num : num / den
}

function parseLength(text: string, at: Token, offset: number): number {
  const length = parseNumber(text, at, offset, 'Length')
  if (length <= 0 || length > MAX_LENGTH) throw new NotationError(`Length "${text}" must be more than 0 and at most ${MAX_LENGTH} beats`, at.line, at.column + offset)
  return length
}

interface Member { pitch: string, finger?: Finger, length?: number, emphasis?: Emphasis }

/** The emphasis marks, written last in a note: the printed accent sign and the piano sign. */
const EMPHASIS_MARKS: Readonly<Record<string, Emphasis>> = { '>': 'accent', 'p': 'soft' }
const MARK_OF: Readonly<Record<Emphasis, string>> = { accent: '>', soft: 'p' }

function parseChord(token: Token): Member[] {
  const members: Member[] = []
  let offset = 0
  for (const written of token.text.split('+')) {
    const emphasis = EMPHASIS_MARKS[written.slice(-1)]
    const text = emphasis ? written.slice(0, -1) : written
    const m = MEMBER.exec(text)
    if (!m) {
      throw new NotationError(`"${text}" is not a note: write a pitch such as C4 or F#3, then /finger, :length and > (accent) or p (soft) if wanted`, token.line, token.column + offset)
    }
    try {
      midiFromName(m[1]!)
    }
    catch (error) {
      if (error instanceof PitchError) throw new NotationError(error.message, token.line, token.column + offset)
      throw error
    }
    const member: Member = { pitch: normalizeName(m[1]!) }
    if (m[2] !== undefined) {
      const finger = Number(m[2])
      if (finger < 1 || finger > 5) {
        throw new NotationError(`Finger ${m[2]} does not exist: fingers are 1 (thumb) to 5`, token.line, token.column + offset + m[1]!.length + 1)
      }
      member.finger = finger
    }
    if (m[3] !== undefined) member.length = parseLength(m[3], token, offset + text.indexOf(':') + 1)
    if (emphasis) member.emphasis = emphasis
    members.push(member)
    offset += written.length + 1
  }
  return members
}

interface Voice { beat: number, length: number, barStart: number | null }

export function parseNotation(text: string, options: NotationOptions): DrillNote[] {
  const { hand: drillHand, beatsPerBar } = NotationOptionsSchema.parse(options)
  const voices: Record<Hand, Voice> = {
    right: { beat: 0, length: 1, barStart: null },
    left: { beat: 0, length: 1, barStart: null },
  }
  let hand: Hand | null = drillHand === 'both' ? null : drillHand
  const notes: DrillNote[] = []

  const voiceAt = (token: Token): Voice => {
    if (hand === null) throw new NotationError('Say which hand plays first: start with RH or LH', token.line, token.column)
    return voices[hand]
  }
  const advance = (voice: Voice, by: number, token: Token): void => {
    voice.beat = snap(voice.beat + by)
    if (voice.beat > MAX_BEAT) throw new NotationError(`The drill runs past beat ${MAX_BEAT}`, token.line, token.column)
  }

  for (const token of tokenize(text)) {
    const t = token.text
    const upper = t.toUpperCase()
    if (upper === 'RH' || upper === 'LH') {
      const next: Hand = upper === 'RH' ? 'right' : 'left'
      if (drillHand !== 'both' && next !== drillHand) {
        throw new NotationError(`This drill is for the ${drillHand} hand, so ${t} cannot be used`, token.line, token.column)
      }
      hand = next
    }
    else if (t === '|') {
      const voice = voiceAt(token)
      if (beatsPerBar !== undefined) {
        if (voice.barStart === null) voice.barStart = voice.beat
        const inBar = snap(voice.beat - voice.barStart) % beatsPerBar
        if (snap(inBar) !== 0 && snap(inBar - beatsPerBar) !== 0) {
          throw new NotationError(`This bar line falls ${snap(inBar)} beats into a ${beatsPerBar}-beat bar`, token.line, token.column)
        }
      }
    }
    else if (t.startsWith('@')) {
      const voice = voiceAt(token)
      const beat = parseNumber(t.slice(1), token, 1, 'Beat')
      if (beat > MAX_BEAT) throw new NotationError(`Beat ${beat} is past beat ${MAX_BEAT}`, token.line, token.column)
      voice.beat = snap(beat)
    }
    else if (/^r(?::|$)/i.test(t)) {
      const voice = voiceAt(token)
      if (t.length > 1) voice.length = parseLength(t.slice(2), token, 2)
      advance(voice, voice.length, token)
    }
    else {
      const voice = voiceAt(token)
      const members = parseChord(token)
      // A length on the chord's last note is the chord's length; it also carries on to what follows.
      const chordLength = members[members.length - 1]!.length ?? voice.length
      voice.length = chordLength
      for (const m of members) {
        notes.push({
          pitch: m.pitch,
          beat: voice.beat,
          length: m.length ?? chordLength,
          ...(drillHand === 'both' ? { hand: hand! } : {}),
          ...(m.finger === undefined ? {} : { finger: m.finger }),
          ...(m.emphasis ? { emphasis: m.emphasis } : {}),
        })
      }
      advance(voice, Math.min(...members.map(m => m.length ?? chordLength)), token)
    }
  }
  return notes
}

/** A beat count as the notation writes it: a fraction with a small denominator where one fits. */
function formatNumber(x: number): string {
  for (let d = 1; d <= 64; d++) {
    const n = Math.round(x * d)
    if (Math.abs(n / d - x) < 1e-9) return d === 1 ? String(n) : `${n}/${d}`
  }
  return String(Number(x.toFixed(6)))
}

export interface FormatOptions {
  beatsPerBar?: number
  /** Bars on one line before a line break. */
  barsPerLine?: number
}

function formatVoice(notes: DrillNote[], options: FormatOptions): string {
  const sorted = [...notes].sort((a, b) => a.beat - b.beat || midiFromName(a.pitch) - midiFromName(b.pitch))
  const chords: DrillNote[][] = []
  for (const note of sorted) {
    const last = chords[chords.length - 1]
    if (last && snap(last[0]!.beat) === snap(note.beat)) last.push(note)
    else chords.push([note])
  }
  const out: string[] = []
  let beat = 0
  let length = 1
  let bars = 0
  const withLength = (x: number): string => {
    if (x === length) return ''
    length = x
    return `:${formatNumber(x)}`
  }
  chords.forEach((chord, k) => {
    const start = snap(chord[0]!.beat)
    if (start > beat) out.push(`r${withLength(snap(start - beat))}`)
    else if (start < beat) out.push(`@${formatNumber(start)}`)
    const chordLength = chord[chord.length - 1]!.length
    const written = chord.map((n, i) => {
      const own = i === chord.length - 1 ? withLength(n.length) : n.length === chordLength ? '' : `:${formatNumber(n.length)}`
      return `${normalizeName(n.pitch)}${n.finger ? `/${n.finger}` : ''}${own}${n.emphasis ? MARK_OF[n.emphasis] : ''}`
    })
    out.push(written.join('+'))
    beat = snap(start + Math.min(...chord.map(n => n.length)))
    const { beatsPerBar, barsPerLine = 4 } = options
    if (beatsPerBar && k < chords.length - 1 && beat > 0 && snap(beat % beatsPerBar) === 0) {
      bars++
      out.push(bars % barsPerLine === 0 ? '|\n' : '|')
    }
  })
  return out.join(' ').replace(/\n /g, '\n')
}

/** Writes notes back as notation; parseNotation of the result gives the same notes (in beat order). */
export function formatNotation(notes: DrillNote[], options: FormatOptions = {}): string {
  const unmarked = notes.filter(n => n.hand === undefined)
  const parts: string[] = []
  if (unmarked.length) parts.push(formatVoice(unmarked, options))
  for (const [hand, marker] of [['right', 'RH'], ['left', 'LH']] as const) {
    const own = notes.filter(n => n.hand === hand)
    if (own.length) parts.push(`${marker} ${formatVoice(own, options)}`)
  }
  return parts.join('\n')
}
