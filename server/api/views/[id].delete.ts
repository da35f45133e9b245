import { IdParam } from '#shared/schemas/params'
import { requireOwnView, deleteView } from '../../domain/decks'

// Moves the view to the deck's trash, restorable for VIEW_TRASH_DAYS.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck, view } = await requireOwnView(event, id)
  return { ok: true, ...await deleteView(actor, deck, view) }
})
