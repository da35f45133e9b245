import { eq } from 'drizzle-orm'
import { PrefsPatch } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const patch = await readInput(event, PrefsPatch)
  if (Object.keys(patch).length) {
    useDb().update(tables.users).set({ ...patch, updatedAt: Date.now() }).where(eq(tables.users.id, actor.id)).run()
  }
  return meOf(actor)
})
