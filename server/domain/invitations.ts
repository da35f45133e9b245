import { and, eq, isNull } from 'drizzle-orm'
import type { Role } from '#shared/types/roles'
import { ROLE_LABELS } from '#shared/types/roles'
import type { Actor } from '../utils/gate'

export const INVITE_TTL_MS = 7 * 24 * 60 * 60 * 1000

// Who may invite whom: admin anyone anywhere; a lead trainees and instructors into own crews;
// an instructor trainees into own crews.
export function inviteProblem(actor: Actor, role: Role, crewId: string | null | undefined): string | null {
  if (actor.roles.includes('admin')) return null
  const allowed: Role[] = actor.roles.includes('lead') ? ['trainee', 'instructor'] : actor.roles.includes('instructor') ? ['trainee'] : []
  if (!allowed.length) return 'Only admins, leads and instructors can invite people.'
  if (!allowed.includes(role)) return `You can invite only as ${allowed.join(' or ')}.`
  if (!crewId) return 'Choose one of your crews for the invitation.'
  if (!actor.crewIds.includes(crewId)) return 'You can invite only into your own crews.'
  return null
}

// Makes the one working invitation to an address: any earlier unused link to it stops working
// (marked replaced) in the same transaction, then the mail goes out with the new link.
export async function issueInvitation(actor: Actor, input: { email: string, role: Role, crewId: string | null }) {
  const db = useDb()
  const crew = input.crewId ? db.select().from(tables.crews).where(eq(tables.crews.id, input.crewId)).get() : undefined
  if (input.crewId && !crew) throw createError({ statusCode: 404, message: 'No such crew.' })
  const base = appUrl()
  const token = newToken()
  const id = newId()
  const now = Date.now()
  const expiresAt = now + INVITE_TTL_MS
  const replaced = db.transaction((tx) => {
    const r = tx.update(tables.invitations).set({ revokedAt: now, revokedReason: 'replaced' })
      .where(and(eq(tables.invitations.email, input.email), isNull(tables.invitations.usedAt), isNull(tables.invitations.revokedAt))).run()
    tx.insert(tables.invitations).values({
      id, tokenHash: hashToken(token), email: input.email, role: input.role, crewId: input.crewId, invitedBy: actor.id, expiresAt,
    }).run()
    return r.changes
  })
  const mail = await sendMail(linkMail({
    to: input.email,
    subject: `${actor.name} invites you to Glint`,
    lines: [
      `${actor.name} invites you to Glint as ${ROLE_LABELS[input.role].toLowerCase()}${crew ? ` in the crew ${crew.name}` : ''}.`,
      'Glint drills the recognition of aircraft and vessels a few minutes a day. The link works once, for seven days.',
    ],
    link: `${base}/invite?token=${token}`,
    linkLabel: 'Accept the invitation',
  }))
  return { id, expiresAt, replaced, mail: mail.status }
}

export interface PendingInvitation {
  id: string
  email: string
  role: Role
  crewId: string | null
  crewName: string | null
  invitedBy: string | null
  createdAt: number
  expiresAt: number
  expired: boolean
}

// Invitations not used, withdrawn or replaced, newest first (expired ones too: they can be sent again).
export function pendingInvitations(): PendingInvitation[] {
  const now = Date.now()
  const rows = useSqlite().prepare(`SELECT i.id, i.email, i.role, i.crew_id AS crewId, c.name AS crewName, u.name AS invitedBy,
    i.created_at AS createdAt, i.expires_at AS expiresAt FROM invitations i LEFT JOIN crews c ON c.id = i.crew_id
    LEFT JOIN users u ON u.id = i.invited_by WHERE i.used_at IS NULL AND i.revoked_at IS NULL ORDER BY i.created_at DESC, i.id`)
    .all() as Omit<PendingInvitation, 'expired'>[]
  return rows.map(r => ({ ...r, expired: r.expiresAt <= now }))
}

export function pendingInvitation(id: string) {
  const inv = useDb().select().from(tables.invitations).where(eq(tables.invitations.id, id)).get()
  if (!inv) throw createError({ statusCode: 404, message: 'No such invitation.' })
  if (inv.usedAt) throw createError({ statusCode: 409, message: 'This invitation was already accepted; the person has an account.' })
  if (inv.revokedAt) throw createError({ statusCode: 409, message: inv.revokedReason === 'replaced' ? 'A newer invitation to this address replaced this one.' : 'This invitation was already withdrawn.' })
  return inv
}
