// Decks, target types and views: who may see and change them, and their database work.
import type { H3Event } from 'h3'
import { and, asc, desc, eq, gte, inArray, lt, ne, or } from 'drizzle-orm'
import { ASPECTS, CONDITIONS } from '#shared/utils/conditions'
import { featuresProblem, settingsConflict } from '#shared/schemas/decks'
import type { BuilderDeck, DeckPatch, DeckSettings, DeckSettingsPatch, DeckCategory, LibraryType, TargetTypeBody, TargetTypePatch, TypeCategory } from '#shared/schemas/decks'
import type { Actor } from '../utils/gate'
import { buildsDeck, overseesDeck } from './policy'
import { createError } from 'h3'
import { audit } from '../utils/audit'
import { tables, useDb } from '../utils/db'
import { hasRole, requireActor, requireRole } from '../utils/gate'
import { newId } from '../utils/ids'
import { removeRenderFiles } from '../utils/renders-store'
// useRuntimeConfig is Nitro's (an auto-import, as in server/utils), so this module also loads outside the server.

type DeckRow = typeof tables.decks.$inferSelect
type TypeRow = typeof tables.targetTypes.$inferSelect

const notFound = () => createError({ statusCode: 404, message: 'No such deck, or it is not shared with your crews.' })
const conflict = (message: string) => createError({ statusCode: 409, message })
const bad = (message: string) => createError({ statusCode: 400, message })

export function deckSettings(d: DeckRow): DeckSettings {
  return {
    hesitationMs: d.hesitationMs,
    windowMs: d.windowMs,
    newPerDay: d.newPerDay,
    retention: d.retention,
    choiceCount: d.choiceCount,
    answerMode: d.answerMode,
    minExposureMs: d.minExposureMs,
  }
}

export function renderUrl(file: string) {
  return `/images/${file}`
}

function crewsOfDeck(deckId: string) {
  return useDb().select({ crewId: tables.deckCrews.crewId }).from(tables.deckCrews)
    .where(eq(tables.deckCrews.deckId, deckId)).all().map(r => r.crewId)
}

// Admin: every deck. Owner: its own in any state. Instructors: decks of their crews once they
// leave draft. Trainees and leads: published decks of their crews.
export function canSeeDeck(actor: Actor, deck: DeckRow) {
  if (hasRole(actor, 'admin') || deck.ownerId === actor.id) return true
  if (deck.status === 'draft') return false
  const shared = crewsOfDeck(deck.id).some(c => actor.crewIds.includes(c))
  if (!shared) return false
  if (deck.status === 'published') return true
  return hasRole(actor, 'instructor')
}

/** The deck if the actor may see it, else 404 (another crew's deck is never confirmed to exist). */
export async function requireVisibleDeck(event: H3Event, deckId: string): Promise<{ actor: Actor, deck: DeckRow }> {
  const actor = await requireActor(event)
  const deck = useDb().select().from(tables.decks).where(eq(tables.decks.id, deckId)).get()
  if (!deck || !canSeeDeck(actor, deck)) throw notFound()
  return { actor, deck }
}

/** The deck if the actor builds it (buildsDeck in policy.ts), else 403, or 404 when they cannot see it. */
export async function requireOwnDeck(event: H3Event, deckId: string): Promise<{ actor: Actor, deck: DeckRow }> {
  await requireRole(event, 'instructor')
  const found = await requireVisibleDeck(event, deckId)
  if (!buildsDeck(found.actor, found.deck)) throw createError({ statusCode: 403, message: 'Only the instructor who owns this deck can change it.' })
  return found
}

/** A target type and its deck, if the actor owns the deck. */
export async function requireOwnTargetType(event: H3Event, typeId: string): Promise<{ actor: Actor, deck: DeckRow, type: TypeRow }> {
  await requireRole(event, 'instructor')
  const type = useDb().select().from(tables.targetTypes).where(eq(tables.targetTypes.id, typeId)).get()
  if (!type) throw createError({ statusCode: 404, message: 'No such target type.' })
  const { actor, deck } = await requireOwnDeck(event, type.deckId).catch((e) => {
    if (e.statusCode === 404) throw createError({ statusCode: 404, message: 'No such target type.' })
    throw e
  })
  return { actor, deck, type }
}

// ---------------------------------------------------------------- reading

export function listDecks(actor: Actor) {
  const db = useDb()
  const all = db.select().from(tables.decks).orderBy(asc(tables.decks.title)).all()
  const links = db.select().from(tables.deckCrews).all()
  const crewsByDeck = new Map<string, string[]>()
  for (const l of links) crewsByDeck.set(l.deckId, [...(crewsByDeck.get(l.deckId) ?? []), l.crewId])
  return all.filter((d) => {
    if (hasRole(actor, 'admin') || d.ownerId === actor.id) return true
    if (d.status === 'draft' || !(crewsByDeck.get(d.id) ?? []).some(c => actor.crewIds.includes(c))) return false
    return d.status === 'published' || hasRole(actor, 'instructor')
  })
}

