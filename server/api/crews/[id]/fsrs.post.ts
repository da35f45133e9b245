import { IdParam } from '#shared/schemas/params'
import { requireCrewStatsAccess } from '../../../domain/stats'
import { startCrewFit, crewFitView } from '../../../domain/crew-fits'

// Starts a fit of the crew's parameters off the request thread; answers 202 with the state at once
// (a fit already running is joined, not started twice). Poll GET for progress and figures.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const sqlite = useSqlite()
  const actor = await requireCrewStatsAccess(event, sqlite, id)
  void startCrewFit(sqlite, id, actor.id)
  setResponseStatus(event, 202)
  return crewFitView(sqlite, id)
})
