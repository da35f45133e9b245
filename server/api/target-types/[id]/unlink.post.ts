import { IdParam } from '#shared/schemas/params'
import { requireOwnTargetType, unlinkTargetType } from '../../../domain/decks'

// Stops sharing: this deck's row of a shared target type becomes its own definition again.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, type } = await requireOwnTargetType(event, id)
  return { ok: true, ...unlinkTargetType(actor, type) }
})
