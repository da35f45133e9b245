import { IdParam } from '#shared/schemas/params'
import { requireOwnTrashedView, restoreView } from '../../../domain/decks'

// Puts a removed view back from the deck's trash (with the same view of the other decks, when it
// was removed from every deck that shares its target type).
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, row } = await requireOwnTrashedView(event, id)
  return { ok: true, id, ...restoreView(actor, row) }
})
