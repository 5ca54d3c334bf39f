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
