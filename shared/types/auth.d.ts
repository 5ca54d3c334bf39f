// The signed-in user as kept in the sealed session cookie.
import type { Role } from './account'

declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    role: Role
  }
}

export {}
