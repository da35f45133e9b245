import { eq } from 'drizzle-orm'
import { MemberBody } from '#shared/schemas/auth'
import { IdParam } from '#shared/schemas/params'

// A lead adds an existing account to an own crew; an admin to any crew.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireCrewRole(event, id, 'lead')
  const { userId } = await readInput(event, MemberBody)
  const db = useDb()
  const user = db.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.id, userId)).get()
  if (!user) throw createError({ statusCode: 404, message: 'No such person.' })
  db.insert(tables.memberships).values({ crewId: id, userId }).onConflictDoNothing().run()
  audit(actor, 'crew.member.add', 'crew', id, { userId })
  return { ok: true }
})
