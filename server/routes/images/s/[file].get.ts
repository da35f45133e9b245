import { SightingImageParam } from '#shared/schemas/watch'
import { sightingImageFile } from '../../../domain/watches'

// A sighting's picture (watch or check) at its own address, for the trainee it was issued to; anyone
// else gets the 404 of an unknown one. The address names the sighting, never the rendering.
export default defineEventHandler(async (event) => {
  const file = getRouterParam(event, 'file') ?? ''
  const { file: name } = validator(SightingImageParam)({ file })
  const actor = await requireActor(event)
  const rendering = sightingImageFile(actor.id, name.slice(0, -'.webp'.length))
  if (!rendering) throw createError({ statusCode: 404, message: 'No such image.' })
  return sendRendering(event, rendering, useRuntimeConfig().uploadsDir)
})
