// Checking a written fingering: every awkward spot named in plain words, for the drill editor and the
// command line (`npm run -s engine -- check`). The checks read the same spans and rules as the search,
// so what the check calls awkward is what the suggestion avoids.
import { cheapestPath, type Lattice } from './chain'
import { costModel } from './costs'
import { arpeggioPassReach } from './ergonomics'
import { isBlackKey } from './keys'
import { lineLattice, withOptionPenalty, type LineLattice } from './lattice'
import { nameFromMidi } from './pitch'
import { touchPositionStarts } from './positions'
import { scalePhases } from './scale'
import { emphasisPoints } from './suggest'
import { MAX_COMF, MAX_PRAC, MIN_COMF, MIN_PRAC, pairSpan, spanTable, type SpanRow } from './spans'
import { itemKeys, itemPitchesLowToHigh, lineTouches, type Touch } from './touches'
import type { Emphasis, Finger, Hand, HandSize, LineItem } from './types'

export type CheckRule =
  | 'thumbOnBlack' | 'fourFiveAlternation' | 'sameFinger' | 'crossingWithoutThumb'
  | 'stretch' | 'beyondReach' | 'avoidablePositionChange' | 'softThumb' | 'weakAccent'

export interface FingeringIssue {
  /** 0-based index of the note (or chord) where the awkward spot ends. */
  index: number
  rule: CheckRule
  message: string
}

export interface CheckInput {
  hand: Hand
  notes: LineItem[]
  /** One finger per note, an array (low to high) per chord; null where the teacher left it open. */
  fingers: (Finger | Finger[] | null)[]
  handSize?: HandSize
  /** Whether the line is meant legato (the default): only then is one finger on two keys in a row a fault. */
  legato?: boolean
  /** Each item's emphasis (null or absent for an ordinary note). */
  emphasis?: (Emphasis | null | undefined)[]
}

/** Notes on either side of a position change that the check may re-finger to avoid it. */
const WINDOW = 3

const HAND_SIZE_WORDS: Readonly<Record<HandSize, string>> = { small: 'a small hand', medium: 'a medium hand', large: 'a large hand' }

const FINGER_WORDS: Readonly<Record<Finger, string>> = { 1: 'the thumb', 2: 'finger 2', 3: 'finger 3', 4: 'finger 4', 5: 'finger 5' }

function noteWord(notes: LineItem[], i: number): string {
  const item = notes[i]!
  const names = itemPitchesLowToHigh(item).map(m => nameFromMidi(m))
  return `${Array.isArray(item) ? 'chord' : 'note'} ${i + 1} (${names.join('+')})`
}

const capital = (text: string): string => text.charAt(0).toUpperCase() + text.slice(1)

const semitones = (n: number): string => `${n} semitone${n === 1 ? '' : 's'}`

/** The one touch of a single note, or null for a chord or an open finger. */
function single(line: Touch[][], notes: LineItem[], i: number): Touch | null {
  return !Array.isArray(notes[i]) && line[i]?.length === 1 ? line[i]![0]! : null
}

/**
 * Every awkward spot of a fingering, in the order of the notes. Rules and their sources:
 * - thumb on a black key in a scale run (common practice: the printed scale fingerings keep it on
 *   white keys), and elsewhere a thumb on a black key between two white ones (Parncutt et al. 1997 rule 10);
 * - 4 and 5 alternating (common practice: the weakest pair);
 * - the same finger on two different keys in a row in a legato line (common practice: it cannot join them);
 * - a crossing of two fingers without the thumb (common practice: only the thumb passes under);
 * - a span beyond the comfortable or the practical span of the hand size (Parncutt et al. 1997
 *   Table 1, scaled per hand size in spans.ts), except an arpeggio's thumb passing (ergonomics.ts);
 * - the thumb on a soft note between two others, and 4 or 5 on an accent (common practice, see emphasisPoints in suggest.ts);
 * - a position change that another fingering of the few notes around it avoids (the search of suggest.ts
 *   over those notes, the rest of the fingering kept).
 */
