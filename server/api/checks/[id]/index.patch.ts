import { CheckPatch } from '#shared/schemas/checks'
import { IdParam } from '#shared/schemas/params'
import { updateCheck } from '../../../domain/checks'

// Its instructor changes a check while nobody has taken it (409 after), its due date until it is retired.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'instructor')
  const patch = await readInput(event, CheckPatch)
  const check = updateCheck(actor, id, patch)
  audit(actor, 'check.update', 'check', id, { ...patch })
  return check
})
