import { describe, expect, it } from 'vitest'
import { startOfDayIn } from '../../../shared/utils/dueDate'
import { attemptMinutes, lastCompleteWeek, mondayOf } from '../../../server/utils/weekly'

describe('the weekly summary\'s week', () => {
  // ISO 8601 weeks start on Monday; 2 December 2026 is a Wednesday (from the calendar).
  it('starts on the Monday of the day\'s week, also for a Sunday and for the Monday itself', () => {
    expect(mondayOf('2026-12-02')).toBe('2026-11-30')
    expect(mondayOf('2026-12-06')).toBe('2026-11-30')
    expect(mondayOf('2026-11-30')).toBe('2026-11-30')
    expect(mondayOf('2027-01-01')).toBe('2026-12-28')
  })

  it('summarises the last week complete in the student\'s own zone, never the one still running there', () => {
    // Monday 7 December 2026, 07:00 UTC: the week of 30 November has ended in London (07:00 Monday)
    // but not in Los Angeles (23:00 Sunday, UTC−8 in winter; the zone's rule, from memory).
    const now = new Date('2026-12-07T07:00:00Z')
    expect(lastCompleteWeek('UTC', now)).toBe('2026-11-30')
    expect(lastCompleteWeek('Europe/London', now)).toBe('2026-11-30')
    expect(lastCompleteWeek('America/Los_Angeles', now)).toBe('2026-11-23')
    // Sunday 6 December, 20:00 UTC is already Monday 09:00 in Auckland (UTC+13 in its summer).
    expect(lastCompleteWeek('Pacific/Auckland', new Date('2026-12-06T20:00:00Z'))).toBe('2026-11-30')
    expect(lastCompleteWeek('UTC', new Date('2026-12-06T20:00:00Z'))).toBe('2026-11-23')
  })

  it('bounds the week by the zone\'s own midnights, across a daylight-saving change', () => {
    // Lisbon moves from UTC+0 to UTC+1 on the last Sunday of March, 29 March 2026 (EU summer-time rule, from memory):
    // the week from Monday 23 March lasts 167 hours.
    const start = startOfDayIn('2026-03-23', 'Europe/Lisbon')
    const end = startOfDayIn('2026-03-30', 'Europe/Lisbon')
    expect(start.toISOString()).toBe('2026-03-23T00:00:00.000Z')
    expect(end.toISOString()).toBe('2026-03-29T23:00:00.000Z')
    expect(startOfDayIn('2026-11-30', 'America/Los_Angeles').toISOString()).toBe('2026-11-30T08:00:00.000Z')
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
