// Multipart uploads streamed to a temporary folder with busboy, never held whole in memory: the
// caps (bytes a file, files a request, bytes a request) are enforced as the bytes arrive. Routes
// call this only after authorising, so nobody else makes the server read a byte of the body.
import { createWriteStream } from 'node:fs'
import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Readable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import busboy from 'busboy'
import type { H3Event } from 'h3'

export interface UploadCaps {
  /** the multipart field that carries the files */
  fileField: string
  maxFiles: number
  maxFileBytes: number
  /** the whole request body, framing and fields included */
  maxRequestBytes: number
}

export interface StreamedFile {
  name: string
  /** where the file's bytes are, inside the upload's temporary folder */
  path: string
  /** bytes kept: at most maxFileBytes */
  size: number
  /** the file went on past maxFileBytes; the rest was dropped */
  tooLarge: boolean
}

export interface StreamedUpload {
  fields: Record<string, string>
  files: StreamedFile[]
  /** removes the temporary folder and everything in it */
  cleanup: () => Promise<void>
}

const MB = 1024 * 1024
// After a refusal the rest of the body is read and dropped, at most this much and this long, then
// the connection is closed. Closing at once with bytes unread makes TCP reset the connection, and
// the client can lose the answer it was sent (the "lingering close" of RFC 9112, section 9.6).
const DRAIN_MAX = 4 * MB
const LINGER_MS = 1000
// Uploads one person may be sending at once (design value: the builder sends one batch at a time).
export const MAX_CONCURRENT_UPLOADS = 2

const sending = new Map<string, number>()

function refusal(statusCode: number, message: string) {
  return createError({ statusCode, message })
}

/**
 * For a request refused before or while its body is read: nothing more of it is kept; once the
 * answer is out, what still comes is dropped up to DRAIN_MAX or LINGER_MS, then the connection closes.
 */
export function dropBodyAfterAnswer(event: H3Event) {
  const { req, res } = event.node
  if (req.readableEnded) return
  res.once('finish', () => {
    if (req.readableEnded) return
    let dropped = 0
    const close = () => {
      clearTimeout(timer)
      req.socket?.destroy()
    }
    const timer = setTimeout(close, LINGER_MS)
    req.on('data', (chunk: Buffer) => {
      dropped += chunk.length
      if (dropped > DRAIN_MAX) close()
    })
    req.once('end', () => clearTimeout(timer))
    req.resume()
  })
}

/** Counts one upload of a person as in flight, or refuses it (429) past MAX_CONCURRENT_UPLOADS; returns the release. */
export function holdUploadSlot(personId: string): () => void {
  const now = sending.get(personId) ?? 0
  if (now >= MAX_CONCURRENT_UPLOADS) {
    throw refusal(429, `You are already sending ${now} uploads. Wait until one of them has finished, then send this one again.`)
  }
  sending.set(personId, now + 1)
  let released = false
  return () => {
    if (released) return
    released = true
    const left = (sending.get(personId) ?? 1) - 1
    if (left > 0) sending.set(personId, left)
    else sending.delete(personId)
  }
}

/** Reads the request's multipart body into a temporary folder; throws 400 or 413 with the folder removed. */
export async function streamUpload(event: H3Event, caps: UploadCaps): Promise<StreamedUpload> {
  const req = event.node.req
  const tooMany = `files: Upload at most ${caps.maxFiles} pictures at a time.`
  const tooBig = `One upload may carry at most ${caps.maxFiles} files of ${caps.maxFileBytes / MB} MB. Send fewer files at a time.`
  const declared = Number.parseInt(req.headers['content-length'] || '', 10)
  if (declared > caps.maxRequestBytes) {
    dropBodyAfterAnswer(event)
    throw refusal(413, tooBig)
  }
  let parser: busboy.Busboy
  try {
    parser = busboy({
      headers: req.headers,
      // One more file than allowed is what trips 'filesLimit'; fields are short ids and names.
      limits: { files: caps.maxFiles, fileSize: caps.maxFileBytes, fields: 16, fieldSize: 1024, parts: caps.maxFiles + 16 },
    })
  }
  catch {
    dropBodyAfterAnswer(event)
    throw refusal(400, 'The upload could not be read: send the pictures as multipart/form-data.')
  }

  const dir = await mkdtemp(join(tmpdir(), 'glint-upload-'))
  const cleanup = () => rm(dir, { recursive: true, force: true })
  const fields: Record<string, string> = {}
  const files: StreamedFile[] = []
  const writes: Promise<void>[] = []
  let received = 0
  // File streams still being written; a refusal mid-stream ends them so their writes settle.
  const open = new Set<Readable>()

  try {
    await new Promise<void>((resolve, reject) => {
      let settled = false
      const finish = (error?: Error) => {
        if (settled) return
        settled = true
        req.off('data', count).off('aborted', onAborted)
        if (!error) return resolve()
        req.unpipe(parser)
        parser.removeAllListeners('file').on('file', (_n: string, s: NodeJS.ReadableStream) => s.resume())
        // Destroyed with the refusal, so their pipelines settle (a plain destroy left some pending).
        for (const s of open) s.destroy(error)
        dropBodyAfterAnswer(event)
        reject(error)
      }
      const count = (chunk: Buffer) => {
        received += chunk.length
        if (received > caps.maxRequestBytes) finish(refusal(413, tooBig))
      }
      const onAborted = () => finish(refusal(400, 'The upload ended before all of it arrived. Choose the files again and retry.'))

      parser.on('file', (name, stream, info) => {
        if (settled || name !== caps.fileField) {
          stream.resume()
          return
        }
        const file: StreamedFile = { name: info.filename || `file ${files.length + 1}`, path: join(dir, String(files.length)), size: 0, tooLarge: false }
        files.push(file)
        stream.on('data', (chunk: Buffer) => {
          file.size += chunk.length
        })
        // busboy stops passing a file's bytes at fileSize and drops the rest of that file.
        stream.on('limit', () => {
          file.tooLarge = true
        })
        open.add(stream)
        writes.push(pipeline(stream, createWriteStream(file.path)).finally(() => open.delete(stream)))
      })
      parser.on('field', (name, value) => {
        if (!(name in fields)) fields[name] = value
      })
      parser.on('filesLimit', () => finish(refusal(413, tooMany)))
      parser.on('partsLimit', () => finish(refusal(413, tooMany)))
      parser.on('fieldsLimit', () => finish(refusal(400, 'The upload carries more fields than files, targetTypeId and aspect.')))
      parser.on('error', () => finish(refusal(400, 'The upload could not be read. Choose the files again and retry.')))
      parser.on('close', () => finish())
      req.on('data', count).on('aborted', onAborted)
      req.pipe(parser)
    })
    await Promise.all(writes)
  }
  catch (error) {
    await Promise.allSettled(writes)
    await cleanup()
    throw error
  }
  return { fields, files, cleanup }
}
