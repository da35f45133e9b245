import { and, eq, isNull } from 'drizzle-orm'
import { IdParam } from '#shared/schemas/params'
import { pendingInvitation } from '../../domain/invitations'

// Withdraws a waiting invitation: its link then says so when opened.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { id } = await paramsInput(event, IdParam)
  const inv = pendingInvitation(id)
  const r = useDb().update(tables.invitations).set({ revokedAt: Date.now(), revokedReason: 'revoked' })
    .where(and(eq(tables.invitations.id, id), isNull(tables.invitations.usedAt), isNull(tables.invitations.revokedAt))).run()
  if (r.changes !== 1) throw createError({ statusCode: 409, message: 'This invitation was answered or withdrawn meanwhile. Reload the list.' })
  audit(actor, 'invite.revoke', 'invitation', id, { email: inv.email, role: inv.role, crewId: inv.crewId })
  return { ok: true }
})
