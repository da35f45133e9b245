import { desc, eq } from 'drizzle-orm'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  return useDb().select({
    id: tables.auditLog.id, action: tables.auditLog.action, subjectType: tables.auditLog.subjectType,
    subjectId: tables.auditLog.subjectId, detail: tables.auditLog.detail, createdAt: tables.auditLog.createdAt,
    actorName: tables.users.name,
  }).from(tables.auditLog).leftJoin(tables.users, eq(tables.users.id, tables.auditLog.actorId))
    .orderBy(desc(tables.auditLog.createdAt)).limit(500).all()
})
