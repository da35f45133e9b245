import { asc, count, eq, inArray } from 'drizzle-orm'

// Admins see every crew; everyone else the crews they belong to.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const db = useDb()
  const q = db.select({ id: tables.crews.id, name: tables.crews.name, members: count(tables.memberships.userId) })
    .from(tables.crews).leftJoin(tables.memberships, eq(tables.memberships.crewId, tables.crews.id))
    .groupBy(tables.crews.id).orderBy(asc(tables.crews.name))
  if (actor.roles.includes('admin')) return q.all()
  if (!actor.crewIds.length) return []
  return db.select({ id: tables.crews.id, name: tables.crews.name, members: count(tables.memberships.userId) })
    .from(tables.crews).leftJoin(tables.memberships, eq(tables.memberships.crewId, tables.crews.id))
    .where(inArray(tables.crews.id, actor.crewIds)).groupBy(tables.crews.id).orderBy(asc(tables.crews.name)).all()
})
