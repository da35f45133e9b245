import { endSessions } from '../../domain/people'

// Sign-out raises the session version, so every copy of the old cookie stops working.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  endSessions(actor.id)
  await clearUserSession(event)
  return { ok: true }
})
