import { and, eq, isNull } from 'drizzle-orm'
import { AcceptInviteBody } from '#shared/schemas/auth'
import { findUserByEmail, meOf, requireActorFor, startSession } from '../../domain/people'
import { openInvitation } from '../../domain/invitation-lookup'

const TAKEN = 'That address already has a Glint account. Sign in instead.'

export default defineEventHandler(async (event) => {
  const { token, name, password } = await readInput(event, AcceptInviteBody)
  const inv = openInvitation(token)
  assertGoodPassword(password, inv.email)
  if (findUserByEmail(inv.email)) throw createError({ statusCode: 409, message: TAKEN })
  const passwordHash = await hashPassword(password)
  const db = useDb()
  const userId = newId()
  // Claim the invitation and create the account together: a second use finds it claimed, and a
  // second invitation to the same address, accepted at the same moment, finds the account made.
  const outcome = db.transaction((tx) => {
    if (tx.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.email, inv.email)).get()) return 'taken'
    const r = tx.update(tables.invitations).set({ usedAt: Date.now() })
      .where(and(eq(tables.invitations.id, inv.id), isNull(tables.invitations.usedAt), isNull(tables.invitations.revokedAt))).run()
    if (r.changes !== 1) return 'used'
    tx.insert(tables.users).values({ id: userId, email: inv.email, name, passwordHash }).run()
    tx.insert(tables.userRoles).values({ userId, role: inv.role }).run()
    if (inv.crewId) tx.insert(tables.memberships).values({ crewId: inv.crewId, userId }).run()
    return 'created'
  })
  if (outcome === 'taken') throw createError({ statusCode: 409, message: TAKEN })
  if (outcome === 'used') throw createError({ statusCode: 400, message: 'This invitation was used or withdrawn a moment ago. Sign in, or ask for a new one.' })
  await startSession(event, { id: userId, sessionVersion: 1 })
  setResponseStatus(event, 201)
  return meOf(await requireActorFor(event))
})
