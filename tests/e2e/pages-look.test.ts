// Every page as a teacher and as a student, in light and dark: axe-core's checks (WCAG 2.2 AA
// contrast among them) with no serious or critical violation; and the layouts that must fit.
import { createHash, randomBytes } from 'node:crypto'
import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { openBrowser, signInAs } from '../support/browser'
import type { BrowserSession } from '../support/browser'
import { closeTestDb, testDb } from '../support/server'

// Evaluated through the browser's debugging protocol (as a console would) rather than added as a script tag, which the
// pages' content security policy (scripts only with the page's nonce) would rightly block.
const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8')

interface AxeViolation { id: string, impact: string | null, help: string, nodes: { target: string[], failureSummary?: string }[] }

let teacher: BrowserSession
let student: BrowserSession
let anonymous: BrowserSession
let paths: { classId: number, attemptId: string, drillId: number, ownDrillId: number, setId: number, studentId: number, invitationToken: string }

beforeAll(async () => {
  const db = testDb()
  const noor = await db('users').where({ email: 'student@evenhand.test' }).first('id')
  const attempt = await db('attempts').where({ student_id: noor.id }).orderBy('created_at', 'desc').first('id', 'drill_id')
  const klass = await db('classes').where({ name: 'Tuesday Starters' }).first('id')
  const set = await db('drill_sets').orderBy('id').first('id')
  const own = await db('drills as d').join('users as u', 'u.id', 'd.owner_id').where('u.email', 'teacher@evenhand.test').orderBy('d.id').first('d.id')
  // An invitation waiting to be accepted, its link's token stored as its SHA-256 like the app stores it.
  const invitationToken = randomBytes(32).toString('base64url')
  const teacherRow = await db('users').where({ email: 'teacher@evenhand.test' }).first('id')
  const [invitationId] = await db('invitations').insert({ class_id: klass.id, email: `invited-look-${Date.now()}@evenhand.test`, invited_by: teacherRow.id, expires_at: new Date(Date.now() + 86_400_000) })
  await db('one_time_tokens').insert({ kind: 'invitation', token_hash: createHash('sha256').update(invitationToken).digest('hex'), subject: String(invitationId), expires_at: new Date(Date.now() + 86_400_000) })
  paths = { classId: Number(klass.id), attemptId: String(attempt.id), drillId: Number(attempt.drill_id), ownDrillId: Number(own.id), setId: Number(set.id), studentId: Number(noor.id), invitationToken }
  ;[teacher, student, anonymous] = await Promise.all([openBrowser(), openBrowser(), openBrowser()])
  await signInAs(teacher.page, 'teacher@evenhand.test')
  await teacher.page.waitForURL(/\/teacher$/)
  await signInAs(student.page, 'student@evenhand.test')
  await student.page.waitForURL(/\/student$/)
})
afterAll(async () => {
  await Promise.all([teacher, student, anonymous].map(b => b?.close()))
  await closeTestDb()
})

async function violations(page: Page): Promise<AxeViolation[]> {
  const devtools = await page.context().newCDPSession(page)
  await devtools.send('Runtime.evaluate', { expression: AXE_SOURCE })
  await devtools.detach()
  const found = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, o: object) => Promise<{ violations: AxeViolation[] }> } }).axe
    return (await axe.run(document, { resultTypes: ['violations'] })).violations
  })
  return found.filter(v => v.impact === 'serious' || v.impact === 'critical')
}

function describeViolations(found: AxeViolation[]): string[] {
  return found.flatMap(v => v.nodes.slice(0, 3).map(n => `${v.id}: ${n.target.join(' ')} — ${n.failureSummary?.split('\n')[1]?.trim() ?? v.help}`))
}

/** What Nuxt's `showError` does in the browser when a fault of ours reaches the top: error.vue takes the page. */
async function showServerFault(page: Page): Promise<void> {
  await page.evaluate(() => {
    const app = (document.querySelector('#__nuxt') as unknown as { __vue_app__: { $nuxt: { payload: { error: unknown } } } }).__vue_app__
    app.$nuxt.payload.error = { statusCode: 500, statusMessage: 'Server Error', message: 'Server Error' }
  })
  await page.getByRole('heading', { name: 'Something went wrong on our side' }).waitFor()
}

