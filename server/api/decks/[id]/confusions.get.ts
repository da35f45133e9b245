import { ConfusionsQuery, DeckParam } from '#shared/schemas/stats'
import { requireDeckOwner, deckConfusionsOf } from '../../../domain/stats'

// The deck's worst pairs across the crews it is assigned to, for its instructor: which look-alikes to teach.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, DeckParam)
  const sqlite = useSqlite()
  await requireDeckOwner(event, sqlite, id)
  const { days } = await queryInput(event, ConfusionsQuery)
  return deckConfusionsOf(sqlite, id, days, Date.now())
})
