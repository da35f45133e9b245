import { DeckCrewsBody } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'
import { setDeckCrews } from '../../../domain/decks'
import { requireDeckOverseer } from '../../../domain/policy'

// Assigns the deck to crews, by those who oversee it: its owner to crews they belong to, an admin to any crew.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck } = await requireDeckOverseer(event, id)
  const { crewIds } = await readInput(event, DeckCrewsBody)
  return { crewIds: setDeckCrews(actor, deck, crewIds) }
})
