import { asc } from 'drizzle-orm'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const db = useDb()
  const roles = db.select().from(tables.userRoles).all()
  const members = db.select().from(tables.memberships).all()
  return db.select({ id: tables.users.id, email: tables.users.email, name: tables.users.name, disabled: tables.users.disabled, createdAt: tables.users.createdAt })
    .from(tables.users).orderBy(asc(tables.users.name)).all()
    .map(u => ({
      ...u,
      roles: roles.filter(r => r.userId === u.id).map(r => r.role),
      crewIds: members.filter(m => m.userId === u.id).map(m => m.crewId),
    }))
})
