// The engine's public shapes. The browser, the server and the command line all read these,
// so change them only together with every caller.
import type { Finger, Hand, HandSize, DrillMusic, DrillNote, Emphasis } from '../types/drill'
import type { PlayedEvent } from '../types/attempt'

export type { Finger, Hand, HandSize, DrillMusic, DrillNote, Emphasis, PlayedEvent }

/** A line to finger: MIDI numbers, a chord as an array of MIDI numbers. */
export type LineItem = number | number[]

export interface SuggestInput {
  hand: Hand
  notes: LineItem[]
  handSize?: HandSize
  /** Each item's emphasis (null or absent for an ordinary note); see shared/types/drill.ts. */
  emphasis?: (Emphasis | null | undefined)[]
}

export interface SuggestResult {
  /** One finger per note, or one array (low to high) per chord. */
  fingers: (Finger | Finger[])[]
  /** Indices of the items where a new hand position begins (the first item is not counted). */
  positions: number[]
  positionChanges: number
  cost: number
}

export interface GradeOptions {
  /** The tempo the student chose to practise at; the drill's own tempo when absent. */
  targetBpm?: number
  handSize?: HandSize
}

export type NoteOutcome = 'correct' | 'wrong' | 'missed'

export interface GradeResult {
  engineVersion: string
  /** 0 to 100, see `scoreFormula`. */
  score: number
  /** The parts that make up the score, each 0 to 1, with their weights. */
  scoreParts: Record<'accuracy' | 'timing' | 'loudness' | 'positions' | 'tempo', { value: number, weight: number }>
  scoreFormula: string
  accuracy: { correct: number, wrong: number, extra: number, missed: number, total: number }
  timing: {
    /** SD of onset deviations from a straight line fitted to onsets against beats, in ms. */
    sdMs: number | null
    /** sdMs as a percentage of the fitted interval of the drill's typical step (ms per beat × median beat gap). */
    cvPercent: number | null
    /** Mean absolute change between consecutive inter-onset intervals, as % of the mean interval. */
    ioiVariationPercent: number | null
    /** Per drill note: deviation from the fitted line in ms (null where missed). */
    deviationsMs: (number | null)[]
  }
  loudness: {
    /** SD of velocities, each note measured from the mean of the notes of its own emphasis (soft, ordinary, accent). */
    sd: number | null
    mean: number | null
    /** Mean velocity of each inferred finger minus the mean of all notes. */
    byFinger: Record<'1' | '2' | '3' | '4' | '5', number | null>
    loudestFinger: Finger | null
    softestFinger: Finger | null
    /** Per drill note: velocity played (null where missed). */
    velocities: (number | null)[]
    /**
     * The drill's soft notes and accents against its ordinary notes: mean velocity of the accents minus
     * that of the ordinary notes, and of the ordinary notes minus the soft ones; whether each difference
     * reaches EMPHASIS_MIN_VELOCITY (grade.ts). Null where the drill has no such notes, or none played.
     */
    emphasis: {
      accentLift: number | null
      softDrop: number | null
      accentsStandOut: boolean | null
      softStaysSoft: boolean | null
    }
  }
  positionChanges: {
    planned: number
    played: number
    /** 0-based drill-note indices where a new hand position begins in the performance. */
    at: number[]
    /** 0-based drill-note indices where the planned fingering begins a new position (open fingers filled by the suggestion). */
    plannedAt: number[]
  }
  tempo: { targetBpm: number, playedBpm: number | null }
  /** One entry per drill note; a missed note's finger is null. */
  inferredFingers: { finger: Finger | null, confidence: number }[]
  /** Per drill note: what happened and which note-on (index into the attempt's `events`) matched it. */
  notes: { outcome: NoteOutcome, eventIndex: number | null, playedNote: number | null }[]
  /** Indices into `events` of the note-ons that matched no drill note, in onset order. */
  extras: number[]
}

/** A drill read from a Standard MIDI File or MusicXML, before the teacher titles and saves it. */
export interface ImportedDrill extends DrillMusic {
  /** Such as `Eb major` or `d minor`; null where the file names no key. */
  key: string | null
  /** Such as `3/4`; null where the file names no metre. */
  meter: string | null
  title: string | null
}
