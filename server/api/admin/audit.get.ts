import { AuditQuery } from '#shared/schemas/admin'
import { listAudit } from '../../domain/admin'

// The audit log, newest first, filtered by action and a search, a page at a time (X-Total-Count
// holds how many matched). Each entry names the people, crews, decks and checks it points at.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const { q, action, page = 1, size = 500 } = await queryInput(event, AuditQuery)
  const { total, entries } = listAudit({ q: q ?? '', action: action ?? '', page, size })
  setResponseHeader(event, 'X-Total-Count', String(total))
  return entries
})
