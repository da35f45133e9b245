import { WatchBody } from '#shared/schemas/watch'
import { startWatch } from '../../domain/watches'

// Today's watch: the open one again, or a new one issued at once; with practice, a short practice
// when nothing is due (see server/domain/watches.ts).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'trainee')
  const body = await readBody(event).catch(() => {
    throw createError({ statusCode: 400, message: 'The request body must be JSON.' })
  })
  const { deckId, practice } = validator(WatchBody)(body ?? {})
  return startWatch(actor.id, deckId, { practice })
})
