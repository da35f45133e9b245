import { IdParam } from '#shared/schemas/params'
import type { Role } from '#shared/types/roles'
import { issueInvitation, pendingInvitation } from '../../../domain/invitations'
import { findUserByEmail } from '../../../domain/people'

// Sends a waiting invitation again with a new link; the old link stops working (replaced).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { id } = await paramsInput(event, IdParam)
  const old = pendingInvitation(id)
  appUrl()
  if (findUserByEmail(old.email)) throw createError({ statusCode: 409, message: 'That address has a Glint account now; withdraw this invitation.' })
  await spend('inviteAccount', actor.id)
  const inv = await issueInvitation(actor, { email: old.email, role: old.role as Role, crewId: old.crewId })
  audit(actor, 'invite.resend', 'invitation', inv.id, { email: old.email, role: old.role, crewId: old.crewId, replacedId: id })
  setResponseStatus(event, 201)
  return { id: inv.id, email: old.email, mail: inv.mail, expiresAt: inv.expiresAt }
})
