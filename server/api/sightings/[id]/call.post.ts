import { CallBody } from '#shared/schemas/drill'
import { IdParam } from '#shared/schemas/params'
import { callSighting } from '../../../domain/watches'

// One call on a sighting: graded, scheduled and stored once (a resend gets the first result).
// Calls that arrive together share one commit (server/utils/group-commit.ts); the answer is sent
// only once the call is stored.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'trainee')
  const input = await readInput(event, CallBody)
  const sqlite = useSqlite()
  return inGroupCommit(sqlite, () => callSighting(sqlite, actor.id, id, input))
})
