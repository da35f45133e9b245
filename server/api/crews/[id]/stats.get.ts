import { IdParam } from '#shared/schemas/params'
import { StatsQuery } from '#shared/schemas/stats'
import { requireCrewStatsAccess, crewStatsOf } from '../../../domain/stats'

// The crew table: per trainee calls, accuracy, median and 90th percentile of right calls, trends, readiness.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const sqlite = useSqlite()
  await requireCrewStatsAccess(event, sqlite, id)
  const filters = await queryInput(event, StatsQuery)
  return crewStatsOf(sqlite, id, filters, Date.now())
})
