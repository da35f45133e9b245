// The instructor's library: the target types of all their own decks, to copy into another.
import { typeLibrary } from '../../domain/decks'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'instructor')
  return typeLibrary(actor)
})
