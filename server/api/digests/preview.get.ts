// A lead's preview of the next weekly digest of the crews they lead, and whether it is turned off.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return previewWeeklyDigest(actor.id, actor.crewIds, Date.now(), configuredPublicUrl() ?? '')
})
