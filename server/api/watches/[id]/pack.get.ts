import { IdParam } from '#shared/schemas/params'
import { watchPack } from '../../../domain/watches'

// The offline pack of a watch: its sightings with their answers, for the trainee it was issued to.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'trainee')
  return watchPack(actor.id, id)
})
