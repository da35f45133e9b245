import { MemberBody } from '#shared/schemas/auth'
import { IdParam } from '#shared/schemas/params'
import { addMember } from '../../../../domain/crews'

// An admin adds an existing account to a crew. A lead may not: joining a crew opens the person's
// reports and checks to its lead, so a person joins only by an admin's act or by accepting an invitation.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireActor(event)
  if (!hasRole(actor, 'admin')) {
    throw createError({ statusCode: 403, message: 'Only an admin can add an existing person to a crew; send them an invitation to the crew instead.' })
  }
  await requireCrewRole(event, id, 'admin')
  const { userId } = await readInput(event, MemberBody)
  addMember(actor, id, userId)
  return { ok: true }
})
