// Every API route with a request that works for the caller it is meant for, and the status each of seven
// callers must get. tests/api/access-matrix.test.ts runs the table; tests/api/fuzz.test.ts sends hostile
// variants of the same requests. Both list the routes from the server/api file tree, so a route without a row
// here fails both. The statuses are written from the product rules (README, DEVELOPERS.md), not read off the code.
import { readdirSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { randomUUID } from 'node:crypto'
import { TEST_PASSWORD, makeAccount, type TestAccount } from './accounts'
import { attemptBody, type DrillReply } from './attempts'
import { Client, testDb } from './server'
import { publicDrillIds } from './studio'
import { EVENING_STUDY } from '../fixtures/drill-files'
import type { Role } from '../../shared/types/account'

/** The callers, in the order of every `expect` tuple below. */
export const CALLERS = ['anonymous', 'admin', 'owner', 'otherTeacher', 'ownStudent', 'classmate', 'otherStudent'] as const
export type Caller = typeof CALLERS[number]
type SignedIn = Exclude<Caller, 'anonymous'>

/** Statuses for anonymous, admin, owning teacher, another teacher, the resource's own student, a classmate, a student of another teacher. */
export type Statuses = readonly [number, number, number, number, number, number, number]

export interface RouteRequest {
  path: string
  body?: unknown
  upload?: { file: { name: string, bytes: string | Uint8Array }, fields?: Record<string, string> }
}

export interface RouteRow {
  /** A request the row's allowed callers can make; called again before every caller (fresh rows where the call consumes them). */
  request: (w: World) => RouteRequest | Promise<RouteRequest>
  expect: Statuses
  /** 'fresh': the call changes the caller's own cookie (sign-in, sign-out), so it runs in a new session of the caller;
   *  'ends': it also ends the caller's other sessions, so the caller signs in again afterwards. */
  session?: 'fresh' | 'ends'
  /** A text that a 2xx reply holds for exactly these callers (a list filtered by who may see what). */
  shows?: { text: (w: World) => string, to: readonly Caller[] }
}

const METHOD = /^(.*)\.(get|post|put|patch|delete)\.ts$/

/** `POST /api/attempts/[id]/comments` for every file under server/api; a file without a method answers `ANY`. */
export function apiRoutes(): string[] {
  const root = fileURLToPath(new URL('../../server/api', import.meta.url))
  return (readdirSync(root, { recursive: true }) as string[])
    .filter(file => file.endsWith('.ts'))
    .map((file) => {
      const [, name, method] = METHOD.exec(file) ?? [undefined, file.slice(0, -3), 'any']
      const path = `/api/${name!.replace(/\\/g, '/')}`.replace(/\/index$/, '')
      return `${method!.toUpperCase()} ${path}`
    })
    .sort()
}

export function methodOf(route: string): string {
  return route.split(' ')[0]!
}

interface Account extends TestAccount { role: Role }

/**
 * The studio every row plays in: the owning teacher's class holds the own student and a classmate; another teacher's
 * class holds the other student. The owner's private drill is in a set assigned to the own student alone, who played
 * it once; the owner invited someone to the class. Accounts use a domain outside the demo's, so the local mail box
 * is the admin's alone.
 */
export class World {
  private readonly clients = new Map<SignedIn, Client>()
  accounts = {} as Record<SignedIn, Account>
  classId = 0
  className = ''
  otherClassId = 0
  /** A class of a teacher who is none of the callers, for students to join. */
  openClassCode = ''
  drillId = 0
  drillTitle = ''
  /** The other teacher's private drill. */
  otherDrillId = 0
  /** A demo drill in the shared library, of a teacher who is none of the callers. */
  publicDrillId = 0
  setId = 0
  setTitle = ''
  assignmentId = 0
  attemptId = ''
  invitationId = 0
  /** The owner's comment on that attempt. */
  commentText = ''
  mailId = ''
  /** Someone every caller may sign in as. */
  loginEmail = ''
  private drill!: DrillReply
  /** The hash of TEST_PASSWORD every caller starts with. */
  private passwordHash = ''

  static async build(): Promise<World> {
    const w = new World()
    const tag = randomUUID().slice(0, 8)
    const make = async (role: Account['role']): Promise<Account> => ({ ...await makeAccount(role, `Matrix ${role}`, 'example.org'), role })
    const [admin, owner, otherTeacher, ownStudent, classmate, otherStudent, opener, login] = await Promise.all([
      make('admin'), make('teacher'), make('teacher'), make('student'), make('student'), make('student'), make('teacher'), make('student'),
    ])
    w.accounts = { admin, owner, otherTeacher, ownStudent, classmate, otherStudent }
    for (const [who, account] of Object.entries(w.accounts)) w.clients.set(who as SignedIn, account.client)
    w.loginEmail = login.email
    w.passwordHash = (await testDb()('users').where({ id: login.id }).first('password_hash')).password_hash

    w.className = `Matrix class ${tag}`
    const cls = await ok(owner.client.post<{ id: number, joinCode: string }>('/api/classes', { name: w.className }))
    w.classId = cls.id
    const other = await ok(otherTeacher.client.post<{ id: number, joinCode: string }>('/api/classes', { name: `Other class ${tag}` }))
    w.otherClassId = other.id
    w.openClassCode = (await ok(opener.client.post<{ joinCode: string }>('/api/classes', { name: `Open class ${tag}` }))).joinCode
    await ok(ownStudent.client.post('/api/classes/join', { code: cls.joinCode }))
    await ok(classmate.client.post('/api/classes/join', { code: cls.joinCode }))
    await ok(otherStudent.client.post('/api/classes/join', { code: other.joinCode }))

    w.drillTitle = `Matrix drill ${tag}`
    w.drillId = (await ok(owner.client.post<{ id: number }>('/api/drills', { ...DRILL, title: w.drillTitle }))).id
    w.otherDrillId = (await ok(otherTeacher.client.post<{ id: number }>('/api/drills', { ...DRILL, title: `Other drill ${tag}` }))).id
    w.publicDrillId = (await publicDrillIds())[0]!
    w.setTitle = `Matrix set ${tag}`
    w.setId = (await ok(owner.client.post<{ id: number }>('/api/drill-sets', { title: w.setTitle, items: [{ drillId: w.drillId }] }))).id
    w.assignmentId = await w.freshAssignment()
    w.drill = await ok(ownStudent.client.get<DrillReply>(`/api/drills/${w.drillId}`))
    w.attemptId = (await ok(ownStudent.client.post<{ attempt: { id: string } }>('/api/attempts', w.attemptInput()))).attempt.id
    w.commentText = `Matrix comment ${tag}`
    await ok(owner.client.post(`/api/attempts/${w.attemptId}/comments`, { body: w.commentText }))
    w.invitationId = await w.freshInvitation()
    w.mailId = await firstMail(admin.client)
    return w
  }

  /** The caller's signed-in client (none for anonymous). */
  client(caller: Caller): Client {
    if (caller === 'anonymous') return new Client()
    return this.clients.get(caller)!
  }

  async freshClient(caller: Caller): Promise<Client> {
    return caller === 'anonymous' ? new Client() : new Client().signIn(this.accounts[caller].email, TEST_PASSWORD)
  }

  /** After a call that ended every session of the caller, and may have changed the password (hostile input that was valid). */
  async renewClient(caller: Caller): Promise<void> {
    if (caller === 'anonymous') return
    await testDb()('users').where({ id: this.id(caller) }).update({ password_hash: this.passwordHash })
    this.clients.set(caller, await this.freshClient(caller))
  }

  id(caller: SignedIn): number {
    return this.accounts[caller].id
  }

  /** A new attempt at the owner's drill, as the own student's browser sends it. */
  attemptInput(): Record<string, unknown> {
    return attemptBody(this.drill)
  }

  /** The owner's set given to the own student, due in a week. */
  async freshAssignment(): Promise<number> {
    const dueOn = new Date(Date.now() + 7 * 86_400_000).toISOString().slice(0, 10)
    return (await ok(this.accounts.owner.client.post<{ id: number }>('/api/assignments', { drillSetId: this.setId, studentId: this.id('ownStudent'), dueOn, timeZone: 'UTC' }))).id
  }

  async freshInvitation(): Promise<number> {
    const res = await ok(this.accounts.owner.client.post<{ invitations: { id: number }[] }>(`/api/classes/${this.classId}/invitations`, { emails: [freshEmail('invited')] }))
    return res.invitations[0]!.id
  }

  /** A student who is a member of the owner's class and of nothing else, made straight in the database. */
  async freshMember(): Promise<number> {
    const id = await freshUser('student')
    await testDb()('class_members').insert({ class_id: this.classId, student_id: id })
    return id
  }
}

export function freshEmail(who: string): string {
  return `${who}-${randomUUID()}@example.org`
}

async function freshUser(role: Account['role']): Promise<number> {
  const [id] = await testDb()('users').insert({ email: freshEmail(role), name: `Spare ${role}`, role, password_hash: 'unused' })
  return Number(id)
}

async function ok<T>(reply: Promise<{ status: number, body: T }>): Promise<T> {
  const res = await reply
  if (res.status >= 300) throw new Error(`setting up the route table: ${res.status} ${JSON.stringify(res.body)}`)
  return res.body
}

/** The newest stored message, once the worker has sent the invitation made above. */
async function firstMail(admin: Client): Promise<string> {
  for (let i = 0; i < 100; i++) {
    const list = await ok(admin.get<{ messages: { id: string }[] }>('/api/dev/mail'))
    if (list.messages[0]) return list.messages[0].id
    await new Promise(resolve => setTimeout(resolve, 100))
  }
  throw new Error('no message reached the local mail box')
}

const DRILL = { hand: 'right', tempoBpm: 80, meter: '4/4', key: 'C major', level: 1, kind: 'scale', tags: ['matrix'], notation: 'C4/1 D4/2 E4/3 F4/1 | G4/2 A4/3 B4/4 C5/5' }
const dueIn = (days: number): string => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10)
/** Well-formed links that were never issued. */
const UNKNOWN_TOKEN = 'never-issued-token-0123456789abcdef'

