// The invented demo decks (owned by the deck work; see DEVELOPERS.md).
import type { GlintDb } from '../database/client'

export interface SeedContext { crewIds: string[], uploadsDir: string }

export async function seedDecks(_db: GlintDb, _ctx: SeedContext) {
  return { created: 0 }
}