function byAspect(a: string, b: string) {
  return ASPECTS.indexOf(a as typeof ASPECTS[number]) - ASPECTS.indexOf(b as typeof ASPECTS[number])
}

function byCondition(a: string, b: string) {
  return CONDITIONS.indexOf(a as typeof CONDITIONS[number]) - CONDITIONS.indexOf(b as typeof CONDITIONS[number])
}

function typesWithViews(deckId: string) {
  const db = useDb()
  const types = db.select().from(tables.targetTypes).where(eq(tables.targetTypes.deckId, deckId)).orderBy(asc(tables.targetTypes.name)).all()
  const typeIds = types.map(t => t.id)
  const views = typeIds.length
    ? db.select().from(tables.views).where(inArray(tables.views.targetTypeId, typeIds)).orderBy(asc(tables.views.createdAt)).all()
    : []
  const viewIds = views.map(v => v.id)
  const variants = viewIds.length ? db.select().from(tables.variants).where(inArray(tables.variants.viewId, viewIds)).all() : []
  const pairs = typeIds.length ? db.select().from(tables.lookAlikes).where(inArray(tables.lookAlikes.typeId, typeIds)).all() : []
  return types.map(type => ({
    type,
    lookAlikes: pairs.filter(p => p.typeId === type.id).map(p => p.otherId),
    views: views.filter(v => v.targetTypeId === type.id).sort((a, b) => byAspect(a.aspect, b.aspect))
      .map(view => ({
        view,
        variants: variants.filter(x => x.viewId === view.id).sort((a, b) => byCondition(a.condition, b.condition) || a.width - b.width),
      })),
  }))
}

// Those who build or manage a deck: its owner and admins. Only they get its renderings' addresses
// (content hashes): a trainee who could list them could map a sighting's picture to its target type.
export function managesDeck(actor: Actor, deck: DeckRow) {
  return overseesDeck(actor, deck)
}

/**
 * GET /api/decks/[id], as api.md writes it; each view's `variants` (rendering addresses) only for
 * those who manage the deck (managesDeck), an empty list for everyone else.
 */
export function deckDetail(deck: DeckRow, actor: Actor) {
  const withRenderings = managesDeck(actor, deck)
  return {
    id: deck.id,
    title: deck.title,
    settings: deckSettings(deck),
    targetTypes: typesWithViews(deck.id).map(({ type, views }) => ({
      id: type.id,
      name: type.name,
      category: type.category,
      affiliation: type.affiliation,
      sizeM: type.sizeM,
      views: views.map(({ view, variants }) => ({
        id: view.id,
        aspect: view.aspect,
        variants: withRenderings ? variants.map(v => ({ condition: v.condition, width: v.width, url: renderUrl(v.file) })) : [],
      })),
    })),
  }
}

/** Everything the deck builder edits, for the deck's owner. */
export function deckBuilderDetail(deck: DeckRow): BuilderDeck {
  const db = useDb()
  const crews = db.select({ id: tables.crews.id, name: tables.crews.name }).from(tables.deckCrews)
    .innerJoin(tables.crews, eq(tables.crews.id, tables.deckCrews.crewId))
    .where(eq(tables.deckCrews.deckId, deck.id)).orderBy(asc(tables.crews.name)).all()
  const types = typesWithViews(deck.id)
  const shared = sharedDecks(deck.id, types.map(t => t.type.definitionId))
  return {
    id: deck.id,
    title: deck.title,
    description: deck.description,
    category: deck.category,
    status: deck.status,
    settings: deckSettings(deck),
    drilled: deckDrilled(deck.id),
    crews,
    targetTypes: types.map(({ type, lookAlikes, views }) => ({
      id: type.id,
      name: type.name,
      category: type.category,
      affiliation: type.affiliation,
      sizeM: type.sizeM,
      features: type.features,
      lookAlikes,
      views: views.map(({ view, variants }) => ({
        id: view.id,
        aspect: view.aspect,
        width: view.width,
        height: view.height,
        variants: variants.map(v => ({ condition: v.condition, width: v.width, height: v.height, bytes: v.bytes, contrast: v.contrast, url: renderUrl(v.file) })),
      })),
      sharedWith: shared.get(type.definitionId) ?? [],
    })),
  }
}

