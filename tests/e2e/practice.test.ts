import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openStudentWithFakeMidi } from '../support/browser'
import type { BrowserSession } from '../support/browser'
import { assignedDrill, playDrill } from '../support/practice'
import type { AssignedDrill } from '../support/practice'
import { closeTestDb, testDb } from '../support/server'

let browser: BrowserSession
let drill: AssignedDrill
let studentId: number

beforeAll(async () => {
  drill = await assignedDrill('Five-finger pattern in C, right hand', 'Tuesday Starters')
  studentId = Number((await testDb()('users').where({ email: 'student@evenhand.test' }).first('id')).id)
  browser = await openStudentWithFakeMidi()
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

function openDrillAndPlay(): Promise<void> {
  return playDrill(browser.page, drill, `?assignment=${drill.assignmentId}`)
}

async function latestAttempt(): Promise<{ id: string, score: number, events: unknown[] } | undefined> {
  const row = await testDb()('attempts').where({ student_id: studentId, drill_id: drill.id }).orderBy('created_at', 'desc').first()
  return row && { id: row.id, score: row.score, events: typeof row.events === 'string' ? JSON.parse(row.events) : row.events }
}

describe('practising an assigned drill on a MIDI keyboard', () => {
  it('shows the grade and stores the raw events with the server\'s score', async () => {
    const before = await latestAttempt()
    await openDrillAndPlay()
    const { page } = browser
    await page.getByTestId('save-state').filter({ hasText: 'saved' }).waitFor()
    expect(await page.getByTestId('attempt-accuracy').textContent()).toContain(`${drill.notes.length} / ${drill.notes.length} right`)
    const shown = Number(await page.getByTestId('attempt-score').textContent())
    const stored = await latestAttempt()
    expect(stored?.id).not.toBe(before?.id)
    expect(stored!.events).toHaveLength(drill.notes.length * 2)
    expect(stored!.score).toBe(shown)
    expect(shown).toBeGreaterThan(60)

    // The same attempt sent again (a retry after a lost answer) is stored once.
    const attempt = await testDb()('attempts').where({ id: stored!.id }).first()
    const status = await page.evaluate(async (body) => {
      const res = await fetch('/api/attempts', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) })
      return res.status
    }, {
      id: attempt.id, drillId: drill.id, drillVersion: attempt.drill_version, assignmentId: drill.assignmentId, startedAt: new Date(attempt.started_at).toISOString(),
      tempoBpm: Number(attempt.tempo_bpm), inputDevice: attempt.input_device, events: stored!.events,
    })
    expect(status).toBe(200)
    expect(await testDb()('attempts').where({ id: stored!.id }).count({ n: '*' })).toEqual([{ n: 1 }])
  })

  it('keeps an attempt played while the server is unreachable and saves it when it is back', async () => {
    const { page, context } = browser
    const before = await latestAttempt()
    await context.route('**/api/attempts', route => route.abort('connectionrefused'))
    await openDrillAndPlay()
    await page.getByTestId('save-state').filter({ hasText: 'waiting to save' }).waitFor()
    expect((await latestAttempt())?.id).toBe(before?.id)

    await context.unroute('**/api/attempts')
    await page.reload()
    await expect.poll(async () => (await latestAttempt())?.id, { timeout: 15_000 }).not.toBe(before?.id)
    expect((await latestAttempt())!.events).toHaveLength(drill.notes.length * 2)
  })
})
