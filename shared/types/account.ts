import { z } from 'zod'

export const Role = z.enum(['teacher', 'student', 'admin'])
export type Role = z.infer<typeof Role>

export const Email = z.email({ error: 'Enter a valid e-mail address' }).trim().toLowerCase().max(254)

// scrypt hashes any length, but a cap stops a megabyte "password" from costing the server.
export const Password = z.string()
  .min(8, { error: 'Password must be at least 8 characters' })
  .max(200, { error: 'Password must be at most 200 characters' })

export const LoginInput = z.object({
  email: Email,
  password: z.string().min(1, { error: 'Enter your password' }).max(200, { error: 'Password must be at most 200 characters' }),
})
export type LoginInput = z.infer<typeof LoginInput>

export const RegisterInput = z.object({
  name: z.string().trim().min(1, { error: 'Enter your name' }).max(120),
  email: Email,
  password: Password,
})
export type RegisterInput = z.infer<typeof RegisterInput>

/** A one-time token from an e-mailed link (43 URL-safe characters when we make it). */
export const LinkToken = z.string({ error: 'The link is incomplete' }).trim().min(20, { error: 'The link is incomplete' }).max(100, { error: 'The link is not one of ours' })

export const ForgotInput = z.object({ email: Email })
export type ForgotInput = z.infer<typeof ForgotInput>

export const ResetInput = z.object({ token: LinkToken, password: Password })
export type ResetInput = z.infer<typeof ResetInput>

export const PersonName = z.string().trim().min(1, { error: 'Enter a name' }).max(120, { error: 'A name is at most 120 characters' })

const CurrentPassword = z.string().min(1, { error: 'Enter your current password' }).max(200, { error: 'Password must be at most 200 characters' })

/** A guardian's address, or none: an empty field clears it. */
export const GuardianEmail = z.preprocess(v => (v === '' ? null : v), Email.nullable())

export const AccountUpdate = z.object({
  name: PersonName.optional(),
  guardianEmail: GuardianEmail.optional(),
}).refine(v => v.name !== undefined || v.guardianEmail !== undefined, { error: 'Send a name or a guardian e-mail to change' })
export type AccountUpdate = z.infer<typeof AccountUpdate>

export const PasswordChange = z.object({ currentPassword: CurrentPassword, password: Password })
export type PasswordChange = z.infer<typeof PasswordChange>

export const EmailChange = z.object({ email: Email, currentPassword: CurrentPassword })
export type EmailChange = z.infer<typeof EmailChange>

export const TokenInput = z.object({ token: LinkToken })
export type TokenInput = z.infer<typeof TokenInput>

export const GuardianInput = z.object({ guardianEmail: GuardianEmail })
export type GuardianInput = z.infer<typeof GuardianInput>

export interface Account {
  id: number
  name: string
  email: string
  role: Role
  /** Students only: who receives the weekly summary, and whether they stopped it. */
  guardianEmail: string | null
  guardianSummaryStopped: boolean
  /** A new sign-in e-mail waiting for its link to be opened (the sign-in e-mail is still `email`). */
  pendingEmail: { email: string, expiresAt: string } | null
}
