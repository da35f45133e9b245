import { IdParam } from '#shared/schemas/params'
import { requireCrewStatsAccess } from '../../../domain/stats'
import { crewFitView } from '../../../domain/crew-fits'

// The crew's scheduling parameters: the last fit's state and figures, the forgetting curve and
// calibration of the default and fitted sets (leads of the crew, instructors of its decks, admins).
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const sqlite = useSqlite()
  await requireCrewStatsAccess(event, sqlite, id)
  return crewFitView(sqlite, id)
})
