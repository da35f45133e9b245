import { AcceptInviteBody } from '#shared/schemas/auth'
import { findUserByEmail, meOf, requireActorFor, startSession } from '../../domain/people'
import { openInvitation } from '../../domain/invitation-lookup'
import { acceptInvitation } from '../../domain/invitations'

const TAKEN = 'That address already has a Glint account. Sign in instead.'

export default defineEventHandler(async (event) => {
  const { token, name, password } = await readInput(event, AcceptInviteBody)
  const inv = openInvitation(token)
  assertGoodPassword(password, inv.email)
  if (findUserByEmail(inv.email)) throw createError({ statusCode: 409, message: TAKEN })
  const passwordHash = await hashPassword(password)
  const outcome = acceptInvitation(inv, name, passwordHash)
  if (outcome === 'taken') throw createError({ statusCode: 409, message: TAKEN })
  if (outcome === 'used') throw createError({ statusCode: 400, message: 'This invitation was used or withdrawn a moment ago. Sign in, or ask for a new one.' })
  await startSession(event, { id: outcome.userId, sessionVersion: 1 })
  setResponseStatus(event, 201)
  return meOf(await requireActorFor(event))
})
