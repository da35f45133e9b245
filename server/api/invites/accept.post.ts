import { and, eq, isNull } from 'drizzle-orm'
import { AcceptInviteBody } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const { token, name, password } = await readInput(event, AcceptInviteBody)
  const inv = openInvitation(token)
  assertGoodPassword(password, inv.email)
  if (findUserByEmail(inv.email)) throw createError({ statusCode: 409, message: 'That address already has a Glint account. Sign in instead.' })
  const passwordHash = await hashPassword(password)
  const db = useDb()
  const userId = newId()
  // Claim the invitation and create the account together: a second use finds it claimed.
  const created = db.transaction((tx) => {
    const r = tx.update(tables.invitations).set({ usedAt: Date.now() })
      .where(and(eq(tables.invitations.id, inv.id), isNull(tables.invitations.usedAt))).run()
    if (r.changes !== 1) return false
    tx.insert(tables.users).values({ id: userId, email: inv.email, name, passwordHash }).run()
    tx.insert(tables.userRoles).values({ userId, role: inv.role }).run()
    if (inv.crewId) tx.insert(tables.memberships).values({ crewId: inv.crewId, userId }).run()
    return true
  })
  if (!created) throw createError({ statusCode: 400, message: 'This invitation has expired or was already used. Ask for a new one.' })
  await startSession(event, { id: userId, sessionVersion: 1 })
  setResponseStatus(event, 201)
  return meOf(await requireActorFor(event))
})
