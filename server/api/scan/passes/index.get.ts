import { ScanPassesQuery } from '#shared/schemas/scan'
import { seesScanPasses } from '../../../domain/policy'
import { listScanPasses } from '../../../domain/scan'

// Own passes; a lead or instructor those of a member of their crews; an admin anyone's.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const { userId, limit } = await queryInput(event, ScanPassesQuery)
  const who = userId ?? actor.id
  if (!seesScanPasses(actor, who)) throw createError({ statusCode: 403, message: 'You can see the passes of your own crews only.' })
  return listScanPasses(who, limit)
})
