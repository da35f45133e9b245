// Trainees and leads: drills assigned to their crews; instructors also their own; admins all.
import { listScanDrills } from '../../../domain/scan'

export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  return listScanDrills(actor)
})
