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
let paths: { studyId: number, classId: number, attemptId: string, drillId: number, ownDrillId: number, setId: number, studentId: number, invitationToken: string }

beforeAll(async () => {
  const db = testDb()
  const noor = await db('users').where({ email: 'student@evenhand.test' }).first('id')
  const attempt = await db('attempts').where({ student_id: noor.id }).orderBy('created_at', 'desc').first('id', 'drill_id')
  const klass = await db('classes').where({ name: 'Tuesday Starters' }).first('id')
  const set = await db('drill_sets').orderBy('id').first('id')
  // The demo's longest both-hands drill: a passage with a hand mark and often a shift mark on every card.
  const study = await db('drills').where({ title: 'Harbour Lights (study), hands together' }).first('id')
  const own = await db('drills as d').join('users as u', 'u.id', 'd.owner_id').where('u.email', 'teacher@evenhand.test').orderBy('d.id').first('d.id')
  // An invitation waiting to be accepted, its link's token stored as its SHA-256 like the app stores it.
  const invitationToken = randomBytes(32).toString('base64url')
  const teacherRow = await db('users').where({ email: 'teacher@evenhand.test' }).first('id')
  const [invitationId] = await db('invitations').insert({ class_id: klass.id, email: `invited-look-${Date.now()}@evenhand.test`, invited_by: teacherRow.id, expires_at: new Date(Date.now() + 86_400_000) })
  await db('one_time_tokens').insert({ kind: 'invitation', token_hash: createHash('sha256').update(invitationToken).digest('hex'), subject: String(invitationId), expires_at: new Date(Date.now() + 86_400_000) })
  paths = { studyId: Number(study.id), classId: Number(klass.id), attemptId: String(attempt.id), drillId: Number(attempt.drill_id), ownDrillId: Number(own.id), setId: Number(set.id), studentId: Number(noor.id), invitationToken }
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

  it('fits the drill, the keyboard and the start on a phone held sideways without scrolling', async () => {
    const { page } = student
    await page.setViewportSize({ width: 844, height: 390 })
    // The latest attempt's drill and a both-hands passage, whose note cards (two notes, hands and shift marks each)
    // run far past the screen inside the strip.
    for (const drillId of [paths.drillId, paths.studyId]) {
      await page.goto(`/practice/${drillId}`)
      await page.getByTestId('keyboard').waitFor()
      for (const id of ['note-strip', 'keyboard', 'start']) {
        const box = (await page.getByTestId(id).boundingBox())!
        expect(box.y, `${drillId} ${id}`).toBeGreaterThanOrEqual(0)
        expect(box.y + box.height, `${drillId} ${id}`).toBeLessThanOrEqual(390)
      }
      // The keys still take the width: white keys a finger wide, not a thumbnail.
      expect((await page.getByTestId('keyboard').boundingBox())!.width).toBeGreaterThan(500)
      if (drillId === paths.studyId) expect(await page.getByTestId('note-strip').evaluate(el => el.scrollWidth), 'the strip holds more than a screen').toBeGreaterThan(844)
      expect(await page.evaluate(() => document.documentElement.scrollWidth), `drill ${drillId}`).toBeLessThanOrEqual(844)
      expect(await page.getByRole('complementary', { name: 'Practise safely' }).isVisible()).toBe(true)
    }
    await page.setViewportSize({ width: 1280, height: 800 })
  })

  it('draws the computer-key map on a phone with no keycap over another and every label inside its cap', async () => {
    const { page } = student
    await page.setViewportSize({ width: 390, height: 844 })
    await page.goto(`/practice/${paths.drillId}`)
    // The input is a setting kept in the browser: it is put back as it was, even when it was a MIDI keyboard
    // that is not connected here (whose option the menu shows but rightly does not offer).
    const before = await page.locator('#play-with').inputValue()
    const saved = await page.evaluate(() => localStorage.getItem('evenhand.practice-settings'))
    await page.locator('#play-with').selectOption({ label: 'The computer keys' })
    await page.getByTestId('key-map').scrollIntoViewIfNeeded()
    const caps = await page.getByTestId('key-map').locator('.cap').evaluateAll(all => all.map((el) => {
      const r = el.getBoundingClientRect()
      const inner = [...el.children].map(c => c.getBoundingClientRect())
      return { label: el.textContent!.trim(), box: { x: r.x, y: r.y, w: r.width, h: r.height }, inner: inner.map(c => ({ x: c.x, y: c.y, w: c.width, h: c.height })) }
    }))
    // Every row of the US keyboard, the mapped keys and the two octave keys.
    expect(caps.length).toBeGreaterThanOrEqual(23)
    type Box = { x: number, y: number, w: number, h: number }
    const overlap = (a: Box, b: Box): number => Math.max(0, Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x)) * Math.max(0, Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y))
    const crossing: string[] = []
    caps.forEach((a, i) => caps.slice(i + 1).forEach((b) => {
      if (overlap(a.box, b.box) > 0) crossing.push(`${a.label} × ${b.label}`)
    }))
    expect(crossing).toEqual([])
    const spilling = caps.filter(c => c.inner.some(t => t.x < c.box.x - 0.5 || t.y < c.box.y - 0.5 || t.x + t.w > c.box.x + c.box.w + 0.5 || t.y + t.h > c.box.y + c.box.h + 0.5)
      || (c.inner.length === 2 && overlap(c.inner[0]!, c.inner[1]!) > 0))
    expect(spilling.map(c => c.label)).toEqual([])
    const map = (await page.getByTestId('key-map').boundingBox())!
    expect(map.x).toBeGreaterThanOrEqual(0)
    expect(map.x + map.width).toBeLessThanOrEqual(390)
    await page.evaluate(value => value === null ? localStorage.removeItem('evenhand.practice-settings') : localStorage.setItem('evenhand.practice-settings', value), saved)
    await page.reload()
    await expect.poll(() => page.locator('#play-with').inputValue()).toBe(before)
    expect(await page.getByTestId('key-map').count()).toBe(before === 'computer-keys' ? 1 : 0)
    await page.setViewportSize({ width: 1280, height: 800 })
  })
})
