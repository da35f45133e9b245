import { PasswordChangeBody } from '#shared/schemas/admin'
import { isCurrentPassword, setOwnPassword, startSession } from '../../domain/people'

// The signed-in person changes their own password. The current one is asked (and counted like a
// sign-in, NIST SP 800-63B §5.2.2); the session version is raised so every other session ends,
// and this one is sealed again with the new version.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const { current, password } = await readInput(event, PasswordChangeBody)
  await spend('loginAccount', actor.email)
  if (!(await isCurrentPassword(actor.id, current))) {
    throw createError({ statusCode: 400, message: 'Your current password is not right. Type it again.', data: { field: 'current' } })
  }
  await giveBack('loginAccount', actor.email)
  if (current === password) throw createError({ statusCode: 400, message: 'The new password is the same as the current one. Choose another.', data: { field: 'password' } })
  assertGoodPassword(password, actor.email)
  const sessionVersion = await setOwnPassword(actor, password)
  await startSession(event, { id: actor.id, sessionVersion })
  return { ok: true }
})
