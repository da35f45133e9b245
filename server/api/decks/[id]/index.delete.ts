import { IdParam } from '#shared/schemas/params'
import { requireOwnDeck, deleteDeck } from '../../../domain/decks'

// Only a deck never drilled is deleted; a deck with history is archived instead (409).
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck } = await requireOwnDeck(event, id)
  await deleteDeck(actor, deck)
  return { ok: true }
})
