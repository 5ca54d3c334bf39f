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
