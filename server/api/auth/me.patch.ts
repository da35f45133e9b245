import { eq } from 'drizzle-orm'
import { PrefsPatch } from '#shared/schemas/auth'
import { meOf } from '../../domain/people'

// The signed-in person's own name and preferences.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const patch = await readInput(event, PrefsPatch)
  if (Object.keys(patch).length) {
    useDb().update(tables.users).set({ ...patch, updatedAt: Date.now() }).where(eq(tables.users.id, actor.id)).run()
  }
  return meOf(patch.name === undefined ? actor : { ...actor, name: patch.name })
})
