import { and, eq, gt, isNull } from 'drizzle-orm'

export function openInvitation(token: string) {
  const db = useDb()
  const inv = db.select().from(tables.invitations).where(and(
    eq(tables.invitations.tokenHash, hashToken(token)),
    isNull(tables.invitations.usedAt),
    gt(tables.invitations.expiresAt, Date.now()),
  )).get()
  if (!inv) throw createError({ statusCode: 400, message: 'This invitation has expired or was already used. Ask for a new one.' })
  return inv
}
