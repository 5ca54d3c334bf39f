import type { AttemptPart } from '../types/attempt'
import type { DrillHand, DrillMusic, DrillNote } from '../types/drill'

/** Beats in a bar from a metre such as `3/4`; four when the metre does not say. */
export function beatsPerBar(meter: string | null | undefined): number {
  const beats = Number(meter?.split('/')[0])
  return Number.isInteger(beats) && beats > 0 ? beats : 4
}

/** Bars the drill spans, counting the bar its last note ends in. */
export function barCount(notes: readonly DrillNote[], perBar: number): number {
  const end = Math.max(0, ...notes.map(n => n.beat + n.length))
  return Math.max(1, Math.ceil(end / perBar - 1e-9))
}

export interface DrillPart {
  /** What is played and graded: the part's notes, moved so that its first bar starts at beat 0. */
  music: DrillMusic
  /** Each part note's index among the drill's notes. */
  indexes: number[]
  /** The other hand's notes in the same bars (hands separately), on the same beats as `music`. */
  others: DrillNote[]
}

/**
 * The notes of some bars of a drill, for one hand or both; null when those bars hold no note to
 * play. A part's first bar becomes beat 0, so its timing is graded as if it were the whole drill.
 */
export function drillPart(music: DrillMusic, part: AttemptPart | null | undefined, perBar: number): DrillPart | null {
  if (!part) return { music, indexes: music.notes.map((_, i) => i), others: [] }
  const from = (part.fromBar - 1) * perBar
  const to = part.toBar * perBar
  const inBars = music.notes.flatMap((n, i) => (n.beat >= from - 1e-9 && n.beat < to - 1e-9 ? [{ n, i }] : []))
  const hand: DrillHand = part.hand ?? music.hand
  const plays = (n: DrillNote): boolean => !part.hand || (n.hand ?? music.hand) === part.hand
  const mine = inBars.filter(({ n }) => plays(n))
  if (!mine.length) return null
  const shift = (n: DrillNote): DrillNote => ({ ...n, beat: n.beat - from })
  return {
    music: { hand, tempoBpm: music.tempoBpm, notes: mine.map(({ n }) => shift(n)) },
    indexes: mine.map(({ i }) => i),
    others: inBars.filter(({ n }) => !plays(n)).map(({ n }) => shift(n)),
  }
}

/** A part in words for a heading: `Bars 2–3, right hand`; empty for the whole drill. */
export function partLabel(part: AttemptPart | null | undefined): string {
  if (!part) return ''
  const bars = part.fromBar === part.toBar ? `Bar ${part.fromBar}` : `Bars ${part.fromBar}–${part.toBar}`
  return part.hand ? `${bars}, ${part.hand} hand` : bars
}

/** The notes an attempt was graded against, and its part in words, from what the attempt page loads. */
export function playedPart(drill: { hand?: DrillHand, tempoBpm?: number, meter: string, notes: DrillNote[] }, part: AttemptPart | null): { notes: DrillNote[], label: string } {
  const music: DrillMusic = { hand: drill.hand ?? 'right', tempoBpm: drill.tempoBpm ?? 60, notes: drill.notes }
  return { notes: drillPart(music, part, beatsPerBar(drill.meter))?.music.notes ?? [], label: partLabel(part) }
}
