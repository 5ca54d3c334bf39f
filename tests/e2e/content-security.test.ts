// Every page under the content security policy, in chromium: any refused script, style, font, sample,
// worker or connection shows as a console message and a securitypolicyviolation event, and fails the test.
import { readdirSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { openBrowser, openStudentWithFakeMidi, signInAs } from '../support/browser'
import type { BrowserSession } from '../support/browser'
import { closeTestDb, testDb } from '../support/server'
import { playDrill } from '../support/practice'
import type { DrillNote } from '../../shared/types/drill'

afterAll(closeTestDb)

// Reported through a binding rather than read back with page.evaluate, which chromium counts as an eval.
const RECORD_VIOLATIONS = `document.addEventListener('securitypolicyviolation',
  e => window.__reportCsp(e.violatedDirective + ' ' + e.blockedURI + ' at ' + e.sourceFile + ':' + e.lineNumber));`
const violations: string[] = []

function pageFiles(dir = 'pages'): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name)
    return statSync(path).isDirectory() ? pageFiles(path) : [relative('pages', path).replace(/\.vue$/, '')]
  }).sort()
}

type Visit = (page: Page) => Promise<void>
interface PageCase { who: 'anonymous' | 'teacher' | 'student', visit: Visit }

async function id(query: Promise<{ id: unknown } | undefined>): Promise<string> {
  return String((await query)!.id)
}

const goto = (path: () => Promise<string> | string): Visit => async (page) => {
  await page.goto(await path())
  await page.waitForLoadState('networkidle')
}

