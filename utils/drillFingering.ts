// The editor's link to the engine: each hand's notes as a line (notes on one beat as a chord),
// fingered by the suggestion and checked by the engine's fingering check; both hands' notes as one
// line for the engine's choice of hands.
import { checkFingering, drillNoteHands, midiFromName, suggestFingering, suggestHands, type DrillMusic, type Finger, type FingeringIssue, type Hand, type LineItem } from '#shared/engine'

interface Line { items: LineItem[], noteIndices: number[][] }
interface HandLine extends Line { hand: Hand }

/** The chosen notes as a line: one item per beat, low to high within a chord. */
function lineOf(drill: DrillMusic, chosen: (index: number) => boolean): Line {
  const byBeat = new Map<number, number[]>()
  drill.notes.forEach((n, i) => {
    if (chosen(i)) byBeat.set(n.beat, [...(byBeat.get(n.beat) ?? []), i])
  })
  const midi = (i: number): number => midiFromName(drill.notes[i]!.pitch)
  const noteIndices = [...byBeat.entries()].sort((a, b) => a[0] - b[0]).map(([, ix]) => ix.sort((a, b) => midi(a) - midi(b)))
  return { noteIndices, items: noteIndices.map(g => (g.length === 1 ? midi(g[0]!) : g.map(midi))) }
}

function handLines(drill: DrillMusic): HandLine[] {
  const hands = drillNoteHands(drill)
  return (['right', 'left'] as const).flatMap((hand) => {
    const line = lineOf(drill, i => hands[i] === hand)
    return line.items.length ? [{ hand, ...line }] : []
  })
}

/** Suggested fingers per note index; with `onlyOpen`, notes that already have a finger keep it. */
export function suggestedFingers(drill: DrillMusic, onlyOpen: boolean): (Finger | null)[] {
  const out = drill.notes.map(n => n.finger ?? null)
  for (const line of handLines(drill)) {
    const result = suggestFingering({ hand: line.hand, notes: line.items })
    line.noteIndices.forEach((group, k) => {
      const given = result.fingers[k]!
      group.forEach((i, j) => {
        if (!onlyOpen || out[i] === null) out[i] = Array.isArray(given) ? given[j] ?? null : given
      })
    })
  }
  return out
}

export interface EditorIssue extends FingeringIssue { hand: Hand, notes: number[] }

/** The engine's awkward spots, each pointed at the drill notes it ends on. */
export function fingeringIssues(drill: DrillMusic): EditorIssue[] {
  return handLines(drill).flatMap((line) => {
    const fingers = line.noteIndices.map(g => (g.length === 1 ? drill.notes[g[0]!]!.finger ?? null : (g.every(i => drill.notes[i]!.finger) ? g.map(i => drill.notes[i]!.finger!) : null)))
    return checkFingering({ hand: line.hand, notes: line.items, fingers }).map(issue => ({ ...issue, hand: line.hand, notes: line.noteIndices[issue.index] ?? [] }))
  })
}

/**
 * A hand for every note of a both-hands drill from the engine (`suggestHands`, notes on one beat taken
 * as a chord), with the fingers it gives: a note keeps its written finger where its hand stays and the
 * finger is written, else it takes the suggested one.
 */
export function suggestedHands(drill: DrillMusic): { hands: Hand[], fingers: (Finger | null)[] } {
  const { items, noteIndices: groups } = lineOf(drill, () => true)
  const result = suggestHands({ notes: items })
  const hands: Hand[] = drill.notes.map(() => 'right')
  const fingers: (Finger | null)[] = drill.notes.map(n => n.finger ?? null)
  groups.forEach((group, g) => {
    const hand = result.hands[g]!
    const finger = result.fingers[g]!
    group.forEach((i, j) => {
      hands[i] = Array.isArray(hand) ? hand[j]! : hand
      if (fingers[i] === null || drill.notes[i]!.hand !== hands[i]) fingers[i] = (Array.isArray(finger) ? finger[j] : finger) ?? null
    })
  })
  return { hands, fingers }
}
