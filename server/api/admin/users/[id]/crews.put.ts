import { PersonCrewsBody } from '#shared/schemas/admin'
import { IdParam } from '#shared/schemas/params'
import { setPersonCrews } from '../../../../domain/admin'
import { requirePerson } from '../../../../domain/people'

// An admin sets the crews of an existing person: add to a crew, move between crews, or take out.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { id } = await paramsInput(event, IdParam)
  const { crewIds } = await readInput(event, PersonCrewsBody)
  requirePerson(id)
  const { added, removed } = setPersonCrews(actor, id, crewIds)
  return { ok: true, added, removed }
})
