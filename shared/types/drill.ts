import { z } from 'zod'
import { TEMPO_LIMITS } from '../utils/tempo'

/** A hand that plays a line. */
export const Hand = z.enum(['right', 'left'])
export type Hand = z.infer<typeof Hand>

/** A drill is written for one hand or for both. */
export const DrillHand = z.enum(['right', 'left', 'both'])
export type DrillHand = z.infer<typeof DrillHand>

/** Fingers are numbered 1 (thumb) to 5 (little finger) on both hands, as in printed fingering. */
export const Finger = z.number().int().min(1).max(5)
export type Finger = z.infer<typeof Finger>

/** What a drill trains; `other` for anything that is none of the named kinds. */
export const DrillKind = z.enum(['scale', 'arpeggio', 'five-finger', 'sequence', 'passage', 'other'])
export type DrillKind = z.infer<typeof DrillKind>

export const HandSize = z.enum(['small', 'medium', 'large'])
export type HandSize = z.infer<typeof HandSize>

/** A spelled pitch such as `C4`, `F#3`, `Bb5`, `F##4` or `Cb5` (scientific pitch notation, C4 = MIDI 60). */
export const PitchName = z.string().trim().regex(/^[A-Ga-g](?:#{1,2}|b{1,2})?-?\d$/, 'Expected a pitch such as C4, F#3 or Bb5')

/**
 * How a note is meant to sound beside its neighbours: `soft` (a quiet note, such as one marked p or pp)
 * or `accent` (a note that stands out, such as one marked > or f). Absent for an ordinary note.
 */
export const Emphasis = z.enum(['soft', 'accent'])
export type Emphasis = z.infer<typeof Emphasis>

export const DrillNote = z.object({
  pitch: PitchName,
  /** Onset in beats from the start of the drill. */
  beat: z.number().min(0).max(100_000),
  /** Written length in beats. */
  length: z.number().positive().max(64),
  /** Which hand plays it; required when the drill is for both hands. */
  hand: Hand.optional(),
  /** The planned finger; absent where the teacher left it open. */
  finger: Finger.nullable().optional(),
  emphasis: Emphasis.optional(),
})
export type DrillNote = z.infer<typeof DrillNote>

export const DrillMusic = z.object({
  hand: DrillHand,
  tempoBpm: z.number().int().min(TEMPO_LIMITS.min).max(TEMPO_LIMITS.max),
  notes: z.array(DrillNote).min(1).max(5000),
})
export type DrillMusic = z.infer<typeof DrillMusic>
