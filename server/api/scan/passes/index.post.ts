import { ScanPassBody } from '#shared/schemas/scan'

// The server scores the pass from its samples, contacts and reports; a score sent along is ignored.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const body = await readInput(event, ScanPassBody)
  const pass = recordScanPass(actor, body)
  setResponseStatus(event, 201)
  return pass
})
