import { eq } from 'drizzle-orm'
import { PersonCrewsBody } from '#shared/schemas/admin'
import { IdParam } from '#shared/schemas/params'
import { setPersonCrews } from '../../../../domain/admin'

// An admin sets the crews of an existing person: add to a crew, move between crews, or take out.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { id } = await paramsInput(event, IdParam)
  const { crewIds } = await readInput(event, PersonCrewsBody)
  const user = useDb().select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.id, id)).get()
  if (!user) throw createError({ statusCode: 404, message: 'No such person.' })
  const { added, removed } = setPersonCrews(actor, id, crewIds)
  return { ok: true, added, removed }
})
