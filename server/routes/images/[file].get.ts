import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import { ImageFileParam } from '#shared/schemas/decks'

// A rendering by its content hash, for a signed-in viewer who may see a deck that uses it.
// The name carries neither the target type nor its id; content-addressed, so it never changes.
export default defineEventHandler(async (event) => {
  const file = getRouterParam(event, 'file') ?? ''
  const { file: name } = validator(ImageFileParam)({ file })
  const actor = await requireActor(event)
  if (!fileVisibleTo(actor, name)) throw createError({ statusCode: 404, message: 'No such image.' })
  const bytes = await readFile(join(rendersDir(useRuntimeConfig().uploadsDir), name)).catch(() => null)
  if (!bytes) throw createError({ statusCode: 404, message: 'No such image.' })
  setResponseHeaders(event, {
    'Content-Type': 'image/webp',
    'X-Content-Type-Options': 'nosniff',
    'Cache-Control': 'private, max-age=31536000, immutable',
    'Content-Length': String(bytes.byteLength),
  })
  return bytes
})
