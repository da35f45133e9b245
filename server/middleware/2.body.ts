// Every request body is read here, except an upload's (streamed by its route after authorising):
// its content type checked (415), counted from the stream against its route's cap (413 past it),
// JSON checked for NUL characters, depth and form (400), then handed to the routes' readBody.
const PAYLOAD = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
const JSON_TYPE = /^application\/(?:[\w.+-]+\+)?json\s*(?:;|$)/i
const MULTIPART_TYPE = /^multipart\/form-data\s*;/i
// A NUL character, raw or escaped (and not itself an escaped backslash followed by "u0000").
const NUL = /\0|(?<!\\)(?:\\\\)*\\u0000/i

export default defineEventHandler(async (event) => {
  if (!PAYLOAD.has(event.method) || !hasBody(event)) return
  const rule = bodyRuleFor(event.method, event.path)
  const type = getRequestHeader(event, 'content-type') ?? ''
  if (rule.type === 'multipart' && !MULTIPART_TYPE.test(type)) {
    if (rule.streamed) dropBodyAfterAnswer(event)
    throw createError({ statusCode: 415, message: 'Send the files as multipart/form-data.' })
  }
  if (rule.type === 'json' && !JSON_TYPE.test(type)) {
    throw createError({ statusCode: 415, message: 'Send the request as JSON (Content-Type: application/json).' })
  }
  // A streamed body is read by its route only after the route has authorised the request; a
  // declared size past its cap is refused first, from the header alone, for anyone.
  if (rule.streamed) {
    if (Number.parseInt(getRequestHeader(event, 'content-length') || '', 10) > rule.limit) {
      dropBodyAfterAnswer(event)
      throw createError({ statusCode: 413, message: `The request is too large (limit ${describeLimit(rule.limit)}).` })
    }
    return
  }
  // Only a signed-in person may make the server hold a body larger than the JSON cap.
  if (rule.limit > JSON_BODY_LIMIT) await requireActor(event)
  const body = await readCappedBody(event, rule.limit)
  stashBody(event, body)
  if (rule.type !== 'json' || !body.length) return
  const text = body.toString('utf8')
  if (NUL.test(text)) {
    throw createError({ statusCode: 400, message: 'The request contains a NUL character, which no field accepts.' })
  }
  if (jsonDepth(text) > JSON_MAX_DEPTH) {
    throw createError({ statusCode: 400, message: `The request JSON is nested too deeply (at most ${JSON_MAX_DEPTH} levels).` })
  }
  // Well-formed JSON for every route, also those that never read their body; the API takes
  // objects and lists only, so a bare null, number or string is refused too.
  let value: unknown
  try {
    value = JSON.parse(text)
  }
  catch {
    throw createError({ statusCode: 400, message: 'The request body is not valid JSON.' })
  }
  if (value === null || typeof value !== 'object') {
    throw createError({ statusCode: 400, message: 'The request body must be a JSON object.' })
  }
})
