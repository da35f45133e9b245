// A lead's preview of the next weekly digest of the crews they lead, and whether it is turned off.
import { previewWeeklyDigest } from '../../domain/digests'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return previewWeeklyDigest(actor.id, actor.crewIds, Date.now(), configuredPublicUrl() ?? '')
})
