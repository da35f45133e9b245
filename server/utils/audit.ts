import type { Actor } from './gate'

// Admin and lead actions, with who, what and when (read on /admin/audit).
export function audit(actor: Actor | null, action: string, subjectType: string, subjectId: string | null, detail?: Record<string, unknown>) {
  useDb().insert(tables.auditLog).values({
    id: newId(),
    actorId: actor?.id ?? null,
    action,
    subjectType,
    subjectId,
    detail: detail ?? null,
  }).run()
}
