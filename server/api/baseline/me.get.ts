// The signed-in person's latest tap baseline, or null.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  return { baseline: latestTapBaseline(actor.id) }
})
