// Our password rule, on top of the length the schema checks: not blank, not the account's own e-mail,
// and not one of the commonest passwords (the list zxcvbn-ts ships, about 49,000 of them).
import { dictionary } from '@zxcvbn-ts/language-common'

let common: Set<string> | undefined

/** Why `password` is refused, as a message for the password field, or null when it is fine. */
export function passwordProblem(password: string, email?: string): string | null {
  if (!password.trim()) return 'A password cannot be only spaces'
  common ??= new Set(dictionary['passwords-common'] as string[])
  const plain = password.trim().toLowerCase()
  if (common.has(plain)) return 'This is one of the most common passwords; choose one that is harder to guess'
  if (email && (plain === email.toLowerCase() || plain === email.toLowerCase().split('@')[0])) return 'A password cannot be your e-mail address'
  return null
}

/** A 400 naming the password field when the rule refuses it. */
export function requireGoodPassword(password: string, email?: string): void {
  const problem = passwordProblem(password, email)
  if (problem) throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: `password: ${problem}`, data: { issues: [{ path: 'password', message: problem }] } })
}
