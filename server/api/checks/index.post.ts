import { CheckBody } from '#shared/schemas/checks'

// An instructor defines a check on a deck of their own.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'instructor')
  const input = await readInput(event, CheckBody)
  setResponseStatus(event, 201)
  return createCheck(useSqlite(), actor, input)
})
