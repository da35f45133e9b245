// Sends one stored rendering (a WebP under uploads/renders/) as the answer, or a 404.
import { readFile } from 'node:fs/promises'
import { join } from 'node:path'
import type { H3Event } from 'h3'
import { createError, setResponseHeaders } from 'h3'
import { rendersDir } from './renders-store'

export async function sendRendering(event: H3Event, file: string | null, uploadsDir: string, notFound = 'No such image.'): Promise<Buffer> {
  const bytes = file ? await readFile(join(rendersDir(uploadsDir), file)).catch(() => null) : null
  if (!bytes) throw createError({ statusCode: 404, message: notFound })
  setResponseHeaders(event, {
    'Content-Type': 'image/webp',
    'X-Content-Type-Options': 'nosniff',
    // A rendering, and a sighting's picture, never change; private: only the signed-in person's cache keeps it.
    'Cache-Control': 'private, max-age=31536000, immutable',
    'Content-Length': String(bytes.byteLength),
  })
  return bytes
}
