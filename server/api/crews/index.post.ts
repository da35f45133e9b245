import { CrewBody } from '#shared/schemas/auth'
import { createCrew } from '../../domain/crews'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { name } = await readInput(event, CrewBody)
  const crew = createCrew(actor, name)
  setResponseStatus(event, 201)
  return crew
})
