import { ScanDrillBody } from '#shared/schemas/scan'
import { createScanDrill } from '../../../domain/scan'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'instructor', 'admin')
  const { title, settings } = await readInput(event, ScanDrillBody)
  setResponseStatus(event, 201)
  return createScanDrill(actor, title, settings)
})
