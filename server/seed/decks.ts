// The invented demo decks: the catalogue's made-up target types, their generated silhouettes run
// through the same processing and storage as uploads (in-process, no worker). Idempotent by title.
import { and, eq } from 'drizzle-orm'
import type { GlintDb } from '../database/client'
import * as t from '../database/schema'
import { DEMO_TARGET_TYPES, LOOK_ALIKE_PAIRS, demoSilhouettes } from '../core/imaging/generate/catalogue'
import type { DemoTargetType } from '../core/imaging/generate/catalogue'
import { processImage } from '../core/imaging/pipeline'
import { newId } from '../utils/ids'
import { renderSeed, sha256Of, storeView } from '../utils/renders-store'

export interface SeedContext { crewIds: string[], uploadsDir: string }

export const DEMO_DECKS = [
  {
    title: 'Coastal air picture',
    description: 'Invented aircraft seen from a coastal station: fighters, lifters, liners, deltas and light aircraft, in look-alike pairs.',
    category: 'aircraft' as const,
  },
  {
    title: 'Harbour approaches',
    description: 'Invented vessels off the harbour mouth: escorts, cruisers, freighters and patrol craft, in look-alike pairs.',
    category: 'vessel' as const,
  },
]

export async function seedDecks(db: GlintDb, ctx: SeedContext) {
  const owner = db.select({ id: t.users.id }).from(t.users).where(eq(t.users.email, 'instructor@glint.demo')).get()
  if (!owner) return { created: 0 }
  let created = 0
  for (const spec of DEMO_DECKS) {
    if (db.select({ id: t.decks.id }).from(t.decks).where(and(eq(t.decks.title, spec.title), eq(t.decks.ownerId, owner.id))).get()) continue
    const deckId = newId()
    const types = DEMO_TARGET_TYPES.filter(d => d.category === spec.category)
    const typeIds = new Map<string, string>(types.map(d => [d.key, newId()]))
    db.transaction((tx) => {
      tx.insert(t.decks).values({ id: deckId, ...spec, ownerId: owner.id, status: 'draft' }).run()
      for (const d of types) {
        tx.insert(t.targetTypes).values({
          id: typeIds.get(d.key)!, definitionId: typeIds.get(d.key)!, deckId, name: d.name, category: d.category, affiliation: d.affiliation, sizeM: d.sizeMetres, features: d.features,
        }).run()
      }
      for (const [a, b] of LOOK_ALIKE_PAIRS) {
        const ia = typeIds.get(a)
        const ib = typeIds.get(b)
        if (!ia || !ib) continue
        tx.insert(t.lookAlikes).values({ typeId: ia, otherId: ib }).onConflictDoNothing().run()
        tx.insert(t.lookAlikes).values({ typeId: ib, otherId: ia }).onConflictDoNothing().run()
      }
      for (const crewId of ctx.crewIds) tx.insert(t.deckCrews).values({ deckId, crewId }).run()
    })
    try {
      for await (const { type, aspect, png } of demoSilhouettes()) {
        if (type.category !== spec.category) continue
        await storeSilhouette(db, ctx.uploadsDir, typeIds.get(type.key)!, type, aspect, png)
      }
    }
    catch (e) {
      // A half-rendered demo deck is removed, so the next run starts it again.
      db.delete(t.decks).where(eq(t.decks.id, deckId)).run()
      throw e
    }
    db.update(t.decks).set({ status: 'published', updatedAt: Date.now() }).where(eq(t.decks.id, deckId)).run()
    created++
  }
  return { created }
}

async function storeSilhouette(db: GlintDb, uploadsDir: string, typeId: string, type: DemoTargetType, aspect: string, png: Uint8Array) {
  const sourceSha = sha256Of(png)
  const result = await processImage(png, { backdrop: type.category === 'vessel' ? 'sea' : 'sky', seed: renderSeed(sourceSha, typeId) })
  await storeView(db, uploadsDir, { targetTypeId: typeId, aspect, source: result.source, renderings: result.renderings })
}
