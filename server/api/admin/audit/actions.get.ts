// Every action in the audit log with how many entries it has: the audit page's filter.
import { auditActions } from '../../../domain/admin'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  return auditActions()
})
