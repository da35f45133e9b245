import { IdParam } from '#shared/schemas/params'
import { finishCheckAttempt } from '../../../../domain/checks'

// The trainee ends a running attempt; sightings not called count as wrong.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'trainee')
  return finishCheckAttempt(actor, id)
})