/** The decks an instructor builds, with what the list of the builder shows. */
export function builderList(actor: Actor) {
  const db = useDb()
  const decks = db.select().from(tables.decks).where(eq(tables.decks.ownerId, actor.id)).orderBy(asc(tables.decks.title)).all()
  const ids = decks.map(d => d.id)
  const types = ids.length ? db.select({ deckId: tables.targetTypes.deckId, id: tables.targetTypes.id }).from(tables.targetTypes).where(inArray(tables.targetTypes.deckId, ids)).all() : []
  const crews = ids.length
    ? db.select({ deckId: tables.deckCrews.deckId, name: tables.crews.name }).from(tables.deckCrews)
        .innerJoin(tables.crews, eq(tables.crews.id, tables.deckCrews.crewId)).where(inArray(tables.deckCrews.deckId, ids)).all()
    : []
  return decks.map(d => ({
    id: d.id,
    title: d.title,
    category: d.category,
    status: d.status,
    targetTypes: types.filter(t => t.deckId === d.id).length,
    crews: crews.filter(c => c.deckId === d.id).map(c => c.name).sort(),
  }))
}

// ---------------------------------------------------------------- decks

export function deckDrilled(deckId: string) {
  const db = useDb()
  return !!(db.select({ id: tables.watches.id }).from(tables.watches).where(eq(tables.watches.deckId, deckId)).get()
    || db.select({ id: tables.tracks.id }).from(tables.tracks).where(eq(tables.tracks.deckId, deckId)).get()
    || db.select({ id: tables.calls.id }).from(tables.calls).where(eq(tables.calls.deckId, deckId)).get()
    || db.select({ id: tables.checks.id }).from(tables.checks).where(eq(tables.checks.deckId, deckId)).get())
}

function checkSettings(s: DeckSettings) {
  const conflict = settingsConflict(s)
  if (conflict) throw bad(`${conflict.field}: ${conflict.message}`)
}

export function createDeck(actor: Actor, body: { title: string, description?: string, category: DeckCategory, settings?: DeckSettingsPatch }) {
  const id = newId()
  const defaults: DeckSettings = { hesitationMs: 1500, windowMs: 5000, newPerDay: 10, retention: 0.9, choiceCount: 4, answerMode: 'choices', minExposureMs: 200 }
  const settings = { ...defaults, ...body.settings }
  checkSettings(settings)
  useDb().insert(tables.decks).values({ id, title: body.title, description: body.description ?? '', category: body.category, ownerId: actor.id, ...settings }).run()
  return id
}

// What publishing needs: something to drill, and distractors to choose from.
function publishProblem(deckId: string): string | null {
  const withViews = typesWithViews(deckId).filter(t => t.views.length > 0)
  if (withViews.length < 2) return 'Add at least two target types with an uploaded view each before publishing.'
  return null
}

export function patchDeck(actor: Actor, deck: DeckRow, patch: DeckPatch) {
  const settings = { ...deckSettings(deck), ...patch.settings }
  checkSettings(settings)
  if (patch.category && patch.category !== 'mixed' && patch.category !== deck.category) {
    const other = useDb().select({ id: tables.targetTypes.id }).from(tables.targetTypes)
      .where(and(eq(tables.targetTypes.deckId, deck.id), inArray(tables.targetTypes.category, patch.category === 'aircraft' ? ['vessel'] : ['aircraft']))).get()
    if (other) throw conflict(`This deck holds target types that are not ${patch.category}; make it mixed or remove them first.`)
  }
  if (patch.status === 'published' && deck.status !== 'published') {
    const problem = publishProblem(deck.id)
    if (problem) throw conflict(problem)
  }
  const { settings: _s, ...fields } = patch
  useDb().update(tables.decks).set({ ...fields, ...settings, updatedAt: Date.now() }).where(eq(tables.decks.id, deck.id)).run()
  audit(actor, 'deck.update', 'deck', deck.id, patch)
}

export async function deleteDeck(actor: Actor, deck: DeckRow) {
  if (deckDrilled(deck.id)) throw conflict('This deck has been drilled, so its history must stay: archive it instead.')
  const db = useDb()
  const typeIds = db.select({ id: tables.targetTypes.id }).from(tables.targetTypes).where(eq(tables.targetTypes.deckId, deck.id)).all().map(t => t.id)
  const files = [...filesOf(typeIds), ...trashedFilesOfTypes(typeIds)]
  db.transaction((tx) => {
    tx.delete(tables.jobs).where(eq(tables.jobs.deckId, deck.id)).run()
    tx.delete(tables.decks).where(eq(tables.decks.id, deck.id)).run()
  })
  await removeRenderFiles(useRuntimeConfig().uploadsDir, unusedFiles(files))
  audit(actor, 'deck.delete', 'deck', deck.id, { title: deck.title })
}

