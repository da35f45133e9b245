// Several weeks of invented call history for the demo trainees (owned by the watch work).
import type { GlintDb } from '../database/client'
import type { SeedContext } from './decks'

export async function seedHistory(_db: GlintDb, _ctx: SeedContext) {
  return { created: 0 }
}
