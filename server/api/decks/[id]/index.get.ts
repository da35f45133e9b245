import { IdParam } from '#shared/schemas/params'
import { requireVisibleDeck, deckDetail } from '../../../domain/decks'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck } = await requireVisibleDeck(event, id)
  return deckDetail(deck, actor)
})
