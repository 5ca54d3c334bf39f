// The signed-in user as kept in the sealed session cookie.
declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    role: 'teacher' | 'student' | 'admin'
  }
  /** Kept in the cookie but never sent to the browser's session endpoint: the id of the session's row. */
  interface SecureSessionData {
    sid: string
  }
}

export {}
