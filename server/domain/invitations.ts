// Invitations: who may invite whom, the one working link to an address, withdrawing, accepting.
import { and, asc, desc, eq, isNull } from 'drizzle-orm'
import type { Role } from '#shared/types/roles'
import { ROLE_LABELS } from '#shared/types/roles'
import type { Actor } from '../utils/gate'
import { createError } from 'h3'
import { audit } from '../utils/audit'
import { tables, useDb } from '../utils/db'
import { hashToken, newId, newToken } from '../utils/ids'
import { appUrl, linkMail, sendMail } from '../utils/mail'

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
  const i = tables.invitations
  return useDb().select({
    id: i.id, email: i.email, role: i.role, crewId: i.crewId, crewName: tables.crews.name, invitedBy: tables.users.name,
    createdAt: i.createdAt, expiresAt: i.expiresAt,
  }).from(i).leftJoin(tables.crews, eq(tables.crews.id, i.crewId)).leftJoin(tables.users, eq(tables.users.id, i.invitedBy))
    .where(and(isNull(i.usedAt), isNull(i.revokedAt))).orderBy(desc(i.createdAt), asc(i.id)).all()
    .map(r => ({ ...r, role: r.role, expired: r.expiresAt <= now }))
}

export function pendingInvitation(id: string) {
  const inv = useDb().select().from(tables.invitations).where(eq(tables.invitations.id, id)).get()
  if (!inv) throw createError({ statusCode: 404, message: 'No such invitation.' })
  if (inv.usedAt) throw createError({ statusCode: 409, message: 'This invitation was already accepted; the person has an account.' })
  if (inv.revokedAt) throw createError({ statusCode: 409, message: inv.revokedReason === 'replaced' ? 'A newer invitation to this address replaced this one.' : 'This invitation was already withdrawn.' })
  return inv
}

/** Withdraws a waiting invitation (an admin's act): its link then says so when opened. */
export function withdrawInvitation(actor: Actor, id: string) {
  const inv = pendingInvitation(id)
  const r = useDb().update(tables.invitations).set({ revokedAt: Date.now(), revokedReason: 'revoked' })
    .where(and(eq(tables.invitations.id, id), isNull(tables.invitations.usedAt), isNull(tables.invitations.revokedAt))).run()
  if (r.changes !== 1) throw createError({ statusCode: 409, message: 'This invitation was answered or withdrawn meanwhile. Reload the list.' })
  audit(actor, 'invite.revoke', 'invitation', id, { email: inv.email, role: inv.role, crewId: inv.crewId })
}

/** What the invitation page shows before the form: to whom, as what, into which crew, from whom. */
export function invitationPreview(inv: typeof tables.invitations.$inferSelect) {
  const db = useDb()
  const crew = inv.crewId ? db.select({ name: tables.crews.name }).from(tables.crews).where(eq(tables.crews.id, inv.crewId)).get() : undefined
  const by = db.select({ name: tables.users.name }).from(tables.users).where(eq(tables.users.id, inv.invitedBy)).get()
  return { email: inv.email, role: inv.role, crewName: crew?.name ?? null, invitedBy: by?.name ?? null, expiresAt: inv.expiresAt }
}

/**
 * Claims the invitation and creates the account together: a second use finds it claimed ('used'),
 * and a second invitation to the same address, accepted at the same moment, finds the account made
 * ('taken'). Answers the new account's id when it was created.
 */
export function acceptInvitation(inv: typeof tables.invitations.$inferSelect, name: string, passwordHash: string): { userId: string } | 'taken' | 'used' {
  const userId = newId()
  return useDb().transaction((tx) => {
    if (tx.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.email, inv.email)).get()) return 'taken'
    const r = tx.update(tables.invitations).set({ usedAt: Date.now() })
      .where(and(eq(tables.invitations.id, inv.id), isNull(tables.invitations.usedAt), isNull(tables.invitations.revokedAt))).run()
    if (r.changes !== 1) return 'used'
    tx.insert(tables.users).values({ id: userId, email: inv.email, name, passwordHash }).run()
    tx.insert(tables.userRoles).values({ userId, role: inv.role }).run()
    if (inv.crewId) tx.insert(tables.memberships).values({ crewId: inv.crewId, userId }).run()
    return { userId }
  })
}