// Product rules behind the common rows:
// - signed out: 401 everywhere but the open routes (sign-in, sign-up, the links e-mails carry, health);
// - a role a route is not for: 403 (admins run the studio's accounts and read every student; they do not teach);
// - a teacher's own row (class, set, assignment, invitation, private drill) looks missing to another teacher: 404;
// - a student's attempts: their own, their teachers' and the admin's; to any other student they look missing (404);
// - a student's progress and habits: 403 for anyone who is not the student, one of their teachers or the admin.
const ANY_SIGNED_IN = (ok: number): Statuses => [401, ok, ok, ok, ok, ok, ok]
const OPEN = (status: number): Statuses => [status, status, status, status, status, status, status]
const OWNER_ONLY = (ok: number): Statuses => [401, 403, ok, 404, 403, 403, 403]
const TEACHERS = (ok: number): Statuses => [401, 403, ok, ok, 403, 403, 403]
const STUDENTS = (ok: number): Statuses => [401, 403, 403, 403, ok, ok, ok]
const ADMIN_ONLY = (ok: number): Statuses => [401, ok, 403, 403, 403, 403, 403]
/** The own student's attempt or the owner's drill assigned to the own student alone. */
const STUDENT_RECORD = (ok: number): Statuses => [401, ok, ok, 404, ok, 404, 404]