// Instructors assign a deck to crews they belong to; admins to any crew. Assignments to crews
// the instructor is not in are kept as they are.
export function setDeckCrews(actor: Actor, deck: DeckRow, crewIds: string[]) {
  const db = useDb()
  const wanted = [...new Set(crewIds)]
  const known = wanted.length ? db.select({ id: tables.crews.id }).from(tables.crews).where(inArray(tables.crews.id, wanted)).all().map(c => c.id) : []
  const unknown = wanted.find(c => !known.includes(c))
  const admin = hasRole(actor, 'admin')
  if (unknown && admin) throw createError({ statusCode: 404, message: 'No such crew.' })
  const foreign = wanted.find(c => !admin && !actor.crewIds.includes(c))
  if (foreign) throw createError({ statusCode: 403, message: 'You can assign a deck only to crews you belong to.' })
  const current = crewsOfDeck(deck.id)
  db.transaction((tx) => {
    for (const c of current) {
      if ((admin || actor.crewIds.includes(c)) && !wanted.includes(c)) {
        tx.delete(tables.deckCrews).where(and(eq(tables.deckCrews.deckId, deck.id), eq(tables.deckCrews.crewId, c))).run()
      }
    }
    for (const c of wanted) {
      if (!current.includes(c)) tx.insert(tables.deckCrews).values({ deckId: deck.id, crewId: c }).run()
    }
  })
  audit(actor, 'deck.crews', 'deck', deck.id, { crewIds: wanted })
  return crewsOfDeck(deck.id)
}

// ---------------------------------------------------------------- target types

function typeCategoryFor(deck: DeckRow, wanted: TypeCategory | undefined): TypeCategory {
  if (deck.category === 'mixed') {
    if (!wanted) throw bad('category: Choose aircraft or vessel for a target type of a mixed deck.')
    return wanted
  }
  if (wanted && wanted !== deck.category) throw bad(`category: This is a deck of ${deck.category}; add only ${deck.category} target types.`)
  return deck.category
}

function cleanFeatures(category: TypeCategory, features: Record<string, string>) {
  const problem = featuresProblem(category, features)
  if (problem) throw bad(problem)
  return Object.fromEntries(Object.entries(features).map(([k, v]) => [k, v.trim()]).filter(([, v]) => v))
}

function checkLookAlikes(deckId: string, typeId: string, ids: string[]) {
  const unique = [...new Set(ids)]
  if (unique.includes(typeId)) throw bad('lookAlikes: A target type cannot be its own look-alike.')
  if (!unique.length) return unique
  const found = useDb().select({ id: tables.targetTypes.id }).from(tables.targetTypes)
    .where(and(eq(tables.targetTypes.deckId, deckId), inArray(tables.targetTypes.id, unique))).all()
  if (found.length !== unique.length) throw bad('lookAlikes: Choose look-alikes among the target types of this deck.')
  return unique
}

type Tx = Parameters<Parameters<ReturnType<typeof useDb>['transaction']>[0]>[0]

// Look-alikes are symmetric: each pair is stored both ways.
function writeLookAlikes(tx: Tx, typeId: string, ids: string[]) {
  tx.delete(tables.lookAlikes).where(or(eq(tables.lookAlikes.typeId, typeId), eq(tables.lookAlikes.otherId, typeId))).run()
  for (const other of ids) {
    tx.insert(tables.lookAlikes).values({ typeId, otherId: other }).onConflictDoNothing().run()
    tx.insert(tables.lookAlikes).values({ typeId: other, otherId: typeId }).onConflictDoNothing().run()
  }
}

function uniqueName(e: unknown): never {
  if (String(e).includes('UNIQUE')) throw conflict('A target type of that name is already in this deck.')
  throw e
}

export function createTargetType(actor: Actor, deck: DeckRow, body: TargetTypeBody) {
  const category = typeCategoryFor(deck, body.category)
  const features = cleanFeatures(category, body.features ?? {})
  const id = newId()
  const lookAlikes = checkLookAlikes(deck.id, id, body.lookAlikes ?? [])
  try {
    useDb().transaction((tx) => {
      tx.insert(tables.targetTypes).values({ id, definitionId: id, deckId: deck.id, name: body.name, category, affiliation: body.affiliation, sizeM: body.sizeM, features }).run()
      writeLookAlikes(tx, id, lookAlikes)
    })
  }
  catch (e) { uniqueName(e) }
  audit(actor, 'target-type.create', 'target_type', id, { deckId: deck.id, name: body.name })
  return id
}

/**
 * Changes a target type. Its name, category, affiliation, size and features belong to its shared
 * definition, so every deck's row of that definition changes with it, in one transaction; its
 * look-alikes belong to this deck. A change that one of the linked decks cannot take (a name
 * another of its target types has, a category the deck does not hold) is refused naming that deck,
 * with nothing changed.
 */