export function checkFingering(input: CheckInput): FingeringIssue[] {
  const { hand, notes, fingers, handSize = 'medium', legato = true } = input
  const table = spanTable(handSize)
  const given = notes.map((_, i) => fingers[i] ?? null)
  const line = lineTouches(hand, notes, given.map(f => f ?? []))
  const issues: FingeringIssue[] = []
  const report = (index: number, rule: CheckRule, message: string): void => {
    issues.push({ index, rule, message })
  }
  const singles = notes.every(n => !Array.isArray(n)) ? (notes as number[]) : null
  const inScale = singles !== null && singles.length > 1 && scalePhases(singles.map(m => itemKeys(hand, m)[0]!)) !== null
  let alternationEnd = -1
  for (let i = 0; i < notes.length; i++) {
    const b = single(line, notes, i)
    const a = i > 0 ? single(line, notes, i - 1) : null
    const c = i + 1 < notes.length ? single(line, notes, i + 1) : null
    if (b?.f === 1 && isBlackKey(b.k)) {
      const whiteAround = a !== null && c !== null && !isBlackKey(a.k) && !isBlackKey(c.k)
      if (inScale) report(i, 'thumbOnBlack', `${capital(noteWord(notes, i))}: the thumb on a black key in a scale; scale fingerings keep the thumb on white keys.`)
      else if (whiteAround) report(i, 'thumbOnBlack', `${capital(noteWord(notes, i))}: the thumb on a black key between two white ones pulls the hand in and out.`)
    }
    if (b && emphasisPoints(input.emphasis?.[i], b.f, a !== null && c !== null) > 0) {
      report(i, input.emphasis?.[i] === 'soft' ? 'softThumb' : 'weakAccent', input.emphasis?.[i] === 'soft'
        ? `${capital(noteWord(notes, i))}: a soft note on the thumb, the heaviest finger; another finger keeps it quiet more easily.`
        : `${capital(noteWord(notes, i))}: an accent on ${FINGER_WORDS[b.f]}, a weak finger; 1, 2 or 3 gives it more surely.`)
    }
    if (a && b) pairIssues(table, notes, i, a, b, legato, handSize, report)
    if (alternatesFourFive(line, notes, i)) {
      // One message per alternation, at its first four notes.
      if (alternationEnd !== i - 1) report(i, 'fourFiveAlternation', `Notes ${i - 2}–${i + 1}: 4 and 5 alternate; they are the weakest pair and tire quickly, so alternate 3 and 4 or 2 and 3.`)
      alternationEnd = i
    }
    const chord = line[i]!
    if (Array.isArray(notes[i]) && chord.length > 1) chordIssues(table, notes, i, chord, handSize, report)
  }
  // A scale run fingered one finger per pitch class is a pattern chosen for the whole run (scale.ts),
  // which a look at a few notes cannot better; elsewhere, a nearby fingering may save a change.
  const patterned = inScale && onePerClass(singles!, given)
  return [...issues, ...(patterned ? [] : avoidableChanges(hand, notes, given, line, handSize))].sort((x, y) => x.index - y.index)
}

/**
 * Whether notes i − 3 … i alternate 4 and 5 (4 5 4 5 or 5 4 5 4). Three notes are not yet an
 * alternation: 4 5 4 is the ordinary turn at the top of a five-finger pattern.
 */
function alternatesFourFive(line: Touch[][], notes: LineItem[], i: number): boolean {
  if (i < 3) return false
  const four = [i - 3, i - 2, i - 1, i].map(j => single(line, notes, j))
  if (four.some(t => t === null)) return false
  const [a, b, c, d] = four as Touch[]
  return a!.f === c!.f && b!.f === d!.f && a!.f + b!.f === 9 && Math.min(a!.f, b!.f) === 4
}

