import { IdParam } from '#shared/schemas/params'
import { deleteCheck } from '../../../domain/checks'

// Its instructor deletes a check while nobody has taken it (409 after: retire it instead).
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireRole(event, 'instructor')
  const check = deleteCheck(actor, id)
  audit(actor, 'check.delete', 'check', id, { title: check.title, deckId: check.deckId })
  return { ok: true }
})
