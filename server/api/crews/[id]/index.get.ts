import { asc, eq } from 'drizzle-orm'
import { IdParam } from '#shared/schemas/params'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  await requireCrewRole(event, id, 'lead', 'instructor')
  const db = useDb()
  const crew = db.select().from(tables.crews).where(eq(tables.crews.id, id)).get()!
  const roles = db.select().from(tables.userRoles).all()
  const members = db.select({ id: tables.users.id, name: tables.users.name, email: tables.users.email, disabled: tables.users.disabled })
    .from(tables.memberships).innerJoin(tables.users, eq(tables.users.id, tables.memberships.userId))
    .where(eq(tables.memberships.crewId, id)).orderBy(asc(tables.users.name)).all()
    .map(m => ({ ...m, roles: roles.filter(r => r.userId === m.id).map(r => r.role) }))
  return {
    id: crew.id,
    name: crew.name,
    standard: { minAccuracy: crew.minAccuracy, minCallsPerTrack: crew.minCallsPerTrack, windowDays: crew.windowDays, offlineCounts: crew.offlineCounts },
    members,
  }
})
