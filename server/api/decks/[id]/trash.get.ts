import { IdParam } from '#shared/schemas/params'
import { requireOwnDeck, VIEW_TRASH_DAYS, purgeViewTrash, viewTrash } from '../../../domain/decks'

// The deck's removed views that can still be restored, for its owner.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { deck } = await requireOwnDeck(event, id)
  await purgeViewTrash()
  return { retentionDays: VIEW_TRASH_DAYS, views: viewTrash(deck.id) }
})
