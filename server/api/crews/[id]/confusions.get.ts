import { IdParam } from '#shared/schemas/params'
import { ConfusionsQuery } from '#shared/schemas/stats'
import { requireCrewReports } from '../../../domain/policy'
import { crewConfusions } from '../../../domain/stats'

// The crew's confusion matrix on one deck: how often each target type was called as each other one.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  await requireCrewReports(event, id)
  const { deckId, days } = await queryInput(event, ConfusionsQuery)
  return crewConfusions(id, deckId, days)
})
