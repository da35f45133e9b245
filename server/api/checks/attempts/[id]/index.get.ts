import { IdParam } from '#shared/schemas/params'
import { readCheckResult } from '../../../../domain/checks'

// A check result: the trainee after finishing, a lead of their crew, the check's instructor, an admin.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireActor(event)
  return readCheckResult(actor, id)
})
