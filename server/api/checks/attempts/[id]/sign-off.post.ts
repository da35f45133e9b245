import { SignOffBody } from '#shared/schemas/checks'
import { IdParam } from '#shared/schemas/params'
import { signOffCheckAttempt } from '../../../../domain/checks'

// A lead of the trainee's crew signs off a finished attempt, once, with an optional remark.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'lead')
  const { remark } = await readInput(event, SignOffBody)
  const attempt = signOffCheckAttempt(actor, id, Date.now(), remark ?? null)
  audit(actor, 'check.sign-off', 'check_attempt', id, {
    checkId: attempt.checkId, userId: attempt.userId, score: attempt.score, passed: attempt.passed, ...(remark ? { remark } : {}),
  })
  return attempt
})
