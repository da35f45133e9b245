// The instructor's library: the shared target types of their own decks, with the decks using each.
import { typeLibrary } from '../../domain/decks'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'instructor')
  return typeLibrary(actor)
})
