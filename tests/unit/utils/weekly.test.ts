import { describe, expect, it } from 'vitest'
import { attemptMinutes, lastCompleteWeek, weekStartOf } from '../../../server/utils/weekly'

describe('the weekly summary\'s week', () => {
  // ISO 8601 weeks start on Monday; 2 December 2026 is a Wednesday (from the calendar).
  it('starts on the Monday at 00:00 UTC, also for a Sunday late in the evening', () => {
    expect(weekStartOf(new Date('2026-12-02T15:00:00Z')).toISOString()).toBe('2026-11-30T00:00:00.000Z')
    expect(weekStartOf(new Date('2026-12-06T23:59:59Z')).toISOString()).toBe('2026-11-30T00:00:00.000Z')
    expect(weekStartOf(new Date('2026-11-30T00:00:00Z')).toISOString()).toBe('2026-11-30T00:00:00.000Z')
  })

  it('summarises the last complete week, never the one still running', () => {
    expect(lastCompleteWeek(new Date('2026-12-07T07:00:00Z')).toISOString()).toBe('2026-11-30T00:00:00.000Z')
    expect(lastCompleteWeek(new Date('2026-12-06T20:00:00Z')).toISOString()).toBe('2026-11-23T00:00:00.000Z')
  })
})

describe('minutes of an attempt', () => {
  it('runs from the first to the last event, whatever their order', () => {
    expect(attemptMinutes([{ timeMs: 90_000 }, { timeMs: 1500 }, { timeMs: 30_000 }])).toBeCloseTo(88.5 / 60, 10)
  })

  it('is zero for an attempt of one event or none', () => {
    expect(attemptMinutes([{ timeMs: 5000 }])).toBe(0)
    expect(attemptMinutes([])).toBe(0)
  })
})
