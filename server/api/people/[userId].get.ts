import { PersonParam, PersonQuery } from '#shared/schemas/stats'
import { requirePersonAccess, personReportOf } from '../../domain/stats'

// One person's progress: latency over time, accuracy by aspect and condition, confusions, baseline,
// readiness; to a lead only on the decks of the crews that lead leads.
export default defineEventHandler(async (event) => {
  const { userId } = await paramsInput(event, PersonParam)
  const sqlite = useSqlite()
  const { actor, crewIds } = await requirePersonAccess(event, sqlite, userId)
  const filters = await queryInput(event, PersonQuery)
  return personReportOf(sqlite, userId, actor.id, filters, Date.now(), crewIds)
})
