import { BaselineBody } from '#shared/schemas/watch'
import { saveTapBaseline } from '../../domain/tap-baselines'

// Stores a tap baseline: the person's own simple and choice reaction times on this device.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const body = await readInput(event, BaselineBody)
  await spend('baselineAccount', actor.id, 'tap baselines')
  const row = saveTapBaseline(actor.id, body)
  setResponseStatus(event, 201)
  return row
})
