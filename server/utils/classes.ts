// Classes belong to one teacher; students join them by code or invitation.
import { randomInt } from 'node:crypto'
import type { Knex } from 'knex'
import { JOIN_CODE_ALPHABET } from '#shared/types/classes'
import type { InvitationStatus } from '#shared/types/classes'

type Db = Knex | Knex.Transaction

const JOIN_CODE_LENGTH = 8

/** 8 characters of a 31-letter alphabet: about 8.5·10^11 codes, so guessing one is hopeless and collisions rare. */
export function newJoinCode(): string {
  return Array.from({ length: JOIN_CODE_LENGTH }, () => JOIN_CODE_ALPHABET[randomInt(JOIN_CODE_ALPHABET.length)]).join('')
}

function isDuplicate(error: unknown): boolean {
  return (error as { code?: string }).code === 'ER_DUP_ENTRY'
}

/** Runs `write` with a fresh code until the unique index accepts one. */
async function withFreshCode<T>(write: (code: string) => Promise<T>): Promise<T> {
  for (let attempt = 0; ; attempt++) {
    try {
      return await write(newJoinCode())
    }
    catch (error) {
      if (!isDuplicate(error) || attempt >= 4) throw error
    }
  }
}

export async function createClass(db: Db, teacherId: number, name: string): Promise<{ id: number, joinCode: string }> {
  return withFreshCode(async (joinCode) => {
    const [id] = await db('classes').insert({ teacher_id: teacherId, name, join_code: joinCode })
    return { id: Number(id), joinCode }
  })
}

export async function regenerateJoinCode(db: Db, classId: number): Promise<string> {
  return withFreshCode(async (joinCode) => {
    await db('classes').where({ id: classId }).update({ join_code: joinCode })
    return joinCode
  })
}

export interface OwnClass {
  id: number
  name: string
  joinCode: string
  archived: boolean
}

/** The class when `teacherId` teaches it; a 404 otherwise, so another teacher's classes look like none at all. */
export async function ownClass(db: Db, teacherId: number, id: number): Promise<OwnClass> {
  const row = await db('classes').where({ id, teacher_id: teacherId }).first('id', 'name', 'join_code', 'archived_at')
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Class not found' })
  return { id: Number(row.id), name: row.name, joinCode: row.join_code, archived: row.archived_at !== null }
}

export interface RosterStudent {
  id: number
  name: string
  email: string
  joinedAt: string
  /** When the student last played anything, in any class; null if never. */
  lastPracticeAt: string | null
}

export interface InvitationView {
  id: number
  email: string
  status: InvitationStatus
  createdAt: string
  sentAt: string | null
  expiresAt: string
  acceptedAt: string | null
}

export function invitationStatus(row: { accepted_at: Date | null, revoked_at: Date | null, expires_at: Date }, now = Date.now()): InvitationStatus {
  if (row.accepted_at) return 'accepted'
  if (row.revoked_at) return 'revoked'
  return new Date(row.expires_at).getTime() <= now ? 'expired' : 'pending'
}

export interface ClassDetail extends OwnClass {
  students: RosterStudent[]
  invitations: InvitationView[]
}

const iso = (d: Date | null): string | null => d ? new Date(d).toISOString() : null

export async function classDetail(db: Knex, teacherId: number, id: number): Promise<ClassDetail> {
  const cls = await ownClass(db, teacherId, id)
  const [students, invitations] = await Promise.all([
    db('class_members as m').join('users as u', 'u.id', 'm.student_id').where('m.class_id', id).orderBy('u.name')
      .select('u.id', 'u.name', 'u.email', 'm.joined_at', db('attempts as a').whereRaw('a.student_id = u.id').max('a.started_at').as('last_practice')),
    db('invitations').where({ class_id: id }).orderBy([{ column: 'created_at', order: 'desc' }, { column: 'id', order: 'desc' }])
      .select('id', 'email', 'created_at', 'sent_at', 'expires_at', 'accepted_at', 'revoked_at'),
  ])
  return {
    ...cls,
    students: students.map(s => ({ id: Number(s.id), name: s.name, email: s.email, joinedAt: iso(s.joined_at)!, lastPracticeAt: iso(s.last_practice) })),
    invitations: invitations.map(i => ({
      id: Number(i.id), email: i.email, status: invitationStatus(i), createdAt: iso(i.created_at)!, sentAt: iso(i.sent_at), expiresAt: iso(i.expires_at)!, acceptedAt: iso(i.accepted_at),
    })),
  }
}

/** Adds the student to the class (nothing happens if they are in it already). */
export async function addMember(db: Db, classId: number, studentId: number): Promise<void> {
  await db('class_members').insert({ class_id: classId, student_id: studentId }).onConflict(['class_id', 'student_id']).ignore()
}

/** The open class with this join code, or a 404 a student understands. */
export async function classByCode(db: Db, code: string): Promise<{ id: number, name: string }> {
  const row = await db('classes').where({ join_code: code }).whereNull('archived_at').first('id', 'name')
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'code: No class has this code. Check it with your teacher.' })
  return { id: Number(row.id), name: row.name }
}
