import { CrewMemberParams } from '#shared/schemas/params'
import { removeMember } from '../../../../domain/crews'

export default defineEventHandler(async (event) => {
  const { id, userId } = await paramsInput(event, CrewMemberParams)
  const actor = await requireCrewRole(event, id, 'lead')
  removeMember(actor, id, userId)
  return { ok: true }
})
