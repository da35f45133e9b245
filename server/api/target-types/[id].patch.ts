import { TargetTypePatch } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'
import { requireOwnTargetType, patchTargetType } from '../../domain/decks'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck, type } = await requireOwnTargetType(event, id)
  const patch = await readInput(event, TargetTypePatch)
  patchTargetType(actor, deck, type, patch)
  return { ok: true }
})