export const ROUTES: Record<string, RouteRow> = {
  'GET /api/health': { request: () => ({ path: '/api/health' }), expect: OPEN(200) },

  // Signing in and out, and the links e-mails carry: open to all, whoever is signed in.
  'POST /api/auth/login': { request: w => ({ path: '/api/auth/login', body: { email: w.loginEmail, password: TEST_PASSWORD } }), expect: OPEN(200), session: 'fresh' },
  'POST /api/auth/logout': { request: () => ({ path: '/api/auth/logout' }), expect: OPEN(200), session: 'fresh' },
  'POST /api/auth/logout-everywhere': { request: () => ({ path: '/api/auth/logout-everywhere' }), expect: ANY_SIGNED_IN(200), session: 'ends' },
  'POST /api/auth/register': { request: () => ({ path: '/api/auth/register', body: { name: 'New Teacher', email: freshEmail('signup'), password: 'quiet-arpeggio-7' } }), expect: OPEN(201), session: 'fresh' },
  'POST /api/auth/forgot': { request: () => ({ path: '/api/auth/forgot', body: { email: freshEmail('forgot') } }), expect: OPEN(202) },
  'POST /api/auth/reset': { request: () => ({ path: '/api/auth/reset', body: { token: UNKNOWN_TOKEN, password: 'quiet-arpeggio-7' } }), expect: OPEN(404), session: 'fresh' },
  'POST /api/auth/confirm-email': { request: () => ({ path: '/api/auth/confirm-email', body: { token: UNKNOWN_TOKEN } }), expect: OPEN(404) },
  'POST /api/guardian/unsubscribe': { request: () => ({ path: '/api/guardian/unsubscribe', body: { token: UNKNOWN_TOKEN } }), expect: OPEN(404) },
  'GET /api/invitations/lookup': { request: () => ({ path: `/api/invitations/lookup?token=${UNKNOWN_TOKEN}` }), expect: OPEN(404) },
  'POST /api/invitations/accept': { request: () => ({ path: '/api/invitations/accept', body: { token: UNKNOWN_TOKEN, name: 'Someone', password: 'quiet-arpeggio-7' } }), expect: OPEN(404), session: 'fresh' },

  // One's own account.
  'GET /api/account': { request: () => ({ path: '/api/account' }), expect: ANY_SIGNED_IN(200) },
  'PATCH /api/account': { request: () => ({ path: '/api/account', body: { name: 'Matrix caller' } }), expect: ANY_SIGNED_IN(200) },
  'POST /api/account/email': { request: () => ({ path: '/api/account/email', body: { email: freshEmail('moved'), currentPassword: TEST_PASSWORD } }), expect: ANY_SIGNED_IN(202) },
  'POST /api/account/password': { request: () => ({ path: '/api/account/password', body: { currentPassword: TEST_PASSWORD, password: TEST_PASSWORD } }), expect: ANY_SIGNED_IN(200), session: 'ends' },
  'DELETE /api/admin/users/[id]/sessions': { request: async () => ({ path: `/api/admin/users/${await freshUser('student')}/sessions` }), expect: ADMIN_ONLY(200) },
  'GET /api/dev/mail': { request: () => ({ path: '/api/dev/mail' }), expect: ADMIN_ONLY(200) },
  'GET /api/dev/mail/[id]': { request: w => ({ path: `/api/dev/mail/${w.mailId}` }), expect: ADMIN_ONLY(200) },

  // Classes.
  'GET /api/classes': {
    request: () => ({ path: '/api/classes' }),
    expect: [401, 403, 200, 200, 200, 200, 200],
    shows: { text: w => w.className, to: ['owner', 'ownStudent', 'classmate'] },
  },
  'POST /api/classes': { request: () => ({ path: '/api/classes', body: { name: 'Another class' } }), expect: TEACHERS(201) },
  'POST /api/classes/join': { request: w => ({ path: '/api/classes/join', body: { code: w.openClassCode } }), expect: STUDENTS(200) },
  'GET /api/classes/[id]': { request: w => ({ path: `/api/classes/${w.classId}` }), expect: OWNER_ONLY(200) },
  'PATCH /api/classes/[id]': { request: w => ({ path: `/api/classes/${w.classId}`, body: { name: w.className } }), expect: OWNER_ONLY(200) },
  'POST /api/classes/[id]/invitations': { request: w => ({ path: `/api/classes/${w.classId}/invitations`, body: { emails: [freshEmail('invited')] } }), expect: OWNER_ONLY(201) },
  'POST /api/classes/[id]/join-code': { request: w => ({ path: `/api/classes/${w.classId}/join-code` }), expect: OWNER_ONLY(200) },
  'GET /api/classes/[id]/progress': { request: w => ({ path: `/api/classes/${w.classId}/progress` }), expect: OWNER_ONLY(200) },
  'GET /api/classes/[id]/progress.csv': { request: w => ({ path: `/api/classes/${w.classId}/progress.csv` }), expect: OWNER_ONLY(200) },
  'DELETE /api/classes/[id]/students/[studentId]': { request: async w => ({ path: `/api/classes/${w.classId}/students/${await w.freshMember()}` }), expect: OWNER_ONLY(204) },
  'DELETE /api/invitations/[id]': { request: async w => ({ path: `/api/invitations/${await w.freshInvitation()}` }), expect: OWNER_ONLY(204) },
  'POST /api/invitations/[id]/resend': { request: w => ({ path: `/api/invitations/${w.invitationId}/resend` }), expect: OWNER_ONLY(200) },

  // Drills and drill sets.
  'GET /api/drills': {
    request: () => ({ path: '/api/drills' }),
    expect: ANY_SIGNED_IN(200),
    // The admin's library is every drill, as the admin may open any.
    shows: { text: w => w.drillTitle, to: ['admin', 'owner', 'ownStudent'] },
  },
  'POST /api/drills': { request: () => ({ path: '/api/drills', body: { ...DRILL, title: 'Another drill' } }), expect: TEACHERS(201) },
  'POST /api/drills/import': { request: () => ({ path: '/api/drills/import', upload: { file: { name: 'study.musicxml', bytes: EVENING_STUDY } } }), expect: TEACHERS(200) },
  'GET /api/drills/[id]': { request: w => ({ path: `/api/drills/${w.drillId}` }), expect: STUDENT_RECORD(200) },
  'PATCH /api/drills/[id]': { request: w => ({ path: `/api/drills/${w.drillId}`, body: { description: 'Even quavers.' } }), expect: OWNER_ONLY(200) },
  'POST /api/drills/[id]/archive': { request: w => ({ path: `/api/drills/${w.drillId}/archive` }), expect: OWNER_ONLY(200) },
  'POST /api/drills/[id]/restore': { request: w => ({ path: `/api/drills/${w.drillId}/restore` }), expect: OWNER_ONLY(200) },
  'POST /api/drills/[id]/duplicate': { request: w => ({ path: `/api/drills/${w.drillId}/duplicate` }), expect: OWNER_ONLY(201) },
  'GET /api/drills/[id]/export.mid': { request: w => ({ path: `/api/drills/${w.drillId}/export.mid` }), expect: STUDENT_RECORD(200) },
  'GET /api/drills/[id]/export.musicxml': { request: w => ({ path: `/api/drills/${w.drillId}/export.musicxml` }), expect: STUDENT_RECORD(200) },
  'GET /api/drills/[id]/versions': { request: w => ({ path: `/api/drills/${w.drillId}/versions` }), expect: [401, 200, 200, 404, 403, 403, 403] },
  'GET /api/drill-sets': {
    request: () => ({ path: '/api/drill-sets' }),
    expect: TEACHERS(200),
    shows: { text: w => w.setTitle, to: ['owner'] },
  },
  'POST /api/drill-sets': { request: w => ({ path: '/api/drill-sets', body: { title: 'Another set', items: [{ drillId: w.publicDrillId, targetBpm: 70 }] } }), expect: TEACHERS(201) },
  'GET /api/drill-sets/[id]': { request: w => ({ path: `/api/drill-sets/${w.setId}` }), expect: OWNER_ONLY(200) },
  'PATCH /api/drill-sets/[id]': { request: w => ({ path: `/api/drill-sets/${w.setId}`, body: { title: w.setTitle } }), expect: OWNER_ONLY(200) },
  'POST /api/drill-sets/[id]/duplicate': { request: w => ({ path: `/api/drill-sets/${w.setId}/duplicate` }), expect: OWNER_ONLY(201) },

  // Assignments.
  'GET /api/assignments': {
    request: () => ({ path: '/api/assignments' }),
    expect: [401, 403, 200, 200, 200, 200, 200],
    shows: { text: w => w.setTitle, to: ['owner', 'ownStudent'] },
  },
  'POST /api/assignments': { request: w => ({ path: '/api/assignments', body: { drillSetId: w.setId, studentId: w.id('ownStudent'), dueOn: dueIn(3), timeZone: 'UTC' } }), expect: OWNER_ONLY(201) },
  'PATCH /api/assignments/[id]': { request: w => ({ path: `/api/assignments/${w.assignmentId}`, body: { note: 'Slowly first.' } }), expect: OWNER_ONLY(200) },
  'DELETE /api/assignments/[id]': { request: async w => ({ path: `/api/assignments/${await w.freshAssignment()}` }), expect: OWNER_ONLY(204) },
  'GET /api/me/assignments': {
    request: () => ({ path: '/api/me/assignments' }),
    expect: STUDENTS(200),
    shows: { text: w => w.setTitle, to: ['ownStudent'] },
  },

  // Attempts and comments.
  'GET /api/attempts': {
    request: () => ({ path: '/api/attempts' }),
    expect: ANY_SIGNED_IN(200),
    shows: { text: w => w.attemptId, to: ['admin', 'owner', 'ownStudent'] },
  },
  'POST /api/attempts': { request: w => ({ path: '/api/attempts', body: w.attemptInput() }), expect: [401, 403, 403, 403, 201, 404, 404] },
  'GET /api/attempts/[id]': { request: w => ({ path: `/api/attempts/${w.attemptId}` }), expect: STUDENT_RECORD(200) },
  'GET /api/attempts/[id]/export.mid': { request: w => ({ path: `/api/attempts/${w.attemptId}/export.mid` }), expect: STUDENT_RECORD(200) },
  'POST /api/attempts/[id]/comments': { request: w => ({ path: `/api/attempts/${w.attemptId}/comments`, body: { body: 'Lovely even quavers.' } }), expect: OWNER_ONLY(201) },
  'POST /api/attempts/[id]/comments/read': { request: w => ({ path: `/api/attempts/${w.attemptId}/comments/read` }), expect: [401, 403, 403, 403, 200, 404, 404] },
  'GET /api/me/comments': {
    request: () => ({ path: '/api/me/comments' }),
    expect: STUDENTS(200),
    shows: { text: w => w.commentText, to: ['ownStudent'] },
  },

  // One student's progress, habits and account, for their teacher.
  'GET /api/me/progress': {
    request: () => ({ path: '/api/me/progress' }),
    expect: STUDENTS(200),
    shows: { text: w => w.drillTitle, to: ['ownStudent'] },
  },
  'GET /api/students/[id]/progress': { request: w => ({ path: `/api/students/${w.id('ownStudent')}/progress` }), expect: [401, 200, 200, 403, 200, 403, 403] },
  'GET /api/students/[id]/attempts': { request: w => ({ path: `/api/students/${w.id('ownStudent')}/attempts` }), expect: [401, 200, 200, 403, 200, 403, 403] },
  'GET /api/students/[id]/habits': { request: w => ({ path: `/api/students/${w.id('ownStudent')}/habits` }), expect: [401, 200, 200, 403, 200, 403, 403] },
  'PUT /api/students/[id]/guardian': { request: w => ({ path: `/api/students/${w.id('ownStudent')}/guardian`, body: { guardianEmail: 'guardian@example.org' } }), expect: [401, 200, 200, 404, 403, 403, 403] },
  'POST /api/students/[id]/reset-link': { request: w => ({ path: `/api/students/${w.id('ownStudent')}/reset-link` }), expect: [401, 202, 202, 404, 403, 403, 403] },
}