/** Whether every pitch class of the line has one finger throughout, the ends and turns aside. */
function onePerClass(keys: number[], fingers: (Finger | Finger[] | null)[]): boolean {
  const byClass = new Map<number, Finger | Finger[] | null>()
  return keys.every((k, i) => {
    const turn = i === 0 || i === keys.length - 1 || (keys[i - 1]! - k) * (keys[i + 1]! - k) > 0
    if (turn) return true
    const seen = byClass.get(k % 12)
    byClass.set(k % 12, fingers[i]!)
    return seen === undefined || seen === fingers[i]
  })
}

function pairIssues(table: SpanRow[][], notes: LineItem[], i: number, a: Touch, b: Touch, legato: boolean, handSize: HandSize, report: (index: number, rule: CheckRule, message: string) => void): void {
  const where = `${capital(noteWord(notes, i - 1))} to ${noteWord(notes, i)}`
  if (a.k === b.k) return
  if (a.f === b.f) {
    if (legato) report(i, 'sameFinger', `${where}: ${FINGER_WORDS[a.f]} plays two keys in a row, so they cannot be joined legato.`)
    return
  }
  const thumb = a.f === 1 || b.f === 1
  if (!thumb && (b.f - a.f) * (b.k - a.k) < 0) {
    report(i, 'crossingWithoutThumb', `${where}: ${FINGER_WORDS[b.f]} crosses ${FINGER_WORDS[a.f]} without the thumb; only the thumb passes under the hand.`)
    return
  }
  const { row, s } = pairSpan(table, a.f, a.k, b.f, b.k)
  if (thumb && s < 0 && -s <= arpeggioPassReach(a.f === 1 ? b.f : a.f)) return
  spanIssue(row, s, i, where, Math.min(a.f, b.f) as Finger, Math.max(a.f, b.f) as Finger, handSize, report)
}

/**
 * Names a span of fingers lo < hi outside the comfortable or practical range of their pair. Keys lie a
 * whole number of semitones apart, so the figure a message gives for a limit is the widest (or, for
 * fingers too close, the narrowest) whole number of semitones still within it: a span is outside the
 * limit exactly when it passes that figure, and a message never sets a span against a limit it does
 * not pass. A negative span is a crossing, the thumb on the far side of finger hi, which the table's
 * Min columns allow only for the thumb's pairs and only as far as they say (for 1–5 no crossing is
 * comfortable at all).
 */
function spanIssue(row: SpanRow, s: number, i: number, where: string, lo: Finger, hi: Finger, handSize: HandSize, report: (index: number, rule: CheckRule, message: string) => void): void {
  const hand = HAND_SIZE_WORDS[handSize]
  const pair = `${where}: ${FINGER_WORDS[lo]} and ${FINGER_WORDS[hi]}`
  if (s < 0) {
    const crossed = `${pair} cross, the thumb ${semitones(-s)} beyond ${FINGER_WORDS[hi]}`
    // The widest whole crossing within each limit; 0 where the limit allows none.
    const practical = Math.max(0, Math.floor(-row[MIN_PRAC]))
    const comfortable = Math.max(0, Math.floor(-row[MIN_COMF]))
    if (-s > practical) {
      report(i, 'beyondReach', practical === 0
        ? `${crossed}: ${hand} cannot cross these two at all; the hand must leave the keys.`
        : `${crossed}: more than the ${practical} ${hand} can cross them at all; the hand must leave the keys.`)
    }
    else if (-s > comfortable) {
      report(i, 'stretch', comfortable === 0
        ? `${crossed}: ${hand} reaches that, but no crossing of these two is comfortable.`
        : `${crossed}: more than the ${comfortable} ${hand} crosses them comfortably.`)
    }
  }
  else if (s > row[MAX_PRAC]) {
    report(i, 'beyondReach', `${pair} ask for a span of ${semitones(s)}, more than the ${Math.floor(row[MAX_PRAC])} ${hand} can span at all; the hand must leave the keys.`)
  }
  else if (s < row[MIN_PRAC]) {
    report(i, 'beyondReach', `${pair} ask for keys ${semitones(s)} apart, closer than they can play: they need at least ${semitones(Math.ceil(row[MIN_PRAC]))} between them.`)
  }
  else if (s > row[MAX_COMF]) {
    report(i, 'stretch', `${pair} ask for a span of ${semitones(s)}, more than the ${Math.floor(row[MAX_COMF])} ${hand} spans comfortably.`)
  }
}

