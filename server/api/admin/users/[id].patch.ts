import { UserPatch } from '#shared/schemas/auth'
import { IdParam } from '#shared/schemas/params'
import { updatePerson } from '../../../domain/people'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { id } = await paramsInput(event, IdParam)
  const patch = await readInput(event, UserPatch)
  updatePerson(actor, id, patch)
  return { ok: true }
})
