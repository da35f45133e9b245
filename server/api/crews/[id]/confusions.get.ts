import { IdParam } from '#shared/schemas/params'
import { ConfusionsQuery } from '#shared/schemas/stats'
import { requireCrewStatsAccess, crewConfusionsOf } from '../../../domain/stats'

// The crew's confusion matrix on one deck: how often each target type was called as each other one.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const sqlite = useSqlite()
  await requireCrewStatsAccess(event, sqlite, id)
  const { deckId, days } = await queryInput(event, ConfusionsQuery)
  return crewConfusionsOf(sqlite, id, deckId, days, Date.now())
})
