import { z } from 'zod'
import { Email, LinkToken, RegisterInput, Role } from './account'

export const ClassName = z.string().trim().min(1, { error: 'Give the class a name' }).max(120, { error: 'At most 120 characters' })

export const ClassInput = z.object({ name: ClassName })
export type ClassInput = z.infer<typeof ClassInput>

export const ClassPatch = z.object({ name: ClassName.optional(), archived: z.boolean().optional() })
export type ClassPatch = z.infer<typeof ClassPatch>

/** Join codes are written without 0/O and 1/I/L, so a code read aloud or copied by hand still works. */
export const JOIN_CODE_ALPHABET = '23456789ABCDEFGHJKMNPQRSTUVWXYZ'

export const JoinCode = z.string({ error: 'Enter the class code' }).trim().toUpperCase().min(4, { error: 'Enter the class code' }).max(16, { error: 'A class code has at most 16 characters' })
  .regex(/^[A-Z0-9]+$/, { error: 'A class code has only letters and digits' })

export const JoinInput = z.object({ code: JoinCode })
export type JoinInput = z.infer<typeof JoinInput>

/** Splits a pasted list (commas, semicolons, spaces, new lines; "Name <address>" too) into addresses. */
export function splitEmailList(text: string): string[] {
  return text.split(/[\s,;]+/).map(part => part.replace(/^<|>$/g, '').replace(/^.*</, '')).filter(part => part.includes('@'))
}

export const InvitationInput = z.object({
  emails: z.array(Email).min(1, { error: 'Enter at least one e-mail address' }).max(100, { error: 'At most 100 addresses at once' }),
})
export type InvitationInput = z.infer<typeof InvitationInput>

export type InvitationStatus = 'pending' | 'accepted' | 'expired' | 'revoked'

/** A student's own sign-up: the teacher's class code is what lets them in. */
export const StudentRegisterInput = RegisterInput.extend({ role: z.literal('student'), joinCode: JoinCode })
export type StudentRegisterInput = z.infer<typeof StudentRegisterInput>

/** Who a sign-up is for (never an admin, made from the command line only); without `role` it opens a teacher's studio, as it always has. */
export const RegisterRole = z.object({ role: Role.extract(['teacher', 'student'], { error: 'role: teacher or student' }).default('teacher') })

export const InvitationLookup = z.object({ token: LinkToken })

export const InvitationAccept = z.object({
  token: LinkToken,
  /** Asked only when the invited address has no account yet. */
  name: z.string().trim().max(120, { error: 'At most 120 characters' }).optional(),
  /** A new account's password, or the existing account's. */
  password: z.string().min(1, { error: 'Enter a password' }).max(200, { error: 'Password must be at most 200 characters' }),
})
export type InvitationAccept = z.infer<typeof InvitationAccept>
