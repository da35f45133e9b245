import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { PictureFileParam } from '#shared/schemas/watch'
import { pictureFileFor } from '../../../domain/watches'

// A watch's teaching picture (introduction, reveal) by its opaque id, only for the trainee the
// watch was issued to; anyone else gets 404 as for an unknown one. The address names no type.
export default defineEventHandler(async (event) => {
  const { file } = validator(PictureFileParam)({ file: getRouterParam(event, 'file') ?? '' })
  const actor = await requireActor(event)
  const name = pictureFileFor(actor.id, file.slice(0, -'.webp'.length))
  const bytes = name ? await readFile(join(rendersDir(useRuntimeConfig().uploadsDir), name)).catch(() => null) : null
  if (!bytes) throw createError({ statusCode: 404, message: 'No such picture in your watches.' })
  setResponseHeaders(event, {
    'Content-Type': 'image/webp',
    'X-Content-Type-Options': 'nosniff',
    'Cache-Control': 'private, max-age=31536000, immutable',
    'Content-Length': String(bytes.byteLength),
  })
  return bytes
})
