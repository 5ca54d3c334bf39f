// The teacher's hand-out loop in chromium: a class, an invitation read back from the local SMTP server,
// the student joining through its link, an assigned set played on the fake MIDI keyboard, and the
// attempt in the teacher's class table.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DrillNote } from '../../shared/types/drill'
import { openBrowser, signUpTeacher } from '../support/browser'
import type { BrowserSession } from '../support/browser'
import { fakeMidiScript } from '../support/fake-midi'
import { linkIn, waitForMail } from '../support/mail'
import { playDrill } from '../support/practice'
import { closeTestDb, testDb } from '../support/server'
import { uniqueEmail } from '../support/studio'

let teacher: BrowserSession
let student: BrowserSession
let drill: { id: number, title: string, notes: DrillNote[] }

beforeAll(async () => {
  const row = await testDb()('drills').where({ title: 'Five-finger pattern in C, right hand', is_public: true }).first('id', 'title', 'notes')
  drill = { id: Number(row.id), title: row.title, notes: typeof row.notes === 'string' ? JSON.parse(row.notes) : row.notes }
  teacher = await openBrowser()
  student = await openBrowser({ initScript: fakeMidiScript })
})
afterAll(async () => {
  await teacher?.close()
  await student?.close()
  await closeTestDb()
})

describe('handing out a drill set', () => {
  it('goes from a new class to the student\'s attempt in the teacher\'s table', async () => {
    const t = teacher.page
    const studentEmail = uniqueEmail('pupil')

    // A new teacher opens a studio and makes a drill set from the shared library.
    await signUpTeacher(t, 'Ilse Kovač')
    await t.getByRole('link', { name: 'Drill sets' }).first().click()
    await t.getByLabel('New drill set').fill('First week')
    await t.getByRole('button', { name: 'Create and add drills' }).click()
    await t.waitForURL(/\/teacher\/sets\/\d+$/)
    await t.locator('#add-drill').selectOption({ label: `${drill.title} (shared)` })
    await t.getByRole('button', { name: 'Add to set' }).click()
    await t.getByLabel(`Target tempo for ${drill.title}`).fill('80')
    await t.getByTestId('save-set').click()
    await t.getByTestId('save-state').filter({ hasText: 'All changes saved' }).waitFor()

    // A class, and an invitation to the student.
    await t.getByRole('link', { name: 'Classes' }).first().click()
    await t.getByLabel('New class').fill('Friday pairs')
    await t.getByRole('button', { name: 'Create class' }).click()
    await t.waitForURL(/\/teacher\/classes\/\d+$/)
    const classId = Number(t.url().split('/').pop())
    await t.getByLabel('Invite by e-mail').fill(studentEmail)
    await t.getByRole('button', { name: 'Send invitation' }).click()
    await t.getByRole('status').filter({ hasText: `Sent to ${studentEmail}` }).waitFor()
    await t.getByTestId('invitation-row').filter({ hasText: studentEmail }).getByText('waiting').waitFor()

    // The student follows the e-mailed link and makes an account.
    const [mail] = await waitForMail(studentEmail)
    const link = linkIn(mail!, '/invitation')
    const s = student.page
    await s.goto(link.pathname + link.search)
    await s.getByRole('heading', { name: 'Join Friday pairs' }).waitFor()
    expect(await s.getByTestId('fixed-email').textContent()).toContain(studentEmail)
    await s.getByLabel('Your name').fill('Tomasz Reyes')
    await s.getByLabel('Password').fill('long-enough-1')
    await s.getByRole('button', { name: 'Join the class' }).click()
    await s.waitForURL(/\/student$/)
    await s.getByText('Nothing assigned yet.').waitFor()

    // The teacher sees the student in the roster and assigns the set to the class.
    await t.reload()
    await t.getByTestId('roster').getByText('Tomasz Reyes').waitFor()
    await t.getByTestId('invitation-row').filter({ hasText: studentEmail }).getByText('joined').waitFor()
    await t.locator('#assign-set').selectOption({ label: 'First week' })
    const due = new Date(Date.now() + 3 * 86_400_000).toISOString().slice(0, 10)
    await t.locator('#assign-due').fill(due)
    await t.getByLabel('Note for the students (optional)').fill('Slowly, and keep the wrist level.')
    await t.getByRole('button', { name: 'Assign' }).click()
    await t.getByTestId('assignment-row').filter({ hasText: 'First week' }).waitFor()

    // The student's home shows it at once; the student plays it from there.
    await s.reload()
    const card = s.getByTestId('assignment-card').filter({ hasText: 'First week' })
    await card.getByText('Slowly, and keep the wrist level.').waitFor()
    const href = await card.getByRole('link', { name: 'Practise' }).getAttribute('href')
    expect(href).toMatch(new RegExp(`^/practice/${drill.id}\\?assignment=\\d+$`))
    await playDrill(s, drill, href!.slice(href!.indexOf('?')))
    await s.getByTestId('save-state').filter({ hasText: 'saved' }).waitFor()
    const shown = Number(await s.getByTestId('attempt-score').textContent())

    // The teacher's class table has the attempt in the student's row.
    await t.goto(`/teacher/classes/${classId}`)
    const row = t.getByTestId('progress-table').getByRole('row').filter({ hasText: 'Tomasz Reyes' })
    await row.getByText(`best ${shown}`).waitFor()
    expect(await row.getByText('not played').count()).toBe(0)
  })
})