describe('every page passes axe-core in light and dark', () => {
  const pagesOf = (): [string, () => BrowserSession, string, ((page: Page) => Promise<void>)?][] => [
    ['sign-in', () => anonymous, '/login'],
    ['sign-up', () => anonymous, '/signup'],
    ['forgotten password', () => anonymous, '/forgot-password'],
    ['new password', () => anonymous, '/reset-password?token=x'],
    ['joining a class', () => anonymous, '/join'],
    ['an invitation', () => anonymous, `/invitation?token=${paths.invitationToken}`, async page => void await page.getByRole('button', { name: 'Join the class' }).waitFor()],
    ['an invitation that cannot be used', () => anonymous, '/invitation?token=not-a-real-token-but-long-enough', async page => void await page.getByTestId('invitation-problem').waitFor()],
    ['a missing page', () => student, '/no-such-page'],
    ['a fault of ours (500)', () => student, '/student', showServerFault],
    ['teacher home', () => teacher, '/teacher'],
    ['classes', () => teacher, '/teacher/classes'],
    ['a class', () => teacher, `/teacher/classes/${paths.classId}`],
    ['drill library', () => teacher, '/teacher/drills'],
    ['a drill', () => teacher, `/teacher/drills/${paths.drillId}`],
    ['drill editor', () => teacher, '/teacher/drills/new'],
    ['drill editor, editing', () => teacher, `/teacher/drills/new?edit=${paths.ownDrillId}`],
    ['a student, as the teacher', () => teacher, `/teacher/students/${paths.studentId}`],
    ['drill sets', () => teacher, '/teacher/sets'],
    ['a drill set', () => teacher, `/teacher/sets/${paths.setId}`],
    ['attempt, as the teacher', () => teacher, `/attempts/${paths.attemptId}`],
    ['practice, as the teacher', () => teacher, `/practice/${paths.drillId}`],
    ['settings, as the teacher', () => teacher, '/settings'],
    ['student home', () => student, '/student'],
    ['attempt, as the student', () => student, `/attempts/${paths.attemptId}`],
    ['practice, as the student', () => student, `/practice/${paths.drillId}`],
    ['settings, as the student', () => student, '/settings'],
  ]

  for (const scheme of ['light', 'dark'] as const) {
    it(`has no serious or critical violation on any page, ${scheme}`, async () => {
      const failures: string[] = []
      const checked: string[] = []
      for (const [name, who, path, then] of pagesOf()) {
        const { page } = who()
        await page.emulateMedia({ colorScheme: scheme })
        await page.goto(path, { waitUntil: 'networkidle' })
        await then?.(page)
        // The report's disclosure open too, so what it hides is checked as well.
        await page.locator('details').evaluateAll(all => all.forEach(d => d.setAttribute('open', '')))
        checked.push(name)
        failures.push(...describeViolations(await violations(page)).map(f => `${name}: ${f}`))
      }
      expect(checked).toHaveLength(26)
      expect(failures).toEqual([])
    }, 240_000)
  }
})

describe('layouts that fit', () => {
  it('keeps one long unbroken word in a comment inside the attempt page', async () => {
    const { page } = teacher
    await page.setViewportSize({ width: 1280, height: 800 })
    await page.goto(`/attempts/${paths.attemptId}`)
    const word = 'a'.repeat(4000)
    const status = await page.evaluate(async ([id, body]) => (await fetch(`/api/attempts/${id}/comments`, {
      method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ body }),
    })).status, [paths.attemptId, word] as const)
    expect(status).toBeLessThan(300)
    await page.reload()
    await page.getByText(word.slice(0, 50)).first().waitFor()
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(1280)
  })

  it('shows the drill, the keyboard, the start and the status in one laptop screen without scrolling', async () => {
    const { page } = student
    await page.setViewportSize({ width: 1280, height: 800 })
    await page.goto(`/practice/${paths.drillId}`)
    for (const id of ['note-strip', 'keyboard', 'start', 'phase']) {
      const box = (await page.getByTestId(id).boundingBox())!
      expect(box.y + box.height, id).toBeLessThanOrEqual(800)
    }
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(1280)
  })

  it('keeps the navigation on one row and the keyboard on screen on a phone held upright, and says to turn it', async () => {
    const { page } = student
    await page.setViewportSize({ width: 390, height: 844 })
    await page.goto(`/practice/${paths.drillId}`)
    const nav = (await page.getByRole('navigation', { name: 'Main' }).boundingBox())!
    expect(nav.height).toBeLessThan(70)
    const keys = (await page.getByTestId('keyboard').boundingBox())!
    expect(keys.y + keys.height).toBeLessThanOrEqual(844)
    expect(keys.x + keys.width).toBeLessThanOrEqual(390)
    await page.getByTestId('turn-hint').waitFor()
    // Turned sideways, the keyboard takes the width and the hint goes.
    await page.setViewportSize({ width: 844, height: 390 })
    await expect.poll(() => page.getByTestId('turn-hint').count()).toBe(0)
    expect((await page.getByTestId('keyboard').boundingBox())!.width).toBeGreaterThan(500)
    await page.setViewportSize({ width: 1280, height: 800 })
  })
})
