import { IdParam } from '#shared/schemas/params'
import { requireCrewReports } from '../../../domain/policy'
import { crewFit } from '../../../domain/crews'

// The crew's scheduling parameters: the last fit's state and figures, the forgetting curve and
// calibration of the default and fitted sets (leads of the crew, instructors of its decks, admins).
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  await requireCrewReports(event, id)
  return crewFit(id)
})
