// The signed-in user as kept in the sealed session cookie.
declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    role: 'teacher' | 'student' | 'admin'
  }
}

export {}
