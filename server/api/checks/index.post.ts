import { CheckBody } from '#shared/schemas/checks'
import { createCheck } from '../../domain/checks'

// An instructor defines a check on a published deck of their own.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'instructor')
  const input = await readInput(event, CheckBody)
  const check = createCheck(actor, input)
  audit(actor, 'check.create', 'check', check.id, { ...input })
  setResponseStatus(event, 201)
  return check
})
