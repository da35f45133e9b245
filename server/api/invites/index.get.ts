// The invitations still waiting for an answer (admins): resend or withdraw them from the People page.
import { pendingInvitations } from '../../domain/invitations'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  return pendingInvitations()
})
