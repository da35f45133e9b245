import { IdParam } from '#shared/schemas/params'
import { requireOwnTargetType, deleteTargetType } from '../../domain/decks'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, type } = await requireOwnTargetType(event, id)
  await deleteTargetType(actor, type)
  return { ok: true }
})
