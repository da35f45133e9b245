import { ScanPassStartBody } from '#shared/schemas/scan'
import { startScanPass } from '../../../domain/scan'

// Starts a pass: the server draws its seed and keeps its settings; the pass is sent once to POST /api/scan/passes.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const body = await readInput(event, ScanPassStartBody)
  await spend('scanAccount', actor.id, 'scan passes')
  const start = startScanPass(actor, body)
  setResponseStatus(event, 201)
  return start
})
