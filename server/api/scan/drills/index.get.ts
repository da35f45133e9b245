// Trainees and leads: drills assigned to their crews; instructors also their own; admins all.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  return listScanDrills(actor)
})
