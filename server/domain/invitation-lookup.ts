import { eq } from 'drizzle-orm'
import { createError } from 'h3'
import { tables, useDb } from '../utils/db'
import { hashToken } from '../utils/ids'

// The invitation behind a link, or a 400 that says why the link no longer works (shown before the form).
export function openInvitation(token: string) {
  const inv = useDb().select().from(tables.invitations).where(eq(tables.invitations.tokenHash, hashToken(token))).get()
  const refuse = (message: string, reason: string) => createError({ statusCode: 400, message, data: { reason } })
  if (!inv) throw refuse('This invitation link is not valid. Check that the whole link was copied, or ask for a new one.', 'unknown')
  if (inv.usedAt) throw refuse('This invitation was already used to make an account. Sign in with that account instead.', 'used')
  if (inv.revokedReason === 'replaced') throw refuse('A newer invitation was sent to this address. Use the link in the latest mail.', 'replaced')
  if (inv.revokedAt) throw refuse('This invitation was withdrawn. Ask the person who invited you for a new one.', 'revoked')
  if (inv.expiresAt <= Date.now()) throw refuse('This invitation has expired. Ask the person who invited you for a new one.', 'expired')
  return inv
}
