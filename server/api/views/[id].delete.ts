import { IdParam } from '#shared/schemas/params'

export default defineEventHandler(async (event) => {
  const { id } = await paramsInput(event, IdParam)
  const { actor, view } = await requireOwnView(event, id)
  await deleteView(actor, view.id)
  return { ok: true }
})
