import { eq } from 'drizzle-orm'
import { MemberBody } from '#shared/schemas/auth'
import { IdParam } from '#shared/schemas/params'

// An admin adds an existing account to a crew. A lead may not: joining a crew opens the person's
// reports and checks to its lead, so a person joins only by an admin's act or by accepting an invitation.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireActor(event)
  if (!hasRole(actor, 'admin')) {
    throw createError({ statusCode: 403, message: 'Only an admin can add an existing person to a crew; send them an invitation to the crew instead.' })
  }
  await requireCrewRole(event, id, 'admin')
  const { userId } = await readInput(event, MemberBody)
  const db = useDb()
  const user = db.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.id, userId)).get()
  if (!user) throw createError({ statusCode: 404, message: 'No such person.' })
  db.insert(tables.memberships).values({ crewId: id, userId }).onConflictDoNothing().run()
  audit(actor, 'crew.member.add', 'crew', id, { userId })
  return { ok: true }
})
