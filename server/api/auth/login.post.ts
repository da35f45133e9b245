import { LoginBody } from '#shared/schemas/auth'
import { findUserByEmail, meOf, startSession, DUMMY_HASH, requireActorFor } from '../../domain/people'

const WRONG = 'That e-mail and password do not match an account.'

export default defineEventHandler(async (event) => {
  const { email, password } = await readInput(event, LoginBody)
  const pair = `${email}|${clientAddress(event)}`
  // The attempt is counted before the (slow) password check, so a concurrent burst cannot all be
  // checked while the counter still reads low; a right password gives its point back.
  await spendAll(['loginPair', pair], ['loginAccount', email])
  const user = findUserByEmail(email)
  // Verify against a real hash even for unknown accounts, so timing does not reveal which exist.
  const ok = await verifyPassword(user?.passwordHash ?? DUMMY_HASH, password)
  if (!user || !ok || user.disabled) throw createError({ statusCode: 401, message: WRONG })
  await giveBack('loginPair', pair)
  await giveBack('loginAccount', email)
  await startSession(event, user)
  return meOf(await requireActorFor(event))
})
