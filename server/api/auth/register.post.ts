import { RegisterInput } from '#shared/types/account'
import { RegisterRole, StudentRegisterInput } from '#shared/types/classes'

// Sign-up makes teachers, or students who bring a class code; invited students sign up through
// their invitation, admins from the command line. It says when an e-mail is taken, as most products do,
// under a limit per address of its own.
export default defineEventHandler(async (event) => {
  const { role } = await validBody(event, RegisterRole)
  const student = role === 'student' ? await validBody(event, StudentRegisterInput) : null
  const input = student ?? await validBody(event, RegisterInput)
  requireGoodPassword(input.password, input.email)
  await spend(event, 'signUpIp', clientIp(event), 'Too many sign-ups from this address; try again later')
  const db = useDb()
  const passwordHash = await hashPassword(input.password)
  const joined = await db.transaction(async (trx) => {
    const cls = student ? await classByCode(trx, student.joinCode) : null
    const id = await insertUser(trx, { email: input.email, name: input.name, passwordHash, role })
    if (cls) await addMember(trx, cls.id, id)
    return { id, cls }
  })
  const user = { id: joined.id, email: input.email, name: input.name, role }
  await startSession(event, user)
  setResponseStatus(event, 201)
  return joined.cls ? { user, class: joined.cls } : { user }
})
