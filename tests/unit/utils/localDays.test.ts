import { describe, expect, it } from 'vitest'
import { addDays, dayAtOffset, offsetAt, offsetChanges } from '../../../shared/utils/localDays'

describe('a time zone\'s offsets over a span', () => {
  it('finds the European summer-time changes of 2026 to the millisecond', () => {
    // Directive 2000/84/EC: summer time starts at 01:00 UTC on the last Sunday of March and ends at
    // 01:00 UTC on the last Sunday of October (29 March and 25 October in 2026); Berlin is UTC+1 in winter.
    const changes = offsetChanges('Europe/Berlin', Date.parse('2026-01-01T00:00:00Z'), Date.parse('2026-12-31T00:00:00Z'))
    expect(changes).toEqual([
      { fromMs: Date.parse('2026-01-01T00:00:00Z'), offsetMinutes: 60 },
      { fromMs: Date.parse('2026-03-29T01:00:00Z'), offsetMinutes: 120 },
      { fromMs: Date.parse('2026-10-25T01:00:00Z'), offsetMinutes: 60 },
    ])
  })

  it('finds the United States changes, at 2:00 local time', () => {
    // Energy Policy Act of 2005: from the second Sunday of March (8 March 2026, 02:00 PST = 10:00 UTC)
    // to the first Sunday of November (1 November 2026, 02:00 PDT = 09:00 UTC).
    const changes = offsetChanges('America/Los_Angeles', Date.parse('2026-02-01T00:00:00Z'), Date.parse('2026-12-01T00:00:00Z'))
    expect(changes.map(c => [new Date(c.fromMs).toISOString(), c.offsetMinutes])).toEqual([
      ['2026-02-01T00:00:00.000Z', -480],
      ['2026-03-08T10:00:00.000Z', -420],
      ['2026-11-01T09:00:00.000Z', -480],
    ])
  })

  it('keeps one offset where the zone has no daylight saving, half hours included', () => {
    // India Standard Time is UTC+5:30 all year (from memory).
    expect(offsetChanges('Asia/Kolkata', Date.parse('2026-01-01T00:00:00Z'), Date.parse('2026-12-31T00:00:00Z'))).toEqual([
      { fromMs: Date.parse('2026-01-01T00:00:00Z'), offsetMinutes: 330 },
    ])
    expect(offsetAt('Asia/Kolkata', Date.parse('2026-07-01T00:00:00Z'))).toBe(330)
  })
})

describe('calendar days', () => {
  it('counts days across month and year ends, and leap days', () => {
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01')
    expect(addDays('2028-03-01', -1)).toBe('2028-02-29')
    expect(addDays('2026-03-01', -1)).toBe('2026-02-28')
    expect(addDays('2026-05-10', -55)).toBe('2026-03-16')
  })

  it('puts 23:30 at UTC−7 on its own evening, not the next UTC day', () => {
    expect(dayAtOffset(Date.parse('2026-06-11T06:30:00Z'), -420)).toBe('2026-06-10')
    expect(dayAtOffset(Date.parse('2026-06-11T06:30:00Z'), 0)).toBe('2026-06-11')
  })
})
