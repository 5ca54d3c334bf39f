// The editor's link to the engine: each hand's notes as a line (notes on one beat as a chord),
// fingered by the suggestion and checked by the engine's fingering check.
import { checkFingering, drillNoteHands, midiFromName, suggestFingering, type DrillMusic, type Finger, type FingeringIssue, type Hand, type LineItem } from '#shared/engine'

interface HandLine { hand: Hand, items: LineItem[], noteIndices: number[][] }

function handLines(drill: DrillMusic): HandLine[] {
  const hands = drillNoteHands(drill)
  return (['right', 'left'] as const).flatMap((hand) => {
    const byBeat = new Map<number, number[]>()
    drill.notes.forEach((n, i) => {
      if (hands[i] === hand) byBeat.set(n.beat, [...(byBeat.get(n.beat) ?? []), i])
    })
    const groups = [...byBeat.entries()].sort((a, b) => a[0] - b[0]).map(([, ix]) => ix.sort((a, b) => midiFromName(drill.notes[a]!.pitch) - midiFromName(drill.notes[b]!.pitch)))
    if (groups.length === 0) return []
    return [{ hand, noteIndices: groups, items: groups.map(g => (g.length === 1 ? midiFromName(drill.notes[g[0]!]!.pitch) : g.map(i => midiFromName(drill.notes[i]!.pitch)))) }]
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
