import { IdParam } from '#shared/schemas/params'
import { crewScanSummary } from '../../../domain/scan'

// Scan drill results per member of the crew, for the leads' views beside recognition speed.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  await requireCrewRole(event, id, 'lead', 'instructor')
  return crewScanSummary(id)
})
