import { IdParam } from '#shared/schemas/params'
import { voidSighting } from '../../../domain/watches'

// A sighting interrupted (the screen hidden while it showed): voided, not graded, shown again at the end of the watch.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'trainee')
  return voidSighting(actor.id, id)
})
