import { IdParam } from '#shared/schemas/params'

// A lead of the trainee's crew signs off a finished attempt, once.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'lead')
  const attempt = signOffCheckAttempt(useSqlite(), actor, id)
  audit(actor, 'check.sign-off', 'check_attempt', id, { checkId: attempt.checkId, userId: attempt.userId, score: attempt.score, passed: attempt.passed })
  return attempt
})
