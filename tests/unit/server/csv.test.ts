import { describe, expect, it } from 'vitest'
import { progressCsv } from '../../../server/utils/progress'
import type { ClassProgress } from '../../../server/utils/progress'

function progress(studentName: string, drillTitle: string, trend: number | null): ClassProgress {
  return {
    classId: 1,
    className: 'Class',
    students: [{ id: 1, name: studentName }],
    drills: [{ id: 2, title: drillTitle, kind: 'scale', targetScore: 80, dueAt: null, forSomeOnly: false }],
    cells: { 1: { 2: { assigned: true, attempts: 3, best: 90, latest: 85, trend, overdue: false } } },
  }
}

describe('progress CSV', () => {
  // OWASP, "CSV Injection": cells starting with =, +, -, @, tab or carriage return are read as formulas.
  it.each([['=1+1'], ['+SUM(A1:A9)'], ['-2+3'], ['@cmd'], ['\tTAB']])('prefixes a text cell beginning %j with a quote', (name) => {
    const line = progressCsv(progress(name, 'Scale', null)).split('\r\n')[1]!
    expect(line.split(',')[1]).toMatch(/^"?'/)
  })

  it('leaves a negative trend a plain number and quotes a comma as RFC 4180 asks', () => {
    const csv = progressCsv(progress('Ada', 'C major, right hand', -4.6))
    expect(csv).toBe('class,student,drill,attempts,best,latest,trend,overdue\r\nClass,Ada,"C major, right hand",3,90,85,-5,no\r\n')
  })
})
