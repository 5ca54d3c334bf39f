// A student's habits across many attempts: which finger tends to come in late or early, loud or
// soft, compared with the student's other fingers in the same attempts, and where the hand moves
// to a new position that the plan did not ask for. Reads only stored grade results.
import type { Finger, GradeResult } from './types'
import { mean } from './stats'

/**
 * A finger counts as late or early in an attempt when its notes average this much later or
 * earlier than the other fingers' notes. Our own threshold: about a third of the timing spread
 * of a steady student in the demo data, large enough that one stray note does not decide it.
 */
export const HABIT_TIMING_MS = 10
/** Likewise for loudness, in MIDI velocity units (of 127). */
export const HABIT_VELOCITY = 5

/** The parts of a stored grade the habits read. */
export type HabitResult = Pick<GradeResult, 'inferredFingers'> & {
  timing: Pick<GradeResult['timing'], 'deviationsMs'>
  loudness: Pick<GradeResult['loudness'], 'velocities'>
}

export interface FingerHabit {
  finger: Finger
  /** Attempts in which this finger and at least one other finger played. */
  attempts: number
  /** Mean over those attempts of (this finger's mean onset deviation − the other fingers'), ms; + is late. */
  timingMs: number | null
  /** The same for velocity; + is louder. */
  velocity: number | null
  /** Attempts in which the finger was late, early, loud or soft by the thresholds above. */
  late: number
  early: number
  loud: number
  soft: number
}

const FINGERS: Finger[] = [1, 2, 3, 4, 5]

/** This finger's mean minus the other fingers' mean of one figure in one attempt; null unless both sides have notes. */
function differenceFromOthers(finger: Finger, fingers: GradeResult['inferredFingers'], values: readonly (number | null)[]): number | null {
  const own: number[] = []
  const others: number[] = []
  for (let i = 0; i < values.length; i++) {
    const v = values[i]
    const f = fingers[i]?.finger
    if (v == null || f == null) continue
    ;(f === finger ? own : others).push(v)
  }
  const a = mean(own)
  const b = mean(others)
  return a === null || b === null ? null : a - b
}

/** Per finger, how it compares with the student's other fingers over the given attempts. */
export function fingerHabits(results: readonly HabitResult[]): FingerHabit[] {
  return FINGERS.map((finger) => {
    const timing: number[] = []
    const velocity: number[] = []
    for (const r of results) {
      const t = differenceFromOthers(finger, r.inferredFingers, r.timing.deviationsMs)
      if (t !== null) timing.push(t)
      const v = differenceFromOthers(finger, r.inferredFingers, r.loudness.velocities)
      if (v !== null) velocity.push(v)
    }
    return {
      finger,
      attempts: Math.max(timing.length, velocity.length),
      timingMs: mean(timing),
      velocity: mean(velocity),
      late: timing.filter(d => d > HABIT_TIMING_MS).length,
      early: timing.filter(d => d < -HABIT_TIMING_MS).length,
      loud: velocity.filter(d => d > HABIT_VELOCITY).length,
      soft: velocity.filter(d => d < -HABIT_VELOCITY).length,
    }
  })
}

export const FINGER_NAMES: Record<Finger, string> = { 1: 'thumb', 2: 'index finger', 3: 'middle finger', 4: 'ring finger', 5: 'little finger' }

/**
 * One sentence about a finger's clearest habit, addressed to `who` ("your" for the student, a
 * name's possessive for the teacher): the larger of its timing and loudness leanings measured in
 * thresholds, or that it keeps with the others when neither reaches its threshold.
 */
export function habitStatement(h: FingerHabit, who = 'your'): string {
  const name = `${who} ${FINGER_NAMES[h.finger]}`
  const over = `over ${h.attempts} attempt${h.attempts === 1 ? '' : 's'}`
  if (h.attempts === 0) return `${capital(name)} has not played in these attempts yet.`
  const t = h.timingMs ?? 0
  const v = h.velocity ?? 0
  if (Math.abs(t) < HABIT_TIMING_MS && Math.abs(v) < HABIT_VELOCITY) {
    return `${capital(name)} keeps with ${who} other fingers ${over} (within ${HABIT_TIMING_MS} ms and ${HABIT_VELOCITY} velocity units on average).`
  }
  if (Math.abs(t) / HABIT_TIMING_MS >= Math.abs(v) / HABIT_VELOCITY) {
    return `${capital(name)} is on average ${Math.round(Math.abs(t))} ms ${t > 0 ? 'later' : 'earlier'} than ${who} other fingers ${over}.`
  }
  return `${capital(name)} is on average ${Math.round(Math.abs(v))} velocity units ${v > 0 ? 'louder' : 'softer'} than ${who} other fingers ${over}.`
}

function capital(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1)
}

/** The parts of a stored grade the position habit reads. */
export type ShiftResult = { positionChanges: Pick<GradeResult['positionChanges'], 'at' | 'plannedAt'> }

export interface UnplannedShift {
  drillId: number
  /** 0-based index of the drill note where the hand moved. */
  noteIndex: number
  /** Attempts that moved here although the plan did not. */
  times: number
  /** Attempts of that drill looked at. */
  attempts: number
}

/** Places (drill, note) where the student began a new hand position the plan did not, most frequent first. */
export function unplannedShifts(results: readonly (ShiftResult & { drillId: number })[], limit = 5): UnplannedShift[] {
  const attemptsPerDrill = new Map<number, number>()
  const counts = new Map<string, UnplannedShift>()
  for (const r of results) {
    attemptsPerDrill.set(r.drillId, (attemptsPerDrill.get(r.drillId) ?? 0) + 1)
    const planned = new Set(r.positionChanges.plannedAt)
    for (const index of new Set(r.positionChanges.at)) {
      if (planned.has(index)) continue
      const key = `${r.drillId}:${index}`
      const entry = counts.get(key) ?? { drillId: r.drillId, noteIndex: index, times: 0, attempts: 0 }
      entry.times++
      counts.set(key, entry)
    }
  }
  return [...counts.values()]
    .map(s => ({ ...s, attempts: attemptsPerDrill.get(s.drillId)! }))
    .sort((a, b) => b.times - a.times || b.times / b.attempts - a.times / a.attempts || a.drillId - b.drillId || a.noteIndex - b.noteIndex)
    .slice(0, limit)
}
