import { TargetTypeBody } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'
import { requireOwnDeck, createTargetType } from '../../../domain/decks'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck } = await requireOwnDeck(event, id)
  const body = await readInput(event, TargetTypeBody)
  const typeId = createTargetType(actor, deck, body)
  setResponseStatus(event, 201)
  return { id: typeId }
})
