import { DeckCrewsBody } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'
import { requireVisibleDeck, requireOwnDeck, setDeckCrews } from '../../../domain/decks'

// Assigns the deck to crews: its owner to crews they belong to, an admin to any crew.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'instructor', 'admin')
  const { deck } = hasRole(actor, 'admin') ? await requireVisibleDeck(event, id) : await requireOwnDeck(event, id)
  const { crewIds } = await readInput(event, DeckCrewsBody)
  return { crewIds: setDeckCrews(actor, deck, crewIds) }
})
