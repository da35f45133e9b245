// The instructor's own decks for the deck builder's list (with status, counts and crews).
import { builderList } from '../../domain/decks'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'instructor')
  return builderList(actor)
})
