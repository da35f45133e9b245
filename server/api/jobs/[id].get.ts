import { IdParam } from '#shared/schemas/params'

// An upload job's state, for the person who uploaded the file only.
export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const actor = await requireActor(event)
  return jobFor(actor, id)
})