export function patchTargetType(actor: Actor, deck: DeckRow, type: TypeRow, patch: TargetTypePatch) {
  const category = patch.category ? typeCategoryFor(deck, patch.category) : type.category
  const features = cleanFeatures(category, patch.features ?? (category === type.category ? type.features : {}))
  const lookAlikes = patch.lookAlikes ? checkLookAlikes(deck.id, type.id, patch.lookAlikes) : null
  const rows = definitionRows(type.definitionId)
  for (const row of rows) {
    if (row.deckId === deck.id) continue
    if (category !== type.category && row.deckCategory !== 'mixed' && row.deckCategory !== category) {
      throw conflict(`category: "${row.deckTitle}" shares this target type and is a deck of ${row.deckCategory}; stop sharing it there first. Nothing was changed.`)
    }
  }
  if (patch.name !== undefined && patch.name !== type.name) {
    const clash = nameClash(rows.map(r => r.deckId), patch.name, type.definitionId)
    if (clash === deck.id) throw conflict('A target type of that name is already in this deck.')
    if (clash) throw conflict(`name: "${rows.find(r => r.deckId === clash)!.deckTitle}" shares this target type and already has a target type named "${patch.name}". Nothing was changed.`)
  }
  const { lookAlikes: _l, ...fields } = patch
  try {
    useDb().transaction((tx) => {
      tx.update(tables.targetTypes).set({ ...fields, category, features, updatedAt: Date.now() }).where(eq(tables.targetTypes.definitionId, type.definitionId)).run()
      if (lookAlikes) writeLookAlikes(tx, type.id, lookAlikes)
    })
  }
  catch (e) { uniqueName(e) }
  audit(actor, 'target-type.update', 'target_type', type.id, { ...patch, ...(rows.length > 1 ? { deckIds: rows.map(r => r.deckId) } : {}) })
}

/** Every deck's row of one shared definition, with its deck, oldest first. */
function definitionRows(definitionId: string) {
  return useDb().select({ id: tables.targetTypes.id, deckId: tables.decks.id, deckTitle: tables.decks.title, deckCategory: tables.decks.category })
    .from(tables.targetTypes).innerJoin(tables.decks, eq(tables.decks.id, tables.targetTypes.deckId))
    .where(eq(tables.targetTypes.definitionId, definitionId)).orderBy(asc(tables.targetTypes.createdAt), asc(tables.targetTypes.id)).all()
}

/** The first of these decks that has a target type of this name outside the definition, or null. */
function nameClash(deckIds: string[], name: string, definitionId: string) {
  const hit = useDb().select({ deckId: tables.targetTypes.deckId }).from(tables.targetTypes)
    .where(and(inArray(tables.targetTypes.deckId, deckIds), eq(tables.targetTypes.name, name), ne(tables.targetTypes.definitionId, definitionId))).all()
  return deckIds.find(d => hit.some(h => h.deckId === d)) ?? null
}

/** For the target types of a deck, by definition: the other decks that use the same definition. */
function sharedDecks(deckId: string, definitionIds: string[]) {
  const out = new Map<string, { id: string, title: string }[]>()
  if (!definitionIds.length) return out
  const rows = useDb().select({ definitionId: tables.targetTypes.definitionId, id: tables.decks.id, title: tables.decks.title })
    .from(tables.targetTypes).innerJoin(tables.decks, eq(tables.decks.id, tables.targetTypes.deckId))
    .where(and(inArray(tables.targetTypes.definitionId, definitionIds), ne(tables.targetTypes.deckId, deckId)))
    .orderBy(asc(tables.decks.title)).all()
  for (const { definitionId, ...d } of rows) out.set(definitionId, [...(out.get(definitionId) ?? []), d])
  return out
}

/**
 * Makes this deck's row of a shared target type its own definition again: from now on its fields
 * and views change apart from the other decks'. The other decks stay linked with each other.
 */
export function unlinkTargetType(actor: Actor, type: TypeRow) {
  const rows = definitionRows(type.definitionId)
  if (rows.length < 2) throw conflict('This target type is not shared with another deck.')
  useDb().transaction((tx) => {
    if (type.definitionId === type.id) {
      // The definition took this row's id: the others move together to the oldest other row's.
      tx.update(tables.targetTypes).set({ definitionId: rows.find(r => r.id !== type.id)!.id })
        .where(and(eq(tables.targetTypes.definitionId, type.definitionId), ne(tables.targetTypes.id, type.id))).run()
    }
    else {
      tx.update(tables.targetTypes).set({ definitionId: type.id, updatedAt: Date.now() }).where(eq(tables.targetTypes.id, type.id)).run()
    }
  })
  audit(actor, 'target-type.unlink', 'target_type', type.id, { deckIds: rows.map(r => r.deckId) })
  return { definitionId: type.id }
}

function typeDrilled(typeId: string) {
  const db = useDb()
  return !!(db.select({ id: tables.tracks.id }).from(tables.tracks).where(eq(tables.tracks.targetTypeId, typeId)).get()
    || db.select({ id: tables.sightings.id }).from(tables.sightings).where(eq(tables.sightings.targetTypeId, typeId)).get()
    || db.select({ id: tables.calls.id }).from(tables.calls).where(eq(tables.calls.targetTypeId, typeId)).get())
}

