import { CallBody } from '#shared/schemas/watch'
import { IdParam } from '#shared/schemas/params'
import { takeCall } from '../../../domain/calls'

// One call on a sighting, of a watch or a check (server/domain/calls.ts): graded, scheduled and stored
// once (a resend gets the first result). Calls that arrive together share one commit
// (server/utils/group-commit.ts); the answer is sent only once the call is stored.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'trainee')
  const input = await readInput(event, CallBody)
  return takeCall(actor.id, id, input)
})
