import { TypeCopyBody } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'
import { requireOwnDeck, requireOwnTargetType, copyTargetType } from '../../../domain/decks'

// Copies a target type of one of the instructor's own decks, with its views, into this deck.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck } = await requireOwnDeck(event, id)
  const { targetTypeId } = await readInput(event, TypeCopyBody)
  const { type } = await requireOwnTargetType(event, targetTypeId)
  if (type.deckId === deck.id) throw createError({ statusCode: 409, message: 'targetTypeId: This target type is already in this deck.' })
  setResponseStatus(event, 201)
  return { id: copyTargetType(actor, deck, type) }
})
