import { IdParam } from '#shared/schemas/params'
import { ScanDrillCrewsBody } from '#shared/schemas/scan'
import { setScanDrillCrews } from '../../../../domain/scan'

// Instructors assign their own drills to their own crews; admins any drill to any crew.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'instructor', 'admin')
  const { id } = await paramsInput(event, IdParam)
  const { crewIds } = await readInput(event, ScanDrillCrewsBody)
  return setScanDrillCrews(actor, id, crewIds)
})
