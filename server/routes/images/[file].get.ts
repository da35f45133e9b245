import { ImageFileParam } from '#shared/schemas/decks'
import { fileVisibleTo } from '../../domain/decks'

// A rendering by its content hash, for those who build or manage the deck that uses it (its owner, an
// admin). Trainees and leads never get one: their pictures come at per-sighting addresses (/images/s/).
export default defineEventHandler(async (event) => {
  const file = getRouterParam(event, 'file') ?? ''
  const { file: name } = validator(ImageFileParam)({ file })
  const actor = await requireActor(event)
  if (!fileVisibleTo(actor, name)) throw createError({ statusCode: 404, message: 'No such image.' })
  return sendRendering(event, name, useRuntimeConfig().uploadsDir)
})