/** Further cases of some routes, for the matrix only: other resources and targets than the row's own. */
export const MORE_CASES: { route: string, label: string, row: RouteRow }[] = [
  // The shared library: anyone signed in reads it, teachers copy from it, nobody but its author changes it.
  { route: 'GET /api/drills/[id]', label: 'a public drill', row: { request: w => ({ path: `/api/drills/${w.publicDrillId}` }), expect: ANY_SIGNED_IN(200) } },
  { route: 'PATCH /api/drills/[id]', label: 'a public drill of someone else', row: { request: w => ({ path: `/api/drills/${w.publicDrillId}`, body: { description: 'Mine now.' } }), expect: [401, 403, 403, 403, 403, 403, 403] } },
  { route: 'POST /api/drills/[id]/archive', label: 'a public drill of someone else', row: { request: w => ({ path: `/api/drills/${w.publicDrillId}/archive` }), expect: [401, 403, 403, 403, 403, 403, 403] } },
  { route: 'POST /api/drills/[id]/duplicate', label: 'a public drill', row: { request: w => ({ path: `/api/drills/${w.publicDrillId}/duplicate` }), expect: TEACHERS(201) } },
  { route: 'GET /api/drills/[id]/export.musicxml', label: 'a public drill', row: { request: w => ({ path: `/api/drills/${w.publicDrillId}/export.musicxml` }), expect: ANY_SIGNED_IN(200) } },
  // Another teacher's private drill is nobody else's to put in a set, to open or to play.
  { route: 'POST /api/drill-sets', label: 'with the other teacher\'s private drill', row: { request: w => ({ path: '/api/drill-sets', body: { title: 'Borrowed', items: [{ drillId: w.otherDrillId }] } }), expect: [401, 403, 400, 201, 403, 403, 403] } },
  { route: 'PATCH /api/drill-sets/[id]', label: 'adding the other teacher\'s private drill', row: { request: w => ({ path: `/api/drill-sets/${w.setId}`, body: { items: [{ drillId: w.drillId }, { drillId: w.otherDrillId }] } }), expect: [401, 403, 400, 404, 403, 403, 403] } },
  { route: 'GET /api/drills/[id]', label: 'the other teacher\'s private drill', row: { request: w => ({ path: `/api/drills/${w.otherDrillId}` }), expect: [401, 200, 404, 200, 404, 404, 404] } },
  { route: 'POST /api/attempts', label: 'at the other teacher\'s private drill', row: { request: w => ({ path: '/api/attempts', body: { ...w.attemptInput(), drillId: w.otherDrillId, drillVersion: 1, assignmentId: null } }), expect: [401, 403, 403, 403, 404, 404, 404] } },
  // A teacher gives work only to their own classes and students.
  { route: 'POST /api/assignments', label: 'to the other teacher\'s class', row: { request: w => ({ path: '/api/assignments', body: { drillSetId: w.setId, classId: w.otherClassId, dueOn: dueIn(3) } }), expect: [401, 403, 404, 404, 403, 403, 403] } },
  { route: 'POST /api/assignments', label: 'to the other teacher\'s student', row: { request: w => ({ path: '/api/assignments', body: { drillSetId: w.setId, studentId: w.id('otherStudent'), dueOn: dueIn(3) } }), expect: [401, 403, 404, 404, 403, 403, 403] } },
  { route: 'DELETE /api/classes/[id]/students/[studentId]', label: 'a student of another class', row: { request: w => ({ path: `/api/classes/${w.classId}/students/${w.id('otherStudent')}` }), expect: [401, 403, 404, 404, 403, 403, 403] } },
  // One student's attempts, asked for by id: a student sees only their own, a teacher only their students'.
  {
    route: 'GET /api/attempts',
    label: 'of the own student',
    row: {
      request: w => ({ path: `/api/attempts?student=${w.id('ownStudent')}` }),
      expect: [401, 200, 200, 200, 200, 403, 403],
      shows: { text: w => w.attemptId, to: ['admin', 'owner', 'ownStudent'] },
    },
  },
  { route: 'GET /api/students/[id]/progress', label: 'of a student of another teacher', row: { request: w => ({ path: `/api/students/${w.id('otherStudent')}/progress` }), expect: [401, 200, 403, 200, 403, 403, 200] } },
]

/** Sends a row's request as `client`. */
export function send(client: Client, route: string, req: RouteRequest): Promise<{ status: number, body: unknown }> {
  if (req.upload) return client.upload(req.path, req.upload.file, req.upload.fields)
  return client.request(methodOf(route), req.path, req.body)
}
