import type { H3Event } from 'h3'
import { UPLOAD_LIMITS } from '#shared/schemas/decks'
import { SCAN_MAX_REPORTS, SCAN_MAX_SAMPLES } from '#shared/schemas/scan'

const KB = 1024
const MB = 1024 * KB

export interface BodyRule {
  limit: number
  type: 'json' | 'multipart'
  /** the route authorises first, then streams the body itself with this limit (never read here) */
  streamed?: boolean
}

// JSON bodies are small (every string field has a maximum length in its zod schema).
export const JSON_BODY_LIMIT = 64 * KB
// Past the limit the rest of a body is read and dropped (so the client reads the 413) up to this
// much more; beyond it the connection is closed at once.
const DRAIN_MAX = 4 * MB

// Routes whose bodies are larger by design, sized from the limits their schemas enforce.
const LARGE_BODIES: { method: string, path: RegExp, rule: BodyRule }[] = [
  // Uploads of views: every file at its largest plus the multipart framing and fields, streamed to
  // disk by the route once the deck's owner is authorised (server/utils/upload-stream.ts).
  { method: 'POST', path: /^\/api\/decks\/[^/]+\/views\/?$/, rule: { limit: UPLOAD_LIMITS.maxRequestBytes, type: 'multipart', streamed: true } },
  // A scan pass: up to SCAN_MAX_SAMPLES samples of at most about 100 bytes of JSON each, plus the reports.
  {
    method: 'POST', path: /^\/api\/scan\/passes\/?$/,
    rule: { limit: SCAN_MAX_SAMPLES * 100 + SCAN_MAX_REPORTS * 500 + JSON_BODY_LIMIT, type: 'json' },
  },
]

// Which limit and content type a request's body must keep to.
export function bodyRuleFor(method: string, path: string): BodyRule {
  const pathname = path.split('?')[0] ?? ''
  return LARGE_BODIES.find(r => r.method === method && r.path.test(pathname))?.rule ?? { limit: JSON_BODY_LIMIT, type: 'json' }
}

export function describeLimit(bytes: number) {
  return bytes >= MB ? `${Math.round(bytes / MB)} MB` : `${Math.round(bytes / KB)} KB`
}

function tooLarge(event: H3Event, limit: number, close: boolean) {
  if (close) setResponseHeader(event, 'Connection', 'close')
  return createError({ statusCode: 413, message: `The request is too large (limit ${describeLimit(limit)}).` })
}

export function hasBody(event: H3Event) {
  const headers = event.node.req.headers
  return Number.parseInt(headers['content-length'] || '0', 10) > 0 || !!headers['transfer-encoding']
}

// Reads the request body from the stream with a running byte count; the Content-Length header
// is only used to refuse early, never trusted as the size.
export function readCappedBody(event: H3Event, limit: number): Promise<Buffer> {
  const req = event.node.req
  const declared = Number.parseInt(req.headers['content-length'] || '', 10)
  if (declared > limit + DRAIN_MAX) return Promise.reject(tooLarge(event, limit, true))
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let total = 0
    let done = false
    const finish = (fn: () => void) => {
      if (done) return
      done = true
      req.off('data', onData).off('end', onEnd).off('error', onError).off('close', onClose)
      fn()
    }
    const onData = (chunk: Buffer) => {
      total += chunk.length
      if (total > limit + DRAIN_MAX) {
        req.pause()
        return finish(() => reject(tooLarge(event, limit, true)))
      }
      if (total > limit) chunks.length = 0
      else chunks.push(chunk)
    }
    const onEnd = () => finish(() => total > limit ? reject(tooLarge(event, limit, false)) : resolve(Buffer.concat(chunks, total)))
    const onError = () => finish(() => reject(createError({ statusCode: 400, message: 'The request body could not be read.' })))
    const onClose = () => finish(() => reject(createError({ statusCode: 400, message: 'The request ended before its body was complete.' })))
    req.on('data', onData).on('end', onEnd).on('error', onError).on('close', onClose)
  })
}

// JSON nested deeper than any schema of the API goes; refused before anything parses it.
export const JSON_MAX_DEPTH = 32

// How deep the arrays and objects of a JSON text nest (brackets inside strings do not count).
export function jsonDepth(text: string) {
  let depth = 0
  let max = 0
  let inString = false
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i)
    if (inString) {
      if (c === 92) i++
      else if (c === 34) inString = false
    }
    else if (c === 34) inString = true
    else if (c === 91 || c === 123) max = Math.max(max, ++depth)
    else if (c === 93 || c === 125) depth--
  }
  return max
}

// h3 (v1) reads a body from this symbol first (readRawBody, readBody, readMultipartFormData),
// so routes get the counted buffer and never the raw stream.
const RAW_BODY = Symbol.for('h3RawBody')

export function stashBody(event: H3Event, body: Buffer) {
  (event.node.req as unknown as Record<symbol, unknown>)[RAW_BODY] = Promise.resolve(body)
}