function filesOf(typeIds: string[], viewIds?: string[]) {
  const db = useDb()
  const views = viewIds ?? (typeIds.length ? db.select({ id: tables.views.id }).from(tables.views).where(inArray(tables.views.targetTypeId, typeIds)).all().map(v => v.id) : [])
  if (!views.length) return []
  return db.select({ file: tables.variants.file }).from(tables.variants).where(inArray(tables.variants.viewId, views)).all().map(v => v.file)
}

export async function deleteTargetType(actor: Actor, type: TypeRow) {
  if (typeDrilled(type.id)) throw conflict('This target type has been drilled, so its history must stay. Archive the deck instead.')
  const files = [...filesOf([type.id]), ...trashedFilesOfTypes([type.id])]
  useDb().delete(tables.targetTypes).where(eq(tables.targetTypes.id, type.id)).run()
  await removeRenderFiles(useRuntimeConfig().uploadsDir, unusedFiles(files))
  audit(actor, 'target-type.delete', 'target_type', type.id, { name: type.name })
}

// ---------------------------------------------------------------- views

export async function requireOwnView(event: H3Event, viewId: string) {
  const view = useDb().select().from(tables.views).where(eq(tables.views.id, viewId)).get()
  if (!view) {
    await requireRole(event, 'instructor')
    throw createError({ statusCode: 404, message: 'No such view.' })
  }
  const found = await requireOwnTargetType(event, view.targetTypeId).catch((e) => {
    if (e.statusCode === 404) throw createError({ statusCode: 404, message: 'No such view.' })
    throw e
  })
  return { ...found, view }
}

// A removed view can be restored for this many days; then its files are deleted (common practice
// of trash folders, no source; 30 days is a design value).
export const VIEW_TRASH_DAYS = 30
const TRASH_MS = VIEW_TRASH_DAYS * 86_400_000

type VariantRow = typeof tables.variants.$inferSelect
type ViewRow = typeof tables.views.$inferSelect

function trashFiles(rows: { snapshot: { variants: Record<string, unknown>[] } }[]) {
  return rows.flatMap(r => r.snapshot.variants.map(v => String(v.file)))
}

// Of these files, those no rendering and no removed view names any more: a file is shared by the
// decks' rows of a shared target type (linkTargetType, storeView), so it is deleted only with its last user.
function unusedFiles(files: string[]) {
  if (!files.length) return []
  const used = new Set(useDb().select({ file: tables.variants.file }).from(tables.variants).where(inArray(tables.variants.file, files)).all().map(v => v.file))
  const trashed = new Set(trashFiles(useDb().select({ snapshot: tables.removedViews.snapshot }).from(tables.removedViews).all()))
  return [...new Set(files)].filter(f => !used.has(f) && !trashed.has(f))
}

/** Purges removed views older than the retention period, with their files. */
export async function purgeViewTrash(nowMs = Date.now()) {
  const db = useDb()
  const old = db.select().from(tables.removedViews).where(lt(tables.removedViews.removedAt, nowMs - TRASH_MS)).all()
  if (!old.length) return 0
  db.delete(tables.removedViews).where(inArray(tables.removedViews.id, old.map(r => r.id))).run()
  await removeRenderFiles(useRuntimeConfig().uploadsDir, unusedFiles(trashFiles(old)))
  return old.length
}

/** Files of the trashed views of these target types (deleted with the type or deck). */
function trashedFilesOfTypes(typeIds: string[]) {
  if (!typeIds.length) return []
  return trashFiles(useDb().select().from(tables.removedViews).where(inArray(tables.removedViews.targetTypeId, typeIds)).all())
}

// The same view in the other decks that share its target type: the rows made from one upload (or
// one link) carry the same source picture.
function linkedViews(type: TypeRow, view: ViewRow) {
  return useDb().select({ view: tables.views, deckId: tables.targetTypes.deckId, deckTitle: tables.decks.title }).from(tables.views)
    .innerJoin(tables.targetTypes, eq(tables.targetTypes.id, tables.views.targetTypeId))
    .innerJoin(tables.decks, eq(tables.decks.id, tables.targetTypes.deckId))
    .where(and(eq(tables.targetTypes.definitionId, type.definitionId), eq(tables.views.sourceSha, view.sourceSha), ne(tables.views.id, view.id)))
    .orderBy(asc(tables.decks.title)).all()
}

/**
 * Moves a view and its renderings' rows to the trash; the files stay until the trash is purged.
 * With `everywhere`, the same view of every deck that shares the target type goes too, each to its
 * own deck's trash, and putting back any of them puts back all (`together` in the snapshot). A view
 * shown in watches stays, here or in any of those decks: then nothing is removed.
 */
