import { PictureFileParam } from '#shared/schemas/watch'
import { pictureFileFor } from '../../../domain/watches'

// A watch's teaching picture (introduction, reveal) by its opaque id, only for the trainee the
// watch was issued to; anyone else gets 404 as for an unknown one. The address names no type.
export default defineEventHandler(async (event) => {
  const { file } = validator(PictureFileParam)({ file: getRouterParam(event, 'file') ?? '' })
  const actor = await requireActor(event)
  const name = pictureFileFor(actor.id, file.slice(0, -'.webp'.length))
  return sendRendering(event, name, useRuntimeConfig().uploadsDir, 'No such picture in your watches.')
})
