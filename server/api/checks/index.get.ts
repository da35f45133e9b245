// The checks of /checks: the instructor's own, the trainee's with their status, the lead's crews with their attempts.
import { listChecks } from '../../domain/checks'

export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  return listChecks(actor)
})
