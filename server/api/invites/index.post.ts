import { InviteBody } from '#shared/schemas/auth'
import { inviteProblem, issueInvitation } from '../../domain/invitations'
import { findUserByEmail } from '../../domain/people'
import { requireCrew } from '../../domain/crews'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin', 'lead', 'instructor')
  const { email, role, crewId } = await readInput(event, InviteBody)
  const problem = inviteProblem(actor, role, crewId)
  if (problem) throw createError({ statusCode: 403, message: problem })
  // No mail can carry a link without the public address: refuse (503) before anything is stored.
  appUrl()
  if (crewId) requireCrew(crewId)
  if (findUserByEmail(email)) {
    throw createError({ statusCode: 409, message: 'That address already has a Glint account. An admin adds the person to the crew on the People page.' })
  }
  await spend('inviteAccount', actor.id)
  const inv = await issueInvitation(actor, { email, role, crewId: crewId ?? null })
  audit(actor, 'invite.create', 'invitation', inv.id, { email, role, crewId, replaced: inv.replaced })
  setResponseStatus(event, 201)
  return { id: inv.id, email, role, crewId: crewId ?? null, mail: inv.mail, expiresAt: inv.expiresAt, replaced: inv.replaced }
})
