// The signed-in person's latest tap baseline, or null.
import { latestTapBaseline } from '../../domain/tap-baselines'

export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  return { baseline: latestTapBaseline(actor.id) }
})
