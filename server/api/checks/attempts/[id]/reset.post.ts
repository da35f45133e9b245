import { IdParam } from '#shared/schemas/params'
import { resetCheckAttempt } from '../../../../domain/checks'

// A lead of the trainee's crew lets them take the check again.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'lead')
  const attempt = resetCheckAttempt(actor, id)
  audit(actor, 'check.reset', 'check_attempt', id, { checkId: attempt.checkId, userId: attempt.userId })
  return attempt
})
