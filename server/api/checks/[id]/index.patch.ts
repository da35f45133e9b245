import { CheckPatch } from '#shared/schemas/checks'
import { IdParam } from '#shared/schemas/params'

// Its instructor changes a check while nobody has taken it (409 after).
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'instructor')
  const patch = await readInput(event, CheckPatch)
  return updateCheck(useSqlite(), actor, id, patch)
})
