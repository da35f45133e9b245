import { IdParam } from '#shared/schemas/params'
import { requireOwnTrashedView, restoreView } from '../../../domain/decks'

// Puts a removed view back from the deck's trash.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, row } = await requireOwnTrashedView(event, id)
  restoreView(actor, row)
  return { ok: true, id }
})
