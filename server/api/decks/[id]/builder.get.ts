import { IdParam } from '#shared/schemas/params'
import { requireOwnDeck, deckBuilderDetail } from '../../../domain/decks'

// Everything the deck builder edits, for the deck's owner.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { deck } = await requireOwnDeck(event, id)
  return deckBuilderDetail(deck)
})
