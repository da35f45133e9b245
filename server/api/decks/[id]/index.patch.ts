import { eq } from 'drizzle-orm'
import { DeckPatch } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'
import { deckBuilderDetail, patchDeck, requireOwnDeck } from '../../../domain/decks'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck } = await requireOwnDeck(event, id)
  const patch = await readInput(event, DeckPatch)
  patchDeck(actor, deck, patch)
  return deckBuilderDetail(useDb().select().from(tables.decks).where(eq(tables.decks.id, id)).get()!)
})
