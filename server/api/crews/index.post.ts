import { CrewBody } from '#shared/schemas/auth'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'admin')
  const { name } = await readInput(event, CrewBody)
  const id = newId()
  try {
    useDb().insert(tables.crews).values({ id, name }).run()
  }
  catch (e) {
    if (String(e).includes('UNIQUE')) throw createError({ statusCode: 409, message: 'A crew with that name exists.' })
    throw e
  }
  audit(actor, 'crew.create', 'crew', id, { name })
  setResponseStatus(event, 201)
  return { id, name }
})
