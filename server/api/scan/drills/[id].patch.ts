import { IdParam } from '#shared/schemas/params'
import { ScanDrillPatch } from '#shared/schemas/scan'
import { updateScanDrill } from '../../../domain/scan'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'instructor', 'admin')
  const { id } = await paramsInput(event, IdParam)
  const patch = await readInput(event, ScanDrillPatch)
  return updateScanDrill(actor, id, patch)
})
