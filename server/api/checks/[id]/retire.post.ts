import { IdParam } from '#shared/schemas/params'
import { retireCheck } from '../../../domain/checks'

// Its instructor retires a check: no longer offered, kept with its attempts and results.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'instructor')
  const check = retireCheck(actor, id)
  audit(actor, 'check.retire', 'check', id, { title: check.title, attempts: check.attempts })
  return check
})
