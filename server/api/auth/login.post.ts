import { LoginBody } from '#shared/schemas/auth'

const WRONG = 'That e-mail and password do not match an account.'

export default defineEventHandler(async (event) => {
  const { email, password } = await readInput(event, LoginBody)
  const address = clientAddress(event)
  await assertNotLimited('loginAccount', email)
  await assertNotLimited('loginAddress', address)
  const user = findUserByEmail(email)
  // Verify against a real hash even for unknown accounts, so timing does not reveal which exist.
  const ok = await verifyPassword(user?.passwordHash ?? DUMMY_HASH, password)
  if (!user || !ok || user.disabled) {
    await spend('loginAccount', email)
    await spend('loginAddress', address)
    throw createError({ statusCode: 401, message: WRONG })
  }
  await forgive('loginAccount', email)
  await startSession(event, user)
  return meOf(await requireActorFor(event))
})
