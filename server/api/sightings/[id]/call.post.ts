import { CallBody } from '#shared/schemas/drill'
import { IdParam } from '#shared/schemas/params'

// One call on a sighting: graded, scheduled and stored once (a resend gets the first result).
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'trainee')
  const input = await readInput(event, CallBody)
  return callSighting(useSqlite(), actor.id, id, input)
})
