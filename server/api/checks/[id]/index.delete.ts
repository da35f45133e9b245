import { IdParam } from '#shared/schemas/params'

// Its instructor deletes a check while nobody has taken it (409 after).
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'instructor')
  deleteCheck(useSqlite(), actor, id)
  return { ok: true }
})