export async function deleteView(actor: Actor, deck: DeckRow, view: ViewRow, options: { everywhere?: boolean, type?: TypeRow, nowMs?: number } = {}) {
  const nowMs = options.nowMs ?? Date.now()
  const db = useDb()
  const others = options.everywhere && options.type ? linkedViews(options.type, view) : []
  const all = [{ view, deckId: deck.id, deckTitle: deck.title }, ...others]
  for (const one of all) {
    const used = db.select({ id: tables.sightings.id }).from(tables.sightings)
      .innerJoin(tables.variants, eq(tables.variants.id, tables.sightings.variantId))
      .where(eq(tables.variants.viewId, one.view.id)).get()
    if (used && one.view.id === view.id) throw conflict('This view has been shown in watches, so it stays with their history.')
    if (used) throw conflict(`This view has been shown in watches of "${one.deckTitle}", so it stays there with their history. Remove it from this deck only; nothing was removed.`)
  }
  const together = all.length > 1 ? all.map(a => a.view.id) : undefined
  db.transaction((tx) => {
    for (const one of all) {
      const variants = tx.select().from(tables.variants).where(eq(tables.variants.viewId, one.view.id)).all()
      tx.insert(tables.removedViews).values({
        id: one.view.id, deckId: one.deckId, targetTypeId: one.view.targetTypeId, aspect: one.view.aspect,
        snapshot: { view: { ...one.view }, variants: variants.map(v => ({ ...v })), ...(together ? { together } : {}) }, removedBy: actor.id, removedAt: nowMs,
      }).run()
      tx.delete(tables.views).where(eq(tables.views.id, one.view.id)).run()
    }
  })
  audit(actor, 'view.remove', 'view', view.id, { deckId: deck.id, aspect: view.aspect, ...(together ? { deckIds: all.map(a => a.deckId) } : {}) })
  await purgeViewTrash(nowMs)
  return { id: view.id, restorableUntil: nowMs + TRASH_MS, decks: all.length }
}

export interface TrashedView { id: string, targetTypeId: string, typeName: string, aspect: string, removedAt: number, restorableUntil: number, decks: number }

/** The deck's removed views still in the trash, newest first. */
export function viewTrash(deckId: string, nowMs = Date.now()): TrashedView[] {
  return useDb().select({ r: tables.removedViews, typeName: tables.targetTypes.name }).from(tables.removedViews)
    .innerJoin(tables.targetTypes, eq(tables.targetTypes.id, tables.removedViews.targetTypeId))
    .where(and(eq(tables.removedViews.deckId, deckId), gte(tables.removedViews.removedAt, nowMs - TRASH_MS)))
    .orderBy(desc(tables.removedViews.removedAt)).all()
    .map(({ r, typeName }) => ({ id: r.id, targetTypeId: r.targetTypeId, typeName, aspect: r.aspect, removedAt: r.removedAt, restorableUntil: r.removedAt + TRASH_MS, decks: r.snapshot.together?.length ?? 1 }))
}

/** The trashed view if the actor owns its deck: 404 for an unknown one or one past its retention. */
export async function requireOwnTrashedView(event: H3Event, viewId: string, nowMs = Date.now()) {
  const row = useDb().select().from(tables.removedViews).where(eq(tables.removedViews.id, viewId)).get()
  if (!row || row.removedAt < nowMs - TRASH_MS) {
    await requireRole(event, 'instructor')
    throw createError({ statusCode: 404, message: `No such removed view: removed views are kept for ${VIEW_TRASH_DAYS} days.` })
  }
  const found = await requireOwnDeck(event, row.deckId)
  return { ...found, row }
}

/**
 * Puts a removed view back, with its renderings, as it was. A view removed from every deck that
 * shares its target type comes back in each of them that still shares it and still has it in its trash.
 */
export function restoreView(actor: Actor, row: typeof tables.removedViews.$inferSelect) {
  const db = useDb()
  const definitionOf = (typeId: string) => db.select({ d: tables.targetTypes.definitionId }).from(tables.targetTypes).where(eq(tables.targetTypes.id, typeId)).get()?.d
  const others = row.snapshot.together?.length
    ? db.select().from(tables.removedViews).where(and(inArray(tables.removedViews.id, row.snapshot.together), ne(tables.removedViews.id, row.id))).all()
        .filter(o => definitionOf(o.targetTypeId) === definitionOf(row.targetTypeId))
    : []
  db.transaction((tx) => {
    for (const one of [row, ...others]) {
      tx.insert(tables.views).values(one.snapshot.view as unknown as ViewRow).run()
      for (const v of one.snapshot.variants as unknown as VariantRow[]) tx.insert(tables.variants).values(v).run()
      tx.delete(tables.removedViews).where(eq(tables.removedViews.id, one.id)).run()
    }
  })
  audit(actor, 'view.restore', 'view', row.id, { deckId: row.deckId, aspect: row.aspect, ...(others.length ? { deckIds: [row.deckId, ...others.map(o => o.deckId)] } : {}) })
  return { decks: 1 + others.length }
}

