import { eq, sql } from 'drizzle-orm'
import { PasswordChangeBody } from '#shared/schemas/admin'
import { startSession } from '../../domain/people'

// The signed-in person changes their own password. The current one is asked (and counted like a
// sign-in, NIST SP 800-63B §5.2.2); the session version is raised so every other session ends,
// and this one is sealed again with the new version.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const { current, password } = await readInput(event, PasswordChangeBody)
  await spend('loginAccount', actor.email)
  const user = useDb().select().from(tables.users).where(eq(tables.users.id, actor.id)).get()!
  if (!(await verifyPassword(user.passwordHash, current))) {
    throw createError({ statusCode: 400, message: 'Your current password is not right. Type it again.', data: { field: 'current' } })
  }
  await giveBack('loginAccount', actor.email)
  if (current === password) throw createError({ statusCode: 400, message: 'The new password is the same as the current one. Choose another.', data: { field: 'password' } })
  assertGoodPassword(password, actor.email)
  const passwordHash = await hashPassword(password)
  const updated = useDb().update(tables.users).set({ passwordHash, sessionVersion: sql`${tables.users.sessionVersion} + 1`, updatedAt: Date.now() })
    .where(eq(tables.users.id, actor.id)).returning({ sessionVersion: tables.users.sessionVersion }).get()
  await startSession(event, { id: actor.id, sessionVersion: updated!.sessionVersion })
  audit(actor, 'password.change', 'user', actor.id)
  return { ok: true }
})
