import { IdParam } from '#shared/schemas/params'
import { requireCrewReports } from '../../../domain/policy'
import { startFit } from '../../../domain/crews'

// Starts a fit of the crew's parameters off the request thread; answers 202 with the state at once
// (a fit already running is joined, not started twice). Poll GET for progress and figures.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireCrewReports(event, id)
  setResponseStatus(event, 202)
  return startFit(id, actor.id)
})
