// How often the inference recovers what the simulated player did: the set of position changes and
// the fingers, over every figure in both hands, at several tempos and in both articulations.
import type { Finger, Hand } from '../../../../shared/engine/types'
import type { PerformedNote } from '../../../../shared/engine/infer'
import { FIGURES } from './figures'
import { perform, type Articulation, type Category, type Performance } from './player'

export type Infer = (hand: Hand, notes: PerformedNote[]) => { fingers: { finger: Finger, confidence: number }[], positions: number[] }

export const TEMPOS = [60, 100, 160] as const
export const ARTICULATIONS: readonly Articulation[] = ['legato', 'detache']
export const HANDS: readonly Hand[] = ['right', 'left']

export interface Tally {
  performances: number
  /** Performances whose inferred set of position changes is exactly the player's. */
  positionsExact: number
  /** Fingers the timing tells (see Figure.fingersTold), and how many the inference got right. */
  fingers: number
  fingersRight: number
  /** Fingers the timing leaves open, and how many still came out as the player's. */
  fingersOpen: number
  fingersOpenRight: number
  /** Performances with no move out of position whose inference still found a position change. */
  clean: number
  cleanInvented: number
}

const empty = (): Tally => ({ performances: 0, positionsExact: 0, fingers: 0, fingersRight: 0, fingersOpen: 0, fingersOpenRight: 0, clean: 0, cleanInvented: 0 })

function add(into: Tally, performance: Performance, inferred: ReturnType<Infer>): void {
  into.performances++
  const found = inferred.positions
  if (found.length === performance.positions.length && found.every((p, i) => p === performance.positions[i])) into.positionsExact++
  const told = performance.figure.fingersTold !== false
  performance.fingers.forEach((finger, i) => {
    const right = inferred.fingers[i]?.finger === finger ? 1 : 0
    if (told) {
      into.fingers++
      into.fingersRight += right
    }
    else {
      into.fingersOpen++
      into.fingersOpenRight += right
    }
  })
  if (performance.positions.length === 0) {
    into.clean++
    if (found.length > 0) into.cleanInvented++
  }
}

export interface Recovery {
  /** Per category and tempo, over the performances where the timing decides. */
  decisive: Map<`${Category} ${number}`, Tally>
  /** Every performance where the timing decides, together. */
  all: Tally
  /** Performances where it does not (a détaché player moving one finger a step), together. */
  undecided: Tally
  /** Every performance, with the inferred fingers and their confidence, for checks of honesty. */
  performances: { performance: Performance, inferred: ReturnType<Infer> }[]
}

/** Every figure in both hands, at every tempo and articulation, `seeds` times each. */
export function measureRecovery(infer: Infer, seeds = 3): Recovery {
  const recovery: Recovery = { decisive: new Map(), all: empty(), undecided: empty(), performances: [] }
  let seed = 1
  for (const figure of FIGURES) {
    for (const hand of HANDS) {
      for (const bpm of TEMPOS) {
        for (const articulation of ARTICULATIONS) {
          for (let s = 0; s < seeds; s++) {
            const performance = perform(figure, { hand, bpm, articulation, seed: seed++ })
            const inferred = infer(hand, performance.notes)
            recovery.performances.push({ performance, inferred })
            if (!performance.decisive) {
              add(recovery.undecided, performance, inferred)
              continue
            }
            const key = `${figure.category} ${bpm}` as const
            let tally = recovery.decisive.get(key)
            if (!tally) recovery.decisive.set(key, tally = empty())
            add(tally, performance, inferred)
            add(recovery.all, performance, inferred)
          }
        }
      }
    }
  }
  return recovery
}

const percent = (part: number, whole: number): string => (whole === 0 ? '   –  ' : `${(100 * part / whole).toFixed(1).padStart(5)}%`)

/** The figures as lines of text, for the bench and for a failing test's message. */
export function formatRecovery(recovery: Recovery): string[] {
  const lines = ['  category     bpm  performances  positions exact  fingers right  (open: as played)  clean with a change invented']
  const row = (label: string, t: Tally): string =>
    `  ${label.padEnd(16)} ${String(t.performances).padStart(8)}  ${percent(t.positionsExact, t.performances).padStart(15)}  ${percent(t.fingersRight, t.fingers).padStart(13)}  ${percent(t.fingersOpenRight, t.fingersOpen).padStart(17)}  ${t.clean === 0 ? '' : `${t.cleanInvented} of ${t.clean}`}`
  for (const [key, tally] of [...recovery.decisive].sort(([a], [b]) => a.localeCompare(b, 'en', { numeric: true }))) lines.push(row(key, tally))
  lines.push(row('all decisive', recovery.all))
  lines.push(row('undecided', recovery.undecided))
  return lines
}
