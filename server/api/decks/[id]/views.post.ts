import { eq } from 'drizzle-orm'
import { UPLOAD_LIMITS, UploadFields } from '#shared/schemas/decks'
import { IdParam } from '#shared/schemas/params'

const MB = 1024 * 1024

// Uploads views of a target type at one aspect. The body is bounded by its Content-Length before
// it is read; each file is sniffed before anything is decoded. Rule: when every file is refused,
// the request fails with the first file's status and every file's reason; when at least one file
// is taken, the answer is 202 and each refused file gets a failed job with its reason.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, deck } = await requireOwnDeck(event, id)

  if (!getRequestHeader(event, 'content-type')?.startsWith('multipart/form-data')) {
    throw createError({ statusCode: 415, message: 'Send the pictures as multipart/form-data (fields files, targetTypeId and aspect).' })
  }
  // The body middleware counts the stream against the same cap; this refuses a declared size first.
  const declared = Number(getRequestHeader(event, 'content-length') || 0)
  if (declared > UPLOAD_LIMITS.maxRequestBytes) {
    throw createError({ statusCode: 413, message: `One upload may carry at most ${UPLOAD_LIMITS.maxFiles} files of ${UPLOAD_LIMITS.maxFileBytes / MB} MB. Send fewer files at a time.` })
  }
  await spend('uploadAccount', actor.id)

  const parts = await readMultipartFormData(event).catch(() => undefined)
  if (!parts) throw createError({ statusCode: 400, message: 'The upload could not be read. Choose the files again and retry.' })
  const field = (name: string) => {
    const part = parts.find(p => p.name === name && p.filename === undefined)
    return part ? part.data.toString('utf8') : undefined
  }
  const fields = validator(UploadFields)({ targetTypeId: field('targetTypeId'), aspect: field('aspect') })
  const files = parts.filter(p => p.name === 'files')
  if (!files.length) throw createError({ statusCode: 400, message: 'files: Choose at least one PNG, JPEG or WebP picture.' })
  if (files.length > UPLOAD_LIMITS.maxFiles) {
    throw createError({ statusCode: 413, message: `files: Upload at most ${UPLOAD_LIMITS.maxFiles} pictures at a time.` })
  }
  const type = useDb().select().from(tables.targetTypes).where(eq(tables.targetTypes.id, fields.targetTypeId)).get()
  if (!type || type.deckId !== deck.id) throw createError({ statusCode: 404, message: 'targetTypeId: No such target type in this deck.' })

  const sniffed = sniffFiles(files.map((f, i) => ({ name: f.filename || `file ${i + 1}`, bytes: new Uint8Array(f.data.buffer, f.data.byteOffset, f.data.byteLength) })), UPLOAD_LIMITS.maxFileBytes)
  if (sniffed.every(f => f.problem)) {
    const first = sniffed[0]!.problem!
    const message = sniffed.length === 1 ? first.message : sniffed.map(f => `${f.name}: ${f.problem!.message}`).join(' ')
    throw createError({ statusCode: first.status, message, data: { files: sniffed.map(f => ({ name: f.name, ...f.problem })) } })
  }
  const jobIds = startRenderJobs(actor, deck.id, type, fields.aspect, sniffed)
  setResponseStatus(event, 202)
  return { jobs: jobIds.map(jobId => ({ id: jobId })) }
})
