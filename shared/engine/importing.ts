// What the MIDI and MusicXML importers share: turning what a file says into a drill the
// rest of the app accepts (the same limits as a typed drill), with one kind of error.
import { DrillMusic } from '../types/drill'
import type { DrillHand } from '../types/drill'
import { TEMPO_LIMITS } from '../utils/tempo'
import type { DrillNote, ImportedDrill } from './types'

export class ImportError extends Error {
  override name = 'ImportError'
}

/** Files use any tempo; a drill keeps a whole number of beats per minute within what the app plays. */
export function drillTempo(bpm: number | null | undefined): number {
  if (bpm === null || bpm === undefined || !Number.isFinite(bpm) || bpm <= 0) return DEFAULT_TEMPO_BPM
  return Math.min(TEMPO_LIMITS.max, Math.max(TEMPO_LIMITS.min, Math.round(bpm)))
}

/** The tempo a file without one is played at (SMF 1.0: 120 beats per minute when no tempo event is given). */
export const DEFAULT_TEMPO_BPM = 120

/** Beats to a fine grid (1/2880 of a beat) so float noise from tick or division arithmetic does not split chords. */
export function roundBeat(beat: number): number {
  return Math.round(beat * 2880) / 2880
}

export interface ImportParts {
  hand: DrillHand
  tempoBpm: number
  notes: DrillNote[]
  key: string | null
  meter: string | null
  title: string | null
  /** Names the file kind in messages ("MIDI file", "MusicXML file"). */
  kind: string
}

export function finishImport(parts: ImportParts): ImportedDrill {
  if (parts.notes.length === 0) throw new ImportError(`the ${parts.kind} contains no notes`)
  const notes = [...parts.notes].sort((a, b) => a.beat - b.beat || (a.hand ?? '').localeCompare(b.hand ?? ''))
  const music = DrillMusic.safeParse({ hand: parts.hand, tempoBpm: parts.tempoBpm, notes })
  if (!music.success) {
    const issue = music.error.issues[0]!
    const where = issue.path.length ? ` (at ${issue.path.join('.')})` : ''
    throw new ImportError(`the ${parts.kind} does not fit a drill${where}: ${issue.message}`)
  }
  return { ...music.data, key: parts.key, meter: parts.meter, title: parts.title }
}
