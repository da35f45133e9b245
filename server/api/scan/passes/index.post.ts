import { ScanPassBody } from '#shared/schemas/scan'
import { recordScanPass } from '../../../domain/scan'

// The server rebuilds the pass's scene from its start and scores the samples and reports against
// it; a score, scene or settings sent along are never read.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const body = await readInput(event, ScanPassBody)
  await spend('scanAccount', actor.id, 'scan passes')
  const pass = recordScanPass(actor, body)
  setResponseStatus(event, 201)
  return pass
})
