// Fresh studios for tests that must not lean on the demo's rows: a teacher, a class, students who joined it.
import { Client, testDb } from './server'

let counter = 0

/** A unique address on the test domain, so tests can run again on the same database. */
export function uniqueEmail(who: string): string {
  counter += 1
  return `${who}-${Date.now().toString(36)}-${counter}@evenhand.test`
}

export async function newTeacher(name = 'Test Teacher'): Promise<Client> {
  const c = new Client()
  const res = await c.post('/api/auth/register', { name, email: uniqueEmail('teacher'), password: 'long-enough-1' })
  if (res.status !== 201) throw new Error(`teacher sign-up failed: ${res.status}`)
  return c
}

export async function newClass(teacher: Client, name = 'Test Class'): Promise<{ id: number, joinCode: string }> {
  const res = await teacher.post<{ id: number, joinCode: string }>('/api/classes', { name })
  if (res.status !== 201) throw new Error(`class creation failed: ${res.status}`)
  return res.body
}

export async function newStudent(joinCode: string, name = 'Test Student'): Promise<{ client: Client, id: number, email: string }> {
  const client = new Client()
  const email = uniqueEmail('student')
  const res = await client.post<{ user: { id: number } }>('/api/auth/register', { role: 'student', joinCode, name, email, password: 'long-enough-1' })
  if (res.status !== 201) throw new Error(`student sign-up failed: ${res.status} ${JSON.stringify(res.body)}`)
  return { client, id: res.body.user.id, email }
}

/** Ids of public demo drills, which every teacher may put in a set. */
export async function publicDrillIds(): Promise<number[]> {
  return (await testDb()('drills').where({ is_public: true }).orderBy('id').select('id')).map(r => Number(r.id))
}
