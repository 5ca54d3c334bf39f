import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DrillNote } from '../../shared/types/drill'
import { browserForFile, openStudentWithFakeMidi } from '../support/browser'
import { playDrill } from '../support/practice'
import { closeTestDb, testDb } from '../support/server'
import * as demo from '../../seeds/demo/studio'

// The demo student is assigned every demo drill (two classes and one drill set of her own),
// so each one can be practised end to end: opened, played on MIDI, graded and saved.
const browser = browserForFile(openStudentWithFakeMidi)
let drills: { id: number, title: string, notes: DrillNote[] }[]

beforeAll(async () => {
  // The seeded drills as the seed wrote them: the API tests that ran before add drills of their own.
  const rows = await testDb()('drills as d').join('users as u', 'u.id', 'd.owner_id').where('u.email', demo.teacher.email)
    .whereIn('d.title', demo.drills.map(x => x.title)).whereNull('d.copied_from_id').orderBy('d.id').select('d.id', 'd.title', 'd.notes')
  drills = rows.map(r => ({ id: Number(r.id), title: r.title, notes: typeof r.notes === 'string' ? JSON.parse(r.notes) : r.notes }))
})
afterAll(closeTestDb)

describe('every demo drill', () => {
  it('has twelve drills to practise', () => {
    expect(drills).toHaveLength(12)
  })

  it.each(Array.from({ length: 12 }, (_, i) => i))('plays, grades and saves demo drill %i', async (i) => {
    const drill = drills[i]!
    const { page } = browser
    await playDrill(page, drill)
    await page.getByTestId('save-state').filter({ hasText: 'saved' }).waitFor({ timeout: 15_000 })
    expect(await page.getByTestId('attempt-accuracy').textContent()).toContain(`${drill.notes.length} / ${drill.notes.length} right`)
  })
})