/** Does the actor manage (own, or administer) the deck that uses this rendering? See managesDeck. */
export function fileVisibleTo(actor: Actor, file: string) {
  const rows = useDb().select({ deck: tables.decks }).from(tables.variants)
    .innerJoin(tables.views, eq(tables.views.id, tables.variants.viewId))
    .innerJoin(tables.targetTypes, eq(tables.targetTypes.id, tables.views.targetTypeId))
    .innerJoin(tables.decks, eq(tables.decks.id, tables.targetTypes.deckId))
    .where(eq(tables.variants.file, file)).all()
  return rows.some(row => managesDeck(actor, row.deck))
}

// ---------------------------------------------------------------- the instructor's library

/**
 * The instructor's library: each shared definition among their own decks' target types, with the
 * decks that use it, and the row to link from (the one with the most views).
 */
export function typeLibrary(actor: Actor): LibraryType[] {
  const db = useDb()
  const t = tables.targetTypes
  const rows = db.select({
    id: t.id, definitionId: t.definitionId, name: t.name, category: t.category, deckId: tables.decks.id, deckTitle: tables.decks.title,
    views: db.$count(tables.views, eq(tables.views.targetTypeId, t.id)),
  }).from(t).innerJoin(tables.decks, eq(tables.decks.id, t.deckId)).where(eq(tables.decks.ownerId, actor.id))
    .orderBy(t.name, tables.decks.title).all()
  const byDefinition = new Map<string, LibraryType>()
  for (const r of rows) {
    const entry = byDefinition.get(r.definitionId)
    if (!entry) {
      byDefinition.set(r.definitionId, { id: r.id, definitionId: r.definitionId, name: r.name, category: r.category, views: r.views, decks: [{ id: r.deckId, title: r.deckTitle }] })
      continue
    }
    entry.decks.push({ id: r.deckId, title: r.deckTitle })
    if (r.views > entry.views) Object.assign(entry, { id: r.id, views: r.views })
  }
  return [...byDefinition.values()]
}

/**
 * Uses one of the instructor's target types in this deck: the deck gets its own row of the type's
 * shared definition (tracks, calls and sightings name the row), with the source row's views, whose
 * renderings are shared (new rows naming the same files), so nothing is uploaded or rendered again.
 * Look-alikes belong to a deck and are not linked.
 */
export function linkTargetType(actor: Actor, deck: DeckRow, source: TypeRow) {
  const already = useDb().select({ id: tables.targetTypes.id }).from(tables.targetTypes)
    .where(and(eq(tables.targetTypes.deckId, deck.id), eq(tables.targetTypes.definitionId, source.definitionId))).get()
  if (already) throw conflict('targetTypeId: This target type is already in this deck.')
  const category = typeCategoryFor(deck, source.category)
  const db = useDb()
  const views = db.select().from(tables.views).where(eq(tables.views.targetTypeId, source.id)).all()
  const variants = views.length ? db.select().from(tables.variants).where(inArray(tables.variants.viewId, views.map(v => v.id))).all() : []
  const id = newId()
  try {
    db.transaction((tx) => {
      tx.insert(tables.targetTypes).values({ id, definitionId: source.definitionId, deckId: deck.id, name: source.name, category, affiliation: source.affiliation, sizeM: source.sizeM, features: source.features }).run()
      for (const v of views) {
        const viewId = newId()
        tx.insert(tables.views).values({ id: viewId, targetTypeId: id, aspect: v.aspect, sourceSha: v.sourceSha, width: v.width, height: v.height }).run()
        for (const x of variants.filter(x => x.viewId === v.id)) {
          tx.insert(tables.variants).values({ ...x, id: newId(), viewId }).run()
        }
      }
    })
  }
  catch (e) { uniqueName(e) }
  audit(actor, 'target-type.link', 'target_type', id, { deckId: deck.id, from: source.id, definitionId: source.definitionId, views: views.length })
  return id
}

// ---------------------------------------------------------------- for the routes (issue 16, item 4)

/** The deck as the builder shows it, read again after a change. */
export function deckBuilderDetailOf(deckId: string) {
  const deck = useDb().select().from(tables.decks).where(eq(tables.decks.id, deckId)).get()
  if (!deck) throw notFound()
  return deckBuilderDetail(deck)
}

/** A target type of this deck, for an upload of its views: 404 for an unknown one or one of another deck. */
export function targetTypeOfDeck(deck: DeckRow, typeId: string): TypeRow {
  const type = useDb().select().from(tables.targetTypes).where(eq(tables.targetTypes.id, typeId)).get()
  if (!type || type.deckId !== deck.id) throw createError({ statusCode: 404, message: 'targetTypeId: No such target type in this deck.' })
  return type
}