function chordIssues(table: SpanRow[][], notes: LineItem[], i: number, chord: Touch[], handSize: HandSize, report: (index: number, rule: CheckRule, message: string) => void): void {
  for (let j = 1; j < chord.length; j++) {
    const a = chord[j - 1]!
    const b = chord[j]!
    if (a.f >= b.f) {
      report(i, 'crossingWithoutThumb', `${capital(noteWord(notes, i))}: the fingers of a chord must rise with its keys (${FINGER_WORDS[a.f]} lies above ${FINGER_WORDS[b.f]}).`)
      return
    }
    const { row, s } = pairSpan(table, a.f, a.k, b.f, b.k)
    spanIssue(row, s, i, capital(noteWord(notes, i)), a.f, b.f, handSize, report)
  }
}

/** The given fingering as lattice options; a note without a finger, or one the lattice cannot take, is free. */
function givenOptions(lattice: LineLattice, given: (Finger | Finger[] | null)[]): (number | null)[] {
  return lattice.options.map((options, i) => {
    const g = given[i]
    if (g === null || g === undefined) return null
    const wanted = Array.isArray(g) ? [...g].sort((x, y) => x - y) : [g]
    const found = options.findIndex(o => o.length === wanted.length && o.every((f, j) => f === wanted[j]))
    return found < 0 ? null : found
  })
}

/** Stands in for "not allowed" in a lattice, where costs must stay finite. */
const HOLD = 1e6

/** The lattice with every item outside [from, to] held to its given option. */
function heldOutside(lattice: Lattice, held: (number | null)[], from: number, to: number): Lattice {
  return withOptionPenalty(lattice, (i, option) => {
    const keep = held[i]
    return (i >= from && i <= to) || keep === null || keep === undefined || option === keep ? 0 : HOLD
  })
}

/**
 * Position changes that a nearby fingering avoids: for each change, the cheapest fingering of the
 * WINDOW notes on either side with the rest kept as written; where it needs fewer changes over the
 * whole line and costs no more under the model, the change is avoidable and the message says how.
 */
function avoidableChanges(hand: Hand, notes: LineItem[], given: (Finger | Finger[] | null)[], line: Touch[][], handSize: HandSize): FingeringIssue[] {
  if (notes.length < 2 || given.some(g => g === null)) return []
  const table = spanTable(handSize)
  const starts = touchPositionStarts(line, table)
  if (starts.length === 0) return []
  const model = costModel(handSize)
  const lattice = lineLattice(notes.map(n => itemKeys(hand, n)), model)
  const held = givenOptions(lattice, given)
  if (held.some(h => h === null)) return []
  const givenCost = cheapestPath(heldOutside(lattice, held, -1, -1)).cost
  const issues: FingeringIssue[] = []
  for (const start of starts) {
    const from = Math.max(0, start - WINDOW)
    const to = Math.min(notes.length - 1, start + WINDOW)
    const { path, cost } = cheapestPath(heldOutside(lattice, held, from, to))
    if (cost > givenCost + 1e-9) continue
    const touches = path.map((o, i) => lattice.keys[i]!.map((k, j) => ({ f: lattice.options[i]![o]![j]!, k })))
    if (touchPositionStarts(touches, table).length >= starts.length) continue
    const changed = path.map((o, i) => (o === held[i] ? -1 : i)).filter(i => i >= 0)
    if (changed.length === 0) continue
    const first = changed[0]!
    const last = changed[changed.length - 1]!
    const written = changed.map(i => lattice.options[i]![path[i]!]!.join('+')).join(' ')
    issues.push({
      index: start,
      rule: 'avoidablePositionChange',
      message: `${capital(noteWord(notes, start))}: the hand changes position here, but ${written} on ${first === last ? `note ${first + 1}` : `notes ${first + 1}–${last + 1}`} keeps it in place.`,
    })
  }
  return issues
}
