import { eq } from 'drizzle-orm'
import { CrewPatch } from '#shared/schemas/auth'
import { IdParam } from '#shared/schemas/params'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireCrewRole(event, id, 'lead')
  const patch = await readInput(event, CrewPatch)
  if (Object.keys(patch).length) {
    try {
      useDb().update(tables.crews).set({ ...patch, updatedAt: Date.now() }).where(eq(tables.crews.id, id)).run()
    }
    catch (e) {
      if (String(e).includes('UNIQUE')) throw createError({ statusCode: 409, message: 'A crew with that name exists.' })
      throw e
    }
    audit(actor, 'crew.update', 'crew', id, patch)
  }
  return { ok: true }
})
