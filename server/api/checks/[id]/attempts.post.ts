import { IdParam } from '#shared/schemas/params'
import { startCheckAttempt } from '../../../domain/checks'

// A trainee takes a check: its sightings issued whole, without answers; once, until a lead resets it.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'trainee')
  setResponseStatus(event, 201)
  return startCheckAttempt(actor, id)
})
