import { IdParam } from '#shared/schemas/params'
import { withdrawInvitation } from '../../domain/invitations'

// Withdraws a waiting invitation: its link then says so when opened.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { id } = await paramsInput(event, IdParam)
  withdrawInvitation(actor, id)
  return { ok: true }
})
