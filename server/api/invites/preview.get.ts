import { eq } from 'drizzle-orm'
import { z } from 'zod'
import { Token } from '#shared/schemas/auth'
import { openInvitation } from '../../domain/invitation-lookup'

export default defineEventHandler(async (event) => {
  const { token } = await queryInput(event, z.object({ token: Token }))
  const inv = openInvitation(token)
  const db = useDb()
  const crew = inv.crewId ? db.select({ name: tables.crews.name }).from(tables.crews).where(eq(tables.crews.id, inv.crewId)).get() : undefined
  const by = db.select({ name: tables.users.name }).from(tables.users).where(eq(tables.users.id, inv.invitedBy)).get()
  return { email: inv.email, role: inv.role, crewName: crew?.name ?? null, invitedBy: by?.name ?? null, expiresAt: inv.expiresAt }
})
