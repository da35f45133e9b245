import { IdParam } from '#shared/schemas/params'
import { readCheck } from '../../../domain/checks'

// One check's definition, for its instructor, an admin, and the trainees and leads its deck is assigned to.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireActor(event)
  return readCheck(actor, id)
})
