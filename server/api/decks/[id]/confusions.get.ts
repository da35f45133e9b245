import { ConfusionsQuery, DeckParam } from '#shared/schemas/stats'
import { requireDeckOverseer } from '../../../domain/policy'
import { deckConfusions } from '../../../domain/stats'

// The deck's worst pairs across the crews it is assigned to, for those who oversee it (its
// instructor, an admin): which look-alikes to teach.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, DeckParam)
  await requireDeckOverseer(event, id)
  const { days } = await queryInput(event, ConfusionsQuery)
  return deckConfusions(id, days)
})
