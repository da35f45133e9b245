import { eq, sql } from 'drizzle-orm'

// Sign-out raises the session version, so every copy of the old cookie stops working.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  useDb().update(tables.users).set({ sessionVersion: sql`${tables.users.sessionVersion} + 1`, updatedAt: Date.now() })
    .where(eq(tables.users.id, actor.id)).run()
  await clearUserSession(event)
  return { ok: true }
})
