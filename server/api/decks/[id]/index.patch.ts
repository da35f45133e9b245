import { DeckPatch } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'
import { deckBuilderDetailOf, patchDeck, requireOwnDeck } from '../../../domain/decks'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck } = await requireOwnDeck(event, id)
  const patch = await readInput(event, DeckPatch)
  patchDeck(actor, deck, patch)
  return deckBuilderDetailOf(id)
})
