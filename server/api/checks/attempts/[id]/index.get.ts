import { IdParam } from '#shared/schemas/params'
import { requireResultAccess, checkResult } from '../../../../domain/checks'

// A check result: the trainee after finishing, a lead of their crew, the check's instructor, an admin.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireActor(event)
  const sqlite = useSqlite()
  requireResultAccess(sqlite, actor, id)
  return checkResult(sqlite, id)
})
