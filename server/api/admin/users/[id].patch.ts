import { eq, sql } from 'drizzle-orm'
import { UserPatch } from '#shared/schemas/auth'
import { IdParam } from '#shared/schemas/params'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { id } = await paramsInput(event, IdParam)
  const patch = await readInput(event, UserPatch)
  const db = useDb()
  const user = db.select().from(tables.users).where(eq(tables.users.id, id)).get()
  if (!user) throw createError({ statusCode: 404, message: 'No such person.' })
  if (id === actor.id && (patch.disabled || (patch.roles && !patch.roles.includes('admin')))) {
    throw createError({ statusCode: 400, message: 'You cannot disable yourself or remove your own admin role.' })
  }
  db.transaction((tx) => {
    const set: Partial<typeof tables.users.$inferInsert> = { updatedAt: Date.now() }
    if (patch.name !== undefined) set.name = patch.name
    if (patch.disabled !== undefined) set.disabled = patch.disabled
    tx.update(tables.users).set(patch.disabled ? { ...set, sessionVersion: sql`${tables.users.sessionVersion} + 1` } : set)
      .where(eq(tables.users.id, id)).run()
    if (patch.roles) {
      tx.delete(tables.userRoles).where(eq(tables.userRoles.userId, id)).run()
      for (const role of new Set(patch.roles)) tx.insert(tables.userRoles).values({ userId: id, role }).run()
    }
  })
  audit(actor, 'user.update', 'user', id, patch)
  return { ok: true }
})
