import { ViewRemoveQuery } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'
import { requireOwnView, deleteView } from '../../domain/decks'

// Moves the view to the deck's trash, restorable for VIEW_TRASH_DAYS; with ?everywhere=true, the
// same view of every deck that shares its target type too.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { everywhere } = await queryInput(event, ViewRemoveQuery)
  const { actor, deck, type, view } = await requireOwnView(event, id)
  return { ok: true, ...await deleteView(actor, deck, view, { everywhere: everywhere === 'true', type }) }
})
