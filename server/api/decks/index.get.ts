// The decks the signed-in person may see, as api.md writes them.
import { listDecks } from '../../domain/decks'

export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  return listDecks(actor).map(d => ({ id: d.id, title: d.title, category: d.category, published: d.status === 'published' }))
})
