// The habit statistics on the demo's invented performances (seeds/demo), checked against
// simple-statistics (npm), a general-purpose library, rather than against our own arithmetic.
import { mean } from 'simple-statistics'
import { describe, expect, it } from 'vitest'
import { fingerHabits, gradeAttempt, habitStatement, HABIT_TIMING_MS, HABIT_VELOCITY, unplannedShifts, type GradeResult } from '../../../shared/engine'
import { performDrill } from '../../../seeds/demo/performance'
import { seededRandom } from '../../../shared/utils/random'
import { drills } from '../../../seeds/demo/studio'

/** A student who leans on `accent` plays every right-hand drill of the demo a few times. */
function seededResults(accent: number, seed: number): (GradeResult & { drillId: number })[] {
  const random = seededRandom(seed)
  const results: (GradeResult & { drillId: number })[] = []
  drills.filter(d => d.hand === 'right').forEach((drill, drillId) => {
    for (let k = 0; k < 4; k++) {
      const events = performDrill(drill.notes, { tempoBpm: drill.tempoBpm, skill: 0.5 + 0.1 * k, accentFinger: accent }, random)
      results.push({ ...gradeAttempt({ hand: drill.hand, tempoBpm: drill.tempoBpm, notes: drill.notes }, events), drillId })
    }
  })
  return results
}

/** This finger's figure minus the other fingers', per attempt, where both played; simple-statistics' mean. */
function differences(results: GradeResult[], finger: number, pick: (r: GradeResult) => (number | null)[]): number[] {
  const out: number[] = []
  for (const r of results) {
    const values = pick(r)
    const own: number[] = []
    const rest: number[] = []
    values.forEach((v, i) => {
      const f = r.inferredFingers[i]?.finger
      if (v === null || f == null) return
      ;(f === finger ? own : rest).push(v)
    })
    if (own.length && rest.length) out.push(mean(own) - mean(rest))
  }
  return out
}

describe('finger habits', () => {
  const results = seededResults(1, 7)

  it('gives each finger its mean difference from the other fingers, as simple-statistics computes it', () => {
    const habits = fingerHabits(results)
    expect(habits.map(h => h.finger)).toEqual([1, 2, 3, 4, 5])
    for (const h of habits) {
      const velocity = differences(results, h.finger, r => r.loudness.velocities)
      const timing = differences(results, h.finger, r => r.timing.deviationsMs)
      expect(h.velocity).toBeCloseTo(mean(velocity), 9)
      expect(h.timingMs).toBeCloseTo(mean(timing), 9)
      expect(h.attempts).toBe(Math.max(velocity.length, timing.length))
      expect(h.loud).toBe(velocity.filter(v => v > HABIT_VELOCITY).length)
      expect(h.soft).toBe(velocity.filter(v => v < -HABIT_VELOCITY).length)
      expect(h.late).toBe(timing.filter(v => v > HABIT_TIMING_MS).length)
      expect(h.early).toBe(timing.filter(v => v < -HABIT_TIMING_MS).length)
    }
  })

  it('finds the finger the performer leaned on, whichever it is, and says so in words', () => {
    for (const accent of [1, 3]) {
      const habits = fingerHabits(seededResults(accent, 11 + accent))
      const loudest = habits.reduce((a, b) => ((b.velocity ?? -Infinity) > (a.velocity ?? -Infinity) ? b : a))
      expect(loudest.finger).toBe(accent)
      expect(loudest.loud).toBeGreaterThan(loudest.attempts / 2)
      expect(habitStatement(loudest)).toBe(`Your ${accent === 1 ? 'thumb' : 'middle finger'} is on average ${Math.round(loudest.velocity!)} velocity units louder than your other fingers over ${loudest.attempts} attempts.`)
    }
  })

  it('speaks of timing when timing is the larger leaning, and of no habit within both thresholds', () => {
    const base = { finger: 2 as const, attempts: 3, late: 3, early: 0, loud: 0, soft: 0 }
    expect(habitStatement({ ...base, timingMs: -24.4, velocity: 4 }, 'Noor\'s')).toBe('Noor\'s index finger is on average 24 ms earlier than Noor\'s other fingers over 3 attempts.')
    expect(habitStatement({ ...base, timingMs: 3, velocity: -2 })).toMatch(/^Your index finger keeps with your other fingers over 3 attempts/)
  })

  it('leaves a finger that never played without figures', () => {
    const habits = fingerHabits([])
    expect(habits.every(h => h.attempts === 0 && h.velocity === null && h.timingMs === null)).toBe(true)
  })
})

describe('unplanned position changes', () => {
  it('counts, per drill note, the attempts that moved there when the plan did not', () => {
    const results = seededResults(0, 3)
    const shifts = unplannedShifts(results, 50)
    const expected = new Map<string, number>()
    for (const r of results) {
      for (const i of r.positionChanges.at) if (!r.positionChanges.plannedAt.includes(i)) expected.set(`${r.drillId}:${i}`, (expected.get(`${r.drillId}:${i}`) ?? 0) + 1)
    }
    expect(shifts.length).toBe(Math.min(50, expected.size))
    for (const s of shifts) {
      expect(s.times).toBe(expected.get(`${s.drillId}:${s.noteIndex}`))
      expect(s.attempts).toBe(results.filter(r => r.drillId === s.drillId).length)
    }
    for (let k = 1; k < shifts.length; k++) expect(shifts[k]!.times).toBeLessThanOrEqual(shifts[k - 1]!.times)
  })

  it('ignores changes the plan asks for', () => {
    const planned = { drillId: 1, positionChanges: { at: [3, 8], plannedAt: [3, 8] } }
    const extra = { drillId: 1, positionChanges: { at: [3, 5, 8], plannedAt: [3, 8] } }
    expect(unplannedShifts([planned, extra, extra])).toEqual([{ drillId: 1, noteIndex: 5, times: 2, attempts: 3 }])
  })
})
