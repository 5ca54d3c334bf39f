// Invitations by e-mail: a one-time link (kind "invitation" in one_time_tokens, subject = the invitation's id)
// that lets the invited person make an account, or sign in to theirs, and land in the class.
import type { Knex } from 'knex'
import { Password } from '#shared/types/account'
import type { InvitationAccept } from '#shared/types/classes'

type Db = Knex | Knex.Transaction

export const INVITATION_TTL_MS = 7 * DAY_MS

const MESSAGES = {
  unknown: 'This invitation link is not valid. Check that the whole link was copied, or ask your teacher to send a new one.',
  expired: 'This invitation has expired: links work for 7 days. Ask your teacher to send you a new one.',
  used: 'This invitation has already been used. Sign in with your e-mail and password.',
}
const WITHDRAWN = 'Your teacher has withdrawn this invitation. Ask them if you think this is a mistake.'
const CLOSED = 'This class is closed. Ask your teacher which class to join instead.'

function gone(message: string): Error {
  return createError({ statusCode: 410, statusMessage: 'Gone', message })
}

interface InvitationRow { id: number, class_id: number, email: string, accepted_at: Date | null, revoked_at: Date | null, expires_at: Date, class_name: string, archived_at: Date | null, teacher_name: string }

function invitationQuery(db: Db): Knex.QueryBuilder {
  return db('invitations as i').join('classes as c', 'c.id', 'i.class_id').join('users as t', 't.id', 'c.teacher_id')
    .select('i.id', 'i.class_id', 'i.email', 'i.accepted_at', 'i.revoked_at', 'i.expires_at', 'c.name as class_name', 'c.archived_at', 't.name as teacher_name')
}

/** A fresh link for the invitation, older links retired, the e-mail queued in the caller's transaction. */
async function sendInvitation(trx: Knex.Transaction, invitation: { id: number, email: string, className: string, teacherName: string }): Promise<void> {
  await trx('one_time_tokens').where({ kind: 'invitation', subject: String(invitation.id) }).whereNull('used_at').update({ used_at: new Date() })
  const token = await issueToken(trx, { kind: 'invitation', subject: String(invitation.id), ttlMs: INVITATION_TTL_MS })
  const expiresAt = new Date(Date.now() + INVITATION_TTL_MS)
  await trx('invitations').where({ id: invitation.id }).update({ expires_at: expiresAt, sent_at: new Date(), revoked_at: null })
  await queueMail(trx, {
    to: invitation.email,
    template: 'invitation',
    data: { className: invitation.className, teacherName: invitation.teacherName, link: appLink('/invitation', token), expiresAt: expiresAt.toISOString() },
  })
}

/**
 * Invites each address to the class: a new invitation, or a fresh link for one still open.
 * An address already in the class is a 409 and nothing is sent to anyone.
 */
export async function inviteToClass(db: Knex, teacher: { id: number, name: string }, classId: number, emails: string[]): Promise<number[]> {
  const unique = [...new Set(emails)]
  return db.transaction(async (trx) => {
    const cls = await ownClass(trx, teacher.id, classId)
    if (cls.archived) throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'This class is archived: bring it back before inviting' })
    const members: string[] = await trx('class_members as m').join('users as u', 'u.id', 'm.student_id')
      .where('m.class_id', classId).whereIn('u.email', unique).pluck('u.email')
    if (members.length) {
      throw createError({ statusCode: 409, statusMessage: 'Conflict', message: `emails: Already in this class: ${members.join(', ')}` })
    }
    const ids: number[] = []
    for (const email of unique) {
      const open = await trx('invitations').where({ class_id: classId, email }).whereNull('accepted_at').orderBy('id', 'desc').first('id')
      const id = open ? Number(open.id) : Number((await trx('invitations').insert({ class_id: classId, email, invited_by: teacher.id, expires_at: new Date(Date.now() + INVITATION_TTL_MS) }))[0])
      await sendInvitation(trx, { id, email, className: cls.name, teacherName: teacher.name })
      ids.push(id)
    }
    return ids
  })
}

async function ownInvitation(trx: Db, teacherId: number, id: number): Promise<InvitationRow> {
  const row: InvitationRow | undefined = await invitationQuery(trx).where({ 'i.id': id, 'c.teacher_id': teacherId }).first()
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not found', message: 'Invitation not found' })
  return row
}

