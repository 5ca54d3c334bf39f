// The grade in plain sentences for a student, before any figure: what went well and the one
// thing to work on in each part. The thresholds are for wording only; the score is the engine's.
import type { GradeResult } from '#shared/engine'

const FINGER_NAMES: Record<number, string> = { 1: 'thumb', 2: 'index finger', 3: 'middle finger', 4: 'ring finger', 5: 'little finger' }

/** Timing spread, as % of a note's time, that still reads as steady, and as fairly steady (common practice). */
const STEADY_PERCENT = 5
const FAIRLY_STEADY_PERCENT = 10
/** A finger this many velocity steps above or below the mean is heard as louder or softer (from memory). */
const AUDIBLE_VELOCITY = 6
/** Velocity spread that still sounds even (from memory; the grade itself gives no marks at 20). */
const EVEN_VELOCITY_SD = 6

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`
}

function accuracySentence(result: GradeResult, pitches: readonly string[]): string {
  const { correct, wrong, missed, extra, total } = result.accuracy
  if (correct === total && extra === 0) return 'Every note was right.'
  if (correct === 0) return 'None of the notes matched the drill; check the starting note and hand position.'
  const firstWrong = result.notes.findIndex(n => n.outcome !== 'correct')
  const where = firstWrong >= 0 ? ` The first slip was note ${firstWrong + 1} (${pitches[firstWrong] ?? '?'}).` : ''
  const slips = [wrong && plural(wrong, 'wrong note'), missed && plural(missed, 'missed note'), extra && plural(extra, 'extra note')].filter(Boolean).join(', ')
  return `${correct} of ${total} notes were right${slips ? ` (${slips})` : ''}.${where}`
}

function timingSentence(result: GradeResult): string | null {
  const { cvPercent, deviationsMs } = result.timing
  if (cvPercent == null) return null
  if (cvPercent <= STEADY_PERCENT) return 'Steady timing.'
  let worst = -1
  deviationsMs.forEach((d, i) => {
    if (d != null && (worst < 0 || Math.abs(d) > Math.abs(deviationsMs[worst]!))) worst = i
  })
  const far = worst >= 0 ? ` Note ${worst + 1} came furthest ${deviationsMs[worst]! > 0 ? 'late' : 'early'}.` : ''
  return cvPercent <= FAIRLY_STEADY_PERCENT
    ? `Fairly steady timing.${far}`
    : `Uneven timing: the notes wandered from a steady beat.${far} Try it slower, counting along with the click.`
}

function touchSentence(result: GradeResult): string | null {
  if (result.scoreParts.loudness.weight === 0) return 'Touch was not graded: this input cannot tell how hard a key was struck.'
  const { sd, loudestFinger, softestFinger, byFinger } = result.loudness
  if (sd == null) return null
  const loud = loudestFinger ? byFinger[String(loudestFinger) as '1'] : null
  const soft = softestFinger ? byFinger[String(softestFinger) as '1'] : null
  if (loudestFinger && loud != null && loud >= AUDIBLE_VELOCITY) return `Your ${FINGER_NAMES[loudestFinger]} played louder than your other fingers.`
  if (softestFinger && soft != null && soft <= -AUDIBLE_VELOCITY) return `Your ${FINGER_NAMES[softestFinger]} played softer than your other fingers.`
  return sd <= EVEN_VELOCITY_SD ? 'An even touch.' : 'The loudness went up and down; aim for the same weight on every key.'
}

function positionSentence(result: GradeResult): string {
  const { planned, played } = result.positionChanges
  if (played === planned) return planned === 0 ? 'Your hand stayed in one place, as planned.' : 'Your hand moved to a new position just where the fingering plans it.'
  return played > planned
    ? `Your hand moved ${plural(played - planned, 'time')} more than the fingering plans; check which fingers the plan asks for.`
    : `Your hand moved ${plural(planned - played, 'time')} fewer than the fingering plans.`
}

function tempoSentence(result: GradeResult, comparedWith: string | undefined): string | null {
  const { playedBpm, targetBpm } = result.tempo
  if (playedBpm == null) return null
  const against = comparedWith ? `${targetBpm} bpm, ${comparedWith}` : `${targetBpm} bpm`
  return `You played at about ${Math.round(playedBpm)} bpm; the grade compares this with ${against}.`
}

/** The grade as sentences, most important first: notes, timing, touch, hand positions, tempo. */
export function gradeSentences(result: GradeResult, pitches: readonly string[], comparedWith?: string): string[] {
  return [
    accuracySentence(result, pitches),
    timingSentence(result),
    touchSentence(result),
    positionSentence(result),
    tempoSentence(result, comparedWith),
  ].filter((s): s is string => s !== null)
}
