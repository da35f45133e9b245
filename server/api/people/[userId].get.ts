import { PersonParam, PersonQuery } from '#shared/schemas/stats'
import { requirePersonAccess } from '../../domain/policy'
import { personReport } from '../../domain/stats'

// One person's progress: latency over time, accuracy by aspect and condition, confusions, baseline,
// readiness; to a lead only on the decks of the crews that lead leads.
export default defineEventHandler(async (event) => {
  const { userId } = await paramsInput(event, PersonParam)
  const { actor, crewIds } = await requirePersonAccess(event, userId)
  const filters = await queryInput(event, PersonQuery)
  return personReport(userId, actor.id, filters, crewIds)
})