/** A new link with a new 7 days, for an invitation not yet accepted (a withdrawn one opens again). */
export async function resendInvitation(db: Knex, teacherId: number, id: number): Promise<void> {
  await db.transaction(async (trx) => {
    const row = await ownInvitation(trx, teacherId, id)
    if (row.accepted_at) throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'This invitation was already accepted' })
    if (row.archived_at) throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'This class is archived: bring it back before inviting' })
    await sendInvitation(trx, { id: Number(row.id), email: row.email, className: row.class_name, teacherName: row.teacher_name })
  })
}

export async function revokeInvitation(db: Knex, teacherId: number, id: number): Promise<void> {
  await db.transaction(async (trx) => {
    const row = await ownInvitation(trx, teacherId, id)
    if (row.accepted_at) throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'This invitation was already accepted; remove the student from the class instead' })
    await trx('invitations').where({ id }).update({ revoked_at: new Date() })
  })
}

/** The invitation a link belongs to, while it can still be accepted; a 404 or 410 in words a student understands otherwise. */
async function openInvitation(db: Db, token: string): Promise<InvitationRow> {
  const found = await findToken(db, 'invitation', token)
  if (!found) throw createError({ statusCode: 404, statusMessage: 'Not found', message: MESSAGES.unknown })
  const row: InvitationRow | undefined = await invitationQuery(db).where('i.id', Number(found.subject)).first()
  if (!row) throw createError({ statusCode: 404, statusMessage: 'Not found', message: MESSAGES.unknown })
  if (row.accepted_at || found.usedAt) throw gone(row.accepted_at ? MESSAGES.used : MESSAGES.expired)
  if (row.revoked_at) throw gone(WITHDRAWN)
  if (row.archived_at) throw gone(CLOSED)
  if (found.expiresAt.getTime() <= Date.now()) throw gone(MESSAGES.expired)
  return row
}

export interface InvitationPreview {
  className: string
  teacherName: string
  email: string
  /** Whether the address already has an account: the page then asks only for its password. */
  hasAccount: boolean
}

export async function previewInvitation(db: Knex, token: string): Promise<InvitationPreview> {
  const row = await openInvitation(db, token)
  const user = await db('users').where({ email: row.email }).first('id')
  return { className: row.class_name, teacherName: row.teacher_name, email: row.email, hasAccount: Boolean(user) }
}

/** Accepts the invitation: a new student account, or the existing one after its password; either way into the class. */
export async function acceptInvitation(db: Knex, input: InvitationAccept): Promise<{ user: { id: number, email: string, name: string, role: 'student' }, classId: number }> {
  return db.transaction(async (trx) => {
    const invitation = await openInvitation(trx, input.token)
    const existing = await trx('users').where({ email: invitation.email }).forUpdate().first('id', 'name', 'role', 'password_hash')
    let user: { id: number, email: string, name: string, role: 'student' }
    if (existing) {
      if (existing.role !== 'student') {
        throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'This e-mail belongs to a teacher account. Ask your teacher to invite the address you practise with.' })
      }
      if (!existing.password_hash || !(await verifyPassword(existing.password_hash, input.password))) {
        throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'password: Wrong password for this e-mail' })
      }
      user = { id: Number(existing.id), email: invitation.email, name: existing.name, role: 'student' }
    }
    else {
      if (!input.name) throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: 'name: Enter your name', data: { issues: [{ path: 'name', message: 'Enter your name' }] } })
      const strong = Password.safeParse(input.password)
      if (!strong.success) {
        const message = strong.error.issues[0]!.message
        throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: `password: ${message}`, data: { issues: [{ path: 'password', message }] } })
      }
      requireGoodPassword(input.password, invitation.email)
      const id = await insertUser(trx, { email: invitation.email, name: input.name, passwordHash: await hashPassword(input.password), role: 'student' })
      user = { id, email: invitation.email, name: input.name, role: 'student' }
    }
    // Marks the link used in this same transaction: two clicks at once cannot both get in.
    await redeemToken(trx, 'invitation', input.token, MESSAGES)
    await addMember(trx, Number(invitation.class_id), user.id)
    await trx('invitations').where({ id: invitation.id }).update({ accepted_at: new Date(), accepted_by: user.id })
    return { user, classId: Number(invitation.class_id) }
  })
}
