import { WithdrawSignOffBody } from '#shared/schemas/checks'
import { IdParam } from '#shared/schemas/params'
import { withdrawSignOff } from '../../../../domain/checks'

// A lead of the trainee's crew withdraws a sign-off, saying why; audited with who signed it first.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'lead')
  const { reason } = await readInput(event, WithdrawSignOffBody)
  const { before, after } = withdrawSignOff(actor, id, reason)
  audit(actor, 'check.sign-off.withdraw', 'check_attempt', id, {
    checkId: after.checkId, userId: after.userId, reason, signedOffBy: before.signedOffBy, signedOffAt: before.signedOffAt,
  })
  return after
})
