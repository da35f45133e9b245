import { IdParam } from '#shared/schemas/params'
import { crewDetail } from '../../../domain/crews'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  await requireCrewRole(event, id, 'lead', 'instructor')
  return crewDetail(id)
})
