// The signed-in user as kept in the sealed session cookie.
import type { Role } from './account'

declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    role: Role
  }
  /** Kept in the cookie but never sent to the browser's session endpoint: the id of the session's row. */
  interface SecureSessionData {
    sid: string
  }
}

export {}
