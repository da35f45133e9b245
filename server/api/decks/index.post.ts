import { DeckBody } from '#shared/schemas/decks'
import { createDeck } from '../../domain/decks'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'instructor')
  const body = await readInput(event, DeckBody)
  const id = createDeck(actor, body)
  audit(actor, 'deck.create', 'deck', id, { title: body.title })
  setResponseStatus(event, 201)
  return { id }
})
