import { DigestRunBody } from '#shared/schemas/stats'
import { runDigests } from '../../domain/digests'

// Sends the weekly digests or the daily reminders now (the admin's button; the schedule does it too).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { kind, now } = await readInput(event, DigestRunBody)
  const result = await runDigests(kind, now ? Date.parse(now) : Date.now(), { baseUrl: appUrl(), actorId: actor.id })
  return result
})
