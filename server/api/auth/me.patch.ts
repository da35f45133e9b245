import { PrefsPatch } from '#shared/schemas/auth'
import { meOf, setOwnPrefs } from '../../domain/people'

// The signed-in person's own name and preferences.
export default defineEventHandler(async (event) => {
  const actor = await requireActor(event)
  const patch = await readInput(event, PrefsPatch)
  setOwnPrefs(actor, patch)
  return meOf(patch.name === undefined ? actor : { ...actor, name: patch.name })
})
