import { IdParam } from '#shared/schemas/params'

// A check result: the trainee after finishing, a lead of their crew, the check's instructor, an admin.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireActor(event)
  const sqlite = useSqlite()
  requireResultAccess(sqlite, actor, id)
  return checkResult(sqlite, id)
})
