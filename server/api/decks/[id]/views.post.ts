import { readFile } from 'node:fs/promises'
import { UPLOAD_LIMITS, UploadFields } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'
import type { SniffedFile } from '../../../utils/jobs'
import type { StreamedUpload } from '../../../utils/upload-stream'
import { requireOwnDeck, targetTypeOfDeck } from '../../../domain/decks'

const MB = 1024 * 1024

// Uploads views of a target type at one aspect. The instructor who owns the deck is authorised
// before a byte of the body is read; the body is then streamed to disk with its caps enforced as
// it arrives (server/utils/upload-stream.ts), and each file is sniffed before anything is decoded.
// Rule: when every file is refused, the request fails with the first file's status and every
// file's reason; when at least one file is taken, the answer is 202 and each refused file gets a
// failed job with its reason.
export default defineEventHandler(async (event) => {
  let release: (() => void) | undefined
  let upload: StreamedUpload | undefined
  let reading = false
  try {
    const { id } = await paramsInput(event, IdParam)
    const { actor, deck } = await requireOwnDeck(event, id)
    if (!getRequestHeader(event, 'content-type')?.startsWith('multipart/form-data')) {
      throw createError({ statusCode: 415, message: 'Send the pictures as multipart/form-data (fields files, targetTypeId and aspect).' })
    }
    release = holdUploadSlot(actor.id)
    await spend('uploadAccount', actor.id)
    reading = true
    upload = await streamUpload(event, { fileField: 'files', ...UPLOAD_LIMITS })

    const fields = validator(UploadFields)({ targetTypeId: upload.fields.targetTypeId, aspect: upload.fields.aspect })
    if (!upload.files.length) throw createError({ statusCode: 400, message: 'files: Choose at least one PNG, JPEG or WebP picture.' })
    const type = targetTypeOfDeck(deck, fields.targetTypeId)

    // One file at a time from disk (each at most maxFileBytes); a file cut at the cap is refused unread.
    const sniffed: SniffedFile[] = []
    for (const file of upload.files) {
      if (file.tooLarge) {
        sniffed.push({ name: file.name, bytes: new Uint8Array(0), problem: { status: 413, message: `The file is larger than ${UPLOAD_LIMITS.maxFileBytes / MB} MB, the limit. Save it smaller and try again.` } })
        continue
      }
      const bytes = await readFile(file.path)
      sniffed.push(...sniffFiles([{ name: file.name, bytes: new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength) }], UPLOAD_LIMITS.maxFileBytes))
    }
    if (sniffed.every(f => f.problem)) {
      const first = sniffed[0]!.problem!
      const message = sniffed.length === 1 ? first.message : sniffed.map(f => `${f.name}: ${f.problem!.message}`).join(' ')
      throw createError({ statusCode: first.status, message, data: { files: sniffed.map(f => ({ name: f.name, ...f.problem })) } })
    }
    const jobIds = startRenderJobs(actor, deck.id, type, fields.aspect, sniffed)
    setResponseStatus(event, 202)
    return { jobs: jobIds.map(jobId => ({ id: jobId })) }
  }
  catch (error) {
    // Refused before the body was read (sign-in, role, deck, 429, rate limit): it is never read.
    if (!reading) dropBodyAfterAnswer(event)
    throw error
  }
  finally {
    release?.()
    await upload?.cleanup()
  }
})
