import { eq } from 'drizzle-orm'
import { InviteBody } from '#shared/schemas/auth'
import { ROLE_LABELS } from '#shared/types/roles'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin', 'lead', 'instructor')
  const { email, role, crewId } = await readInput(event, InviteBody)
  const problem = inviteProblem(actor, role, crewId)
  if (problem) throw createError({ statusCode: 403, message: problem })
  const base = appUrl()
  const db = useDb()
  const crew = crewId ? db.select().from(tables.crews).where(eq(tables.crews.id, crewId)).get() : undefined
  if (crewId && !crew) throw createError({ statusCode: 404, message: 'No such crew.' })
  if (findUserByEmail(email)) {
    throw createError({ statusCode: 409, message: 'That address already has a Glint account. Add the person to the crew instead.' })
  }
  await spend('inviteAccount', actor.id)
  const token = newToken()
  const id = newId()
  db.insert(tables.invitations).values({
    id, tokenHash: hashToken(token), email, role, crewId: crewId ?? null, invitedBy: actor.id, expiresAt: Date.now() + INVITE_TTL_MS,
  }).run()
  audit(actor, 'invite.create', 'invitation', id, { email, role, crewId })
  const mail = await sendMail(linkMail({
    to: email,
    subject: `${actor.name} invites you to Glint`,
    lines: [
      `${actor.name} invites you to Glint as ${ROLE_LABELS[role].toLowerCase()}${crew ? ` in the crew ${crew.name}` : ''}.`,
      'Glint drills the recognition of aircraft and vessels a few minutes a day. The link works once, for seven days.',
    ],
    link: `${base}/invite?token=${token}`,
    linkLabel: 'Accept the invitation',
  }))
  setResponseStatus(event, 201)
  return { id, email, role, crewId: crewId ?? null, mail: mail.status, expiresAt: Date.now() + INVITE_TTL_MS }
})
