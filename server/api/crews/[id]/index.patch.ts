import { CrewPatch } from '#shared/schemas/auth'
import { IdParam } from '#shared/schemas/params'
import { patchCrew } from '../../../domain/crews'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireCrewRole(event, id, 'lead')
  const patch = await readInput(event, CrewPatch)
  patchCrew(actor, id, patch)
  return { ok: true }
})