/** One entry per file under pages/: a page added without one fails the first test. */
const PAGES: Record<string, PageCase> = {
  'index': { who: 'anonymous', visit: goto(() => '/') },
  'login': { who: 'anonymous', visit: goto(() => '/login') },
  'signup': { who: 'anonymous', visit: goto(() => '/signup') },
  'forgot-password': { who: 'anonymous', visit: goto(() => '/forgot-password') },
  'reset-password': { who: 'anonymous', visit: goto(() => '/reset-password?token=not-a-real-token') },
  'invitation': { who: 'anonymous', visit: goto(() => '/invitation?token=not-a-real-token-but-long-enough') },
  'join': { who: 'anonymous', visit: goto(() => '/join?code=TUE4KQ') },
  'teacher/index': { who: 'teacher', visit: goto(() => '/teacher') },
  'confirm-email': { who: 'anonymous', visit: goto(() => '/confirm-email?token=not-a-real-token') },
  'unsubscribe': { who: 'anonymous', visit: goto(() => '/unsubscribe?token=not-a-real-token') },
  'dev/mail/index': { who: 'teacher', visit: goto(() => '/dev/mail') },
  // The newest stored message when the run has sent any (the API tests do), else a missing one.
  'dev/mail/[id]': {
    who: 'teacher',
    visit: async (page) => {
      await goto(() => '/dev/mail')(page)
      const first = page.locator('a[href^="/dev/mail/"]').first()
      await goto(async () => (await first.count()) ? (await first.getAttribute('href'))! : '/dev/mail/none')(page)
    },
  },
  'teacher/drills/index': { who: 'teacher', visit: goto(() => '/teacher/drills') },
  // The staff is engraved here, so VexFlow and its music font load under the policy.
  'teacher/drills/[id]': { who: 'teacher', visit: goto(async () => `/teacher/drills/${await id(testDb()('drills').where({ title: 'C major scale, right hand' }).first('id'))}`) },
  'teacher/drills/new': { who: 'teacher', visit: goto(() => '/teacher/drills/new') },
  'teacher/classes/index': { who: 'teacher', visit: goto(() => '/teacher/classes') },
  'teacher/sets/index': { who: 'teacher', visit: goto(() => '/teacher/sets') },
  'teacher/sets/[id]': { who: 'teacher', visit: goto(async () => `/teacher/sets/${await id(testDb()('drill_sets').where({ title: 'First steps: five fingers and C' }).first('id'))}`) },
  'teacher/classes/[id]': { who: 'teacher', visit: goto(async () => `/teacher/classes/${await id(testDb()('classes').where({ name: 'Tuesday Starters' }).first('id'))}`) },
  'attempts/[id]': { who: 'teacher', visit: goto(async () => `/attempts/${await id(testDb()('attempts').orderBy('started_at', 'desc').first('id'))}`) },
  'student/index': { who: 'student', visit: goto(() => '/student') },
  // Scrolled to the last chart, so chart.js's lazily loaded chunk and every canvas run under the policy.
  'student/drills/[id]': {
    who: 'student',
    visit: async (page) => {
      const drill = await testDb()('attempts as a').join('users as u', 'u.id', 'a.student_id').where('u.email', 'student@evenhand.test').first('a.drill_id as id')
      await goto(() => `/student/drills/${drill.id}`)(page)
      await page.getByRole('region', { name: 'Tempo reached' }).scrollIntoViewIfNeeded()
      await page.getByRole('region', { name: 'Tempo reached' }).locator('canvas').waitFor()
    },
  },
  'student/habits': { who: 'student', visit: goto(() => '/student/habits') },
  'teacher/students/[id]/index': { who: 'teacher', visit: goto(async () => `/teacher/students/${await id(testDb()('users').where({ email: 'student@evenhand.test' }).first('id'))}`) },
  'teacher/students/[id]/drills/[drillId]': {
    who: 'teacher',
    visit: goto(async () => {
      const a = await testDb()('attempts as a').join('users as u', 'u.id', 'a.student_id').where('u.email', 'student@evenhand.test').first('a.student_id', 'a.drill_id')
      return `/teacher/students/${a.student_id}/drills/${a.drill_id}`
    }),
  },
  'settings': { who: 'student', visit: goto(() => '/settings') },
  // Played through, so the samples, the metronome's worker and the save all run under the policy.
  'practice/[id]': {
    who: 'student',
    visit: async (page) => {
      const row = await testDb()('drills').where({ title: 'C major scale, right hand' }).first('id', 'notes')
      const notes = (typeof row.notes === 'string' ? JSON.parse(row.notes) : row.notes) as DrillNote[]
      await playDrill(page, { id: Number(row.id), notes })
    },
  },
}

const sessions = new Map<PageCase['who'], BrowserSession>()
async function sessionFor(who: PageCase['who']): Promise<BrowserSession> {
  if (!sessions.has(who)) {
    const session = who === 'student' ? await openStudentWithFakeMidi([RECORD_VIOLATIONS]) : await openBrowser({ initScript: RECORD_VIOLATIONS })
    if (who === 'teacher') {
      await signInAs(session.page, 'teacher@evenhand.test')
      await session.page.waitForURL(/\/teacher$/)
    }
    await session.context.exposeBinding('__reportCsp', (_source, text: string) => void violations.push(text))
    sessions.set(who, session)
  }
  return sessions.get(who)!
}
afterAll(async () => {
  for (const s of sessions.values()) await s.close()
})

describe('content security policy', () => {
  it('has a case for every page', () => {
    expect(pageFiles()).toEqual(Object.keys(PAGES).sort())
  })

  it.each(Object.entries(PAGES))('loads %s without a policy violation', async (_, { who, visit }) => {
    const { page } = await sessionFor(who)
    const messages: string[] = []
    const listen = (m: { text: () => string }): void => {
      if (/Content Security Policy|Refused to/i.test(m.text())) messages.push(m.text())
    }
    page.on('console', listen)
    violations.length = 0
    try {
      await visit(page)
      expect(await page.locator('script').count()).toBeGreaterThan(0)
      expect({ violations, messages }).toEqual({ violations: [], messages: [] })
    }
    finally {
      page.off('console', listen)
    }
  })
})
