import { and, eq } from 'drizzle-orm'
import { CrewMemberParams } from '#shared/schemas/params'

export default defineEventHandler(async (event) => {
  const { id, userId } = await paramsInput(event, CrewMemberParams)
  const actor = await requireCrewRole(event, id, 'lead')
  const r = useDb().delete(tables.memberships)
    .where(and(eq(tables.memberships.crewId, id), eq(tables.memberships.userId, userId))).run()
  if (!r.changes) throw createError({ statusCode: 404, message: 'That person is not in this crew.' })
  audit(actor, 'crew.member.remove', 'crew', id, { userId })
  return { ok: true }
})
