import { TypeLinkBody } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'
import { requireOwnDeck, requireOwnTargetType, linkTargetType } from '../../../domain/decks'

// Uses a target type of one of the instructor's own decks in this deck, linked to it: one shared
// definition, its views uploaded once.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck } = await requireOwnDeck(event, id)
  const { targetTypeId } = await readInput(event, TypeLinkBody)
  const { type } = await requireOwnTargetType(event, targetTypeId)
  setResponseStatus(event, 201)
  return { id: linkTargetType(actor, deck, type) }
})
