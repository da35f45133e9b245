import { IdParam } from '#shared/schemas/params'
import { StatsQuery } from '#shared/schemas/stats'
import { requireCrewReports } from '../../../domain/policy'
import { crewStats } from '../../../domain/stats'

// The crew table: per trainee calls, accuracy, median and 90th percentile of right calls, trends, readiness.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  await requireCrewReports(event, id)
  const filters = await queryInput(event, StatsQuery)
  return crewStats(id, filters)
})
