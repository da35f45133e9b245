// The watch on the database: tracks created lazily, a day's watch issued at once, calls graded
// and scheduled in one transaction, the offline pack. Plain imports (no Nitro auto-imports) so
// that the demo history seed runs this same code over simulated days.
// A watch day is the UTC date of issue (YYYY-MM-DD): one open watch per trainee, deck and day.
import { randomBytes as cryptoRandomBytes, randomInt } from 'node:crypto'
import type { Database } from 'better-sqlite3'
import { createError } from 'h3'
import { newTrackState, reviewTrack, stageOf } from '../core/scheduling/fsrs'
import type { TrackState } from '../core/scheduling/fsrs'
import type { Rng } from '../core/watch/rng'
import type { CallResult, DeckWorkload, Introduction, IssuedSighting, IssuedWatch, TeachingPicture, WatchPack, WatchToday } from '../../shared/types/watch'
import {
  canPractise, MAX_RESHOWS_PER_TRACK, planTrackSighting, planWatch, reshowOrder, teachingVariant, trackKeys, WATCH_MAX_SIGHTINGS,
} from '../core/watch/plan'
import { PRACTICE_SIZE } from '../core/watch/queue'
import type { ContentVariant, ContentView, DeckContent, PlannedChoice, PlannedIntroduction, PlannedSighting, PlanTrack } from '../core/watch/plan'
import { allOrNothing } from '../utils/group-commit'
import { newId } from '../utils/ids'
import { useSqlite } from '../utils/db'
import { statement } from '../utils/sql'
import { weightsOfCrew } from './crew-fits'
import { insertCall, insertSighting, issuedFromPlan, issuedFromRow, sightingForCall, storedCallResult, watchSightings } from './sightings'
import type { CallFields, CallSightingRow } from './sightings'

const DAY_MS = 86_400_000
// A voided sighting (screen hidden while it showed) takes no call; its copy later in the watch does.
export const VOIDED_MESSAGE = 'This sighting was voided (the screen was hidden while it showed), so this call is not counted; it is shown again later in the watch.'

/** The random sources a watch or a check is planned with: the server's, or a seeded one (the demo history, tests). */
export interface WatchRandom { rng: Rng, randomBytes: (size: number) => Uint8Array }

export const serverRandom: WatchRandom = { rng: () => randomInt(0, 2 ** 32) / 2 ** 32, randomBytes: n => cryptoRandomBytes(n) }

export function watchDay(nowMs: number) {
  return new Date(nowMs).toISOString().slice(0, 10)
}

function dayStart(nowMs: number) {
  return Math.floor(nowMs / DAY_MS) * DAY_MS
}

const notFound = (message: string) => createError({ statusCode: 404, message })

// ---------------------------------------------------------------- statements
// Raw SQL through server/utils/sql.ts's statement(): the watch and the calls path are the hot ones.

const SQL = {
  deck: `SELECT id, title, category, status, hesitation_ms AS hesitationMs, window_ms AS windowMs, new_per_day AS newPerDay,
    retention, choice_count AS choiceCount, answer_mode AS answerMode, min_exposure_ms AS minExposureMs FROM decks WHERE id = ?`,
  types: `SELECT id, name, category, size_m AS sizeM, features FROM target_types WHERE deck_id = ? ORDER BY created_at, id`,
  variants: `SELECT v.id AS viewId, v.target_type_id AS targetTypeId, v.aspect, x.id, x.condition, x.file, x.width, x.height
    FROM views v JOIN target_types t ON t.id = v.target_type_id JOIN variants x ON x.view_id = v.id
    WHERE t.deck_id = ? ORDER BY v.created_at, v.id, x.width`,
  variantsOf: `SELECT v.id AS viewId, v.target_type_id AS targetTypeId, v.aspect, x.id, x.condition, x.file, x.width, x.height
    FROM views v JOIN variants x ON x.view_id = v.id WHERE v.target_type_id = ? AND v.aspect = ? ORDER BY v.created_at, v.id, x.width`,
  lookAlikes: `SELECT l.type_id AS typeId, l.other_id AS otherId FROM look_alikes l JOIN target_types t ON t.id = l.type_id WHERE t.deck_id = ?`,
  assigned: `SELECT DISTINCT d.id, d.title FROM decks d JOIN deck_crews dc ON dc.deck_id = d.id
    JOIN memberships m ON m.crew_id = dc.crew_id WHERE m.user_id = ? AND d.status = 'published' ORDER BY d.title, d.id`,
  tracks: `SELECT id, target_type_id AS targetTypeId, aspect, due, stability, difficulty, elapsed_days AS elapsedDays,
    scheduled_days AS scheduledDays, learning_steps AS learningSteps, reps, lapses, state, last_review AS lastReview
    FROM tracks WHERE user_id = ? AND deck_id = ?`,
  track: `SELECT id, target_type_id AS targetTypeId, aspect, due, stability, difficulty, elapsed_days AS elapsedDays,
    scheduled_days AS scheduledDays, learning_steps AS learningSteps, reps, lapses, state, last_review AS lastReview
    FROM tracks WHERE id = ?`,
  insertTrack: `INSERT INTO tracks (id, user_id, deck_id, target_type_id, aspect, due, stability, difficulty, elapsed_days,
    scheduled_days, learning_steps, reps, lapses, state, last_review, created_at, updated_at)
    VALUES (@id, @userId, @deckId, @targetTypeId, @aspect, @due, @stability, @difficulty, @elapsedDays, @scheduledDays,
    @learningSteps, @reps, @lapses, @state, @lastReview, @now, @now) ON CONFLICT DO NOTHING`,
  updateTrack: `UPDATE tracks SET due = @due, stability = @stability, difficulty = @difficulty, elapsed_days = @elapsedDays,
    scheduled_days = @scheduledDays, learning_steps = @learningSteps, reps = @reps, lapses = @lapses, state = @state,
    last_review = @lastReview, updated_at = @now WHERE id = @id`,
  newToday: `SELECT count(DISTINCT track_id) AS n FROM calls WHERE user_id = ? AND deck_id = ? AND called_at >= ?
    AND json_extract(before, '$.reps') = 0`,
  // The one crew-confusions query of the watch and the check: wrong names called in watches by the trainee's crew-mates.
  confusions: `SELECT c.target_type_id AS shown, c.called_type_id AS called, count(*) AS n FROM calls c
    WHERE c.deck_id = ? AND c.kind = 'watch' AND c.correct = 0 AND c.called_type_id IS NOT NULL AND c.called_type_id <> c.target_type_id
    AND c.user_id IN (SELECT m2.user_id FROM memberships m1 JOIN memberships m2 ON m2.crew_id = m1.crew_id WHERE m1.user_id = ?)
    GROUP BY 1, 2`,
  openWatches: `SELECT id, day FROM watches WHERE user_id = ? AND deck_id = ? AND kind = 'watch' AND status = 'open' ORDER BY created_at DESC`,
  closeWatch: `UPDATE watches SET status = 'closed', closed_at = ?, updated_at = ? WHERE id = ? AND status = 'open'`,
  insertWatch: `INSERT INTO watches (id, user_id, deck_id, kind, day, status, practice, created_at, updated_at) VALUES (?, ?, ?, 'watch', ?, 'open', ?, ?, ?)`,
  watch: `SELECT w.id, w.user_id AS userId, w.deck_id AS deckId, w.kind, w.day, d.title, d.hesitation_ms AS hesitationMs,
    d.answer_mode AS answerMode FROM watches w LEFT JOIN decks d ON d.id = w.deck_id WHERE w.id = ?`,
  answerType: `SELECT id, name, features FROM target_types WHERE id = ?`,
  deckNames: `SELECT id, name FROM target_types WHERE deck_id = ?`,
  uncalled: `SELECT s.id, s.target_type_id AS typeId, s.position FROM sightings s WHERE s.watch_id = ? AND s.id <> ?
    AND s.voided_at IS NULL AND NOT EXISTS (SELECT 1 FROM calls c WHERE c.sighting_id = s.id) ORDER BY s.position, s.issued_at`,
  anyUncalled: `SELECT 1 FROM sightings s WHERE s.watch_id = ? AND s.id <> ? AND s.voided_at IS NULL
    AND NOT EXISTS (SELECT 1 FROM calls c WHERE c.sighting_id = s.id) ORDER BY s.position DESC LIMIT 1`,
  reshowCount: `SELECT count(*) AS n FROM sightings WHERE watch_id = ? AND track_id = ? AND reshow_of IS NOT NULL`,
  setPosition: `UPDATE sightings SET position = ? WHERE id = ?`,
  maxPosition: `SELECT coalesce(max(position), -1) AS p FROM sightings WHERE watch_id = ?`,
  sightingFile: `SELECT x.file FROM sightings s JOIN variants x ON x.id = s.variant_id WHERE s.id = ? AND s.user_id = ?`,
  insertPicture: `INSERT INTO pictures (id, watch_id, user_id, target_type_id, aspect, variant_id) VALUES (?, ?, ?, ?, ?, ?)
    ON CONFLICT (watch_id, target_type_id, aspect) DO NOTHING`,
  pictureOf: `SELECT id FROM pictures WHERE watch_id = ? AND target_type_id = ? AND aspect = ?`,
  revealPicture: `SELECT id FROM pictures WHERE watch_id = ? AND target_type_id = ? ORDER BY aspect = ? DESC, aspect LIMIT 1`,
  pictureFile: `SELECT x.file FROM pictures p JOIN variants x ON x.id = p.variant_id WHERE p.id = ? AND p.user_id = ?`,
  watchPictures: `SELECT p.id, p.target_type_id AS typeId, p.aspect, t.name, t.features FROM pictures p
    JOIN target_types t ON t.id = p.target_type_id WHERE p.watch_id = ?`,
  insertIntroduction: `INSERT INTO introductions (id, watch_id, user_id, track_id, before_sighting_id, ord, target_type_id, aspect,
    picture_id, look_alike_type_id, look_alike_picture_id) VALUES (@id, @watchId, @userId, @trackId, @beforeSightingId, @ord,
    @targetTypeId, @aspect, @pictureId, @lookAlikeTypeId, @lookAlikePictureId)`,
  watchIntroductions: `SELECT i.id, i.before_sighting_id AS beforeSightingId, i.target_type_id AS typeId, i.aspect, i.picture_id AS pictureId,
    i.look_alike_type_id AS lookAlikeTypeId, i.look_alike_picture_id AS lookAlikePictureId
    FROM introductions i JOIN sightings s ON s.id = i.before_sighting_id
    WHERE i.watch_id = ? AND s.voided_at IS NULL AND NOT EXISTS (SELECT 1 FROM calls c WHERE c.sighting_id = s.id) ORDER BY i.ord`,
  watchFlags: `SELECT practice FROM watches WHERE id = ?`,
  setVoided: `UPDATE sightings SET voided_at = ? WHERE id = ? AND voided_at IS NULL
    AND NOT EXISTS (SELECT 1 FROM calls c WHERE c.sighting_id = sightings.id)`,
  copyOf: `SELECT id FROM sightings WHERE watch_id = ? AND id <> ? AND track_id IS ? AND variant_id IS ? AND issued_at = ?`,
  voidRow: `SELECT voided_at AS voidedAt, variant_id AS variantId, range_m AS rangeM, binoculars, apparent_px AS apparentPx,
    exposure_ms AS exposureMs, reshow_of AS reshowOf FROM sightings WHERE id = ?`,
} as const

interface DeckRow { id: string, title: string, category: string, status: string, hesitationMs: number, windowMs: number, newPerDay: number, retention: number, choiceCount: number, answerMode: string, minExposureMs: number }
interface TypeRow { id: string, name: string, category: string, sizeM: number, features: string | null }
type VariantRow = ContentVariant & { viewId: string, targetTypeId: string, aspect: string }
type TrackRow = TrackState & { id: string, targetTypeId: string, aspect: string }
type TrackParams = TrackState & { id: string, now: number }
interface AnswerTypeRow { id: string, name: string, features: string | null }
interface WatchRow { id: string, userId: string, deckId: string | null, kind: string, day: string, title: string, hesitationMs: number, answerMode: string }
interface WatchPictureRow { id: string, typeId: string, aspect: string, name: string, features: string | null }
interface IntroductionRow { id: string, beforeSightingId: string, pictureId: string, lookAlikePictureId: string | null }

// ---------------------------------------------------------------- deck content and tracks

/** A deck's settings, types and look-alikes, with every rendered view (or only those of one type and aspect). */
export function loadDeckContent(sqlite: Database, deckId: string, only?: { targetTypeId: string, aspect: string }): DeckContent | null {
  const deck = statement<DeckRow, [string]>(sqlite, SQL.deck).get(deckId)
  if (!deck) return null
  const types = statement<TypeRow, [string]>(sqlite, SQL.types).all(deckId).map(t => ({ ...t, features: parseFeatures(t.features) }))
  const views = new Map<string, ContentView>()
  const rows = only
    ? statement<VariantRow, [string, string]>(sqlite, SQL.variantsOf).all(only.targetTypeId, only.aspect)
    : statement<VariantRow, [string]>(sqlite, SQL.variants).all(deckId)
  for (const r of rows) {
    let v = views.get(r.viewId)
    if (!v) {
      v = { id: r.viewId, targetTypeId: r.targetTypeId, aspect: r.aspect, variants: [] }
      views.set(r.viewId, v)
    }
    v.variants.push({ id: r.id, condition: r.condition, file: r.file, width: r.width, height: r.height })
  }
  const lookAlikes = new Map<string, Set<string>>()
  const link = (a: string, b: string) => {
    if (!lookAlikes.has(a)) lookAlikes.set(a, new Set())
    lookAlikes.get(a)!.add(b)
  }
  // Look-alikes work both ways: if A is mistaken for B, B is mistaken for A.
  for (const l of statement<{ typeId: string, otherId: string }, [string]>(sqlite, SQL.lookAlikes).all(deckId)) {
    link(l.typeId, l.otherId)
    link(l.otherId, l.typeId)
  }
  return { deck, types, views: [...views.values()], lookAlikes }
}

function parseFeatures(text: string | null): Record<string, string> {
  if (!text) return {}
  try {
    const v = JSON.parse(text) as unknown
    if (Array.isArray(v)) return Object.fromEntries(v.map((f, i) => [String(i + 1), String(f)]))
    if (v && typeof v === 'object') return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, String(x)]))
  }
  catch { /* not JSON: no features */ }
  return {}
}

function toPlanTrack(r: TrackRow): PlanTrack {
  const { id, targetTypeId, aspect, ...state } = r
  return { id, targetTypeId, aspect, state }
}

function readTracks(sqlite: Database, userId: string, deckId: string): PlanTrack[] {
  return statement<TrackRow, [string, string]>(sqlite, SQL.tracks).all(userId, deckId).map(toPlanTrack)
}

/** Creates the missing tracks (one per target type x aspect with a rendered view); returns them all. */
export function ensureTracks(sqlite: Database, userId: string, content: DeckContent, nowMs: number): PlanTrack[] {
  const existing = readTracks(sqlite, userId, content.deck.id)
  const have = new Set(existing.map(t => `${t.targetTypeId}|${t.aspect}`))
  const fresh = newTrackState(nowMs)
  const insert = statement<never, [TrackParams & { userId: string, deckId: string, targetTypeId: string, aspect: string }]>(sqlite, SQL.insertTrack)
  let added = false
  for (const k of trackKeys(content)) {
    if (have.has(`${k.targetTypeId}|${k.aspect}`)) continue
    insert.run({ id: newId(), userId, deckId: content.deck.id, ...k, ...fresh, now: nowMs })
    added = true
  }
  if (!added) return existing
  // New tracks in the order of trackKeys (the order they are introduced in).
  const order = new Map(trackKeys(content).map((k, i) => [`${k.targetTypeId}|${k.aspect}`, i]))
  return readTracks(sqlite, userId, content.deck.id)
    .sort((a, b) => (order.get(`${a.targetTypeId}|${a.aspect}`) ?? 1e9) - (order.get(`${b.targetTypeId}|${b.aspect}`) ?? 1e9))
}

/** The wrong names this trainee's crew called in watches of the deck, as the plans of watches and checks read them: shown type -> called type -> count. */
export function crewConfusions(sqlite: Database, userId: string, deckId: string): Map<string, Map<string, number>> {
  const out = new Map<string, Map<string, number>>()
  for (const r of statement<{ shown: string, called: string, n: number }, [string, string]>(sqlite, SQL.confusions).all(deckId, userId)) {
    if (!out.has(r.shown)) out.set(r.shown, new Map())
    out.get(r.shown)!.set(r.called, r.n)
  }
  return out
}

function assignedDecks(sqlite: Database, userId: string) {
  return statement<{ id: string, title: string }, [string]>(sqlite, SQL.assigned).all(userId)
}

function newIntroducedToday(sqlite: Database, userId: string, deckId: string, nowMs: number) {
  return statement<{ n: number }, [string, string, number]>(sqlite, SQL.newToday).get(userId, deckId, dayStart(nowMs))!.n
}

// ---------------------------------------------------------------- issuing

function storedWatch(sqlite: Database, watchId: string, content: DeckContent, day: string): IssuedWatch {
  const rows = watchSightings(sqlite, watchId)
  const flags = statement<{ practice: number }, [string]>(sqlite, SQL.watchFlags).get(watchId)
  return {
    id: watchId,
    deckId: content.deck.id,
    deckTitle: content.deck.title,
    day,
    hesitationMs: content.deck.hesitationMs,
    sightings: rows.map(r => issuedFromRow(r, content.deck.answerMode)),
    nextDueAt: null,
    introductions: introductionsOf(sqlite, watchId),
    practice: !!flags?.practice,
  }
}

// ---------------------------------------------------------------- pictures and introductions

const pictureUrl = (id: string) => `/images/p/${id}.webp`

/**
 * The watch's picture of a type at an aspect (its teaching rendering, teachingVariant), made once per
 * watch under an opaque id; null when the type has no rendered view.
 */
function ensurePicture(sqlite: Database, watchId: string, userId: string, content: DeckContent, typeId: string, aspect: string): { id: string, aspect: string } | null {
  const v = teachingVariant(content, typeId, aspect)
  if (!v) return null
  statement<never, [string, string, string, string, string, string]>(sqlite, SQL.insertPicture).run(newId(), watchId, userId, typeId, v.aspect, v.variant.id)
  const row = statement<{ id: string }, [string, string, string]>(sqlite, SQL.pictureOf).get(watchId, typeId, v.aspect)!
  return { id: row.id, aspect: v.aspect }
}

interface IntroductionParams {
  id: string
  watchId: string
  userId: string
  trackId: string
  beforeSightingId: string
  ord: number
  targetTypeId: string
  aspect: string
  pictureId: string
  lookAlikeTypeId: string | null
  lookAlikePictureId: string | null
}

/**
 * Stores a new watch's introductions (each before its sighting, in order) and the pictures its
 * reveals need: each choice's type at the sighting's aspect, so a wrong call can be shown beside the
 * right one, online or from the pack.
 */
function storeTeaching(sqlite: Database, watchId: string, userId: string, content: DeckContent, sightingIds: string[], planned: PlannedSighting[], intros: PlannedIntroduction[]) {
  planned.forEach((p) => {
    const typeIds = p.choices.length ? p.choices.map(c => c.typeId) : [p.targetTypeId]
    for (const typeId of typeIds) ensurePicture(sqlite, watchId, userId, content, typeId, p.aspect)
  })
  intros.forEach((intro, ord) => {
    const picture = ensurePicture(sqlite, watchId, userId, content, intro.targetTypeId, intro.aspect)
    if (!picture) return
    const look = intro.lookAlikeTypeId ? ensurePicture(sqlite, watchId, userId, content, intro.lookAlikeTypeId, intro.aspect) : null
    statement<never, [IntroductionParams]>(sqlite, SQL.insertIntroduction).run({
      id: newId(), watchId, userId, trackId: intro.trackId, beforeSightingId: sightingIds[intro.beforeIndex]!, ord,
      targetTypeId: intro.targetTypeId, aspect: picture.aspect, pictureId: picture.id,
      lookAlikeTypeId: look ? intro.lookAlikeTypeId : null, lookAlikePictureId: look?.id ?? null,
    })
  })
}

function watchPictures(sqlite: Database, watchId: string) {
  const rows = statement<WatchPictureRow, [string]>(sqlite, SQL.watchPictures).all(watchId)
  const byId = new Map<string, TeachingPicture & { typeId: string }>()
  const byKey = new Map<string, TeachingPicture & { typeId: string }>()
  for (const r of rows) {
    const p = { typeId: r.typeId, name: r.name, aspect: r.aspect, features: parseFeatures(r.features), imageUrl: pictureUrl(r.id) }
    byId.set(r.id, p)
    byKey.set(`${r.typeId}|${r.aspect}`, p)
  }
  return { byId, byKey }
}

// The introductions still to come: those before a sighting not yet called or voided.
function introductionsOf(sqlite: Database, watchId: string): Introduction[] {
  const rows = statement<IntroductionRow, [string]>(sqlite, SQL.watchIntroductions).all(watchId)
  if (!rows.length) return []
  const { byId } = watchPictures(sqlite, watchId)
  const strip = (p: TeachingPicture & { typeId: string }): TeachingPicture => ({ name: p.name, aspect: p.aspect, features: p.features, imageUrl: p.imageUrl })
  return rows.flatMap((r) => {
    const p = byId.get(r.pictureId)
    if (!p) return []
    const look = r.lookAlikePictureId ? byId.get(r.lookAlikePictureId) : undefined
    return [{ id: r.id, beforeSightingId: r.beforeSightingId, ...strip(p), lookAlike: look ? strip(look) : null }]
  })
}

/** The file behind a watch picture, for the trainee it was issued to only (else null: answered as unknown). */
export function pictureFileFor(userId: string, pictureId: string, sqlite: Database = useSqlite()): string | null {
  return statement<{ file: string }, [string, string]>(sqlite, SQL.pictureFile).get(pictureId, userId)?.file ?? null
}

// The picture of a type at an aspect in a watch, as a reveal shows it.
function revealPicture(sqlite: Database, watchId: string, typeId: string, aspect: string): string | null {
  const row = statement<{ id: string }, [string, string, string]>(sqlite, SQL.revealPicture).get(watchId, typeId, aspect)
  return row ? pictureUrl(row.id) : null
}

function closeWatch(sqlite: Database, watchId: string, nowMs: number) {
  statement<never, [number, number, string]>(sqlite, SQL.closeWatch).run(nowMs, nowMs, watchId)
}

function openWatchesOf(sqlite: Database, userId: string, deckId: string) {
  return statement<{ id: string, day: string }, [string, string]>(sqlite, SQL.openWatches).all(userId, deckId)
}

// Today's open watch of a deck, if any; open watches of earlier days, or with every sighting called, are closed.
function openWatchToday(sqlite: Database, userId: string, deckId: string, nowMs: number): string | null {
  const today = watchDay(nowMs)
  let found: string | null = null
  for (const w of openWatchesOf(sqlite, userId, deckId)) {
    const left = watchSightings(sqlite, w.id).filter(s => !s.called).length
    if (w.day === today && left > 0 && !found) found = w.id
    else closeWatch(sqlite, w.id, nowMs)
  }
  return found
}

function pickDeck(sqlite: Database, userId: string, deckId: string | undefined, nowMs: number): DeckContent {
  const decks = assignedDecks(sqlite, userId)
  if (deckId) {
    if (!decks.some(d => d.id === deckId)) throw notFound('No such deck among the decks assigned to your crew.')
    return loadDeckContent(sqlite, deckId)!
  }
  if (!decks.length) throw notFound('No published deck is assigned to your crew yet. Ask your instructor.')
  let first: DeckContent | null = null
  for (const d of decks) {
    const content = loadDeckContent(sqlite, d.id)!
    first ??= content
    const w = workloadOf(sqlite, userId, content, nowMs)
    if (w.openLeft > 0 || w.due > 0 || w.new > 0) return content
  }
  return first!
}

/**
 * Today's watch for a trainee: the open one of today again, or a new one planned by planWatch and
 * stored at once (every sighting with its id, the answer kept server-side). Nothing to call: id null.
 */
export function issueWatch(sqlite: Database, userId: string, deckId: string | undefined, nowMs = Date.now(), random: WatchRandom = serverRandom, opts: { practice?: boolean } = {}): IssuedWatch {
  return sqlite.transaction(() => {
    const content = pickDeck(sqlite, userId, deckId, nowMs)
    const day = watchDay(nowMs)
    const open = openWatchToday(sqlite, userId, content.deck.id, nowMs)
    if (open) return storedWatch(sqlite, open, content, day)
    const tracks = ensureTracks(sqlite, userId, content, nowMs)
    const confusions = crewConfusions(sqlite, userId, content.deck.id)
    const input = { content, tracks, nowMs, newIntroducedToday: newIntroducedToday(sqlite, userId, content.deck.id, nowMs), confusions, ...random }
    let plan = planWatch(input)
    let practice = false
    if (opts.practice) {
      // Practice is what the watch offers when nothing is due: sightings that are due go first.
      if (plan.sightings.length) {
        throw createError({ statusCode: 409, message: 'Sightings are due on this deck: start the watch instead of a practice.' })
      }
      if (!canPractise(tracks)) {
        throw createError({ statusCode: 409, message: 'Nothing to practise yet: a practice repeats types you have called before.' })
      }
      plan = planWatch({ ...input, practice: true })
      practice = true
    }
    if (!plan.sightings.length) {
      const next = tracks.filter(t => t.state.reps > 0).reduce<number | null>((m, t) => (m === null || t.state.due < m ? t.state.due : m), null)
      return {
        id: null, deckId: content.deck.id, deckTitle: content.deck.title, day, hesitationMs: content.deck.hesitationMs, sightings: [], nextDueAt: next,
        introductions: [], practice: false, practiceSize: practiceSizeOf(tracks, content),
      }
    }
    const watchId = newId()
    statement<never, [string, string, string, string, number, number, number]>(sqlite, SQL.insertWatch)
      .run(watchId, userId, content.deck.id, day, practice ? 1 : 0, nowMs, nowMs)
    const ids = plan.sightings.map((p, i) => insertSighting(sqlite, watchId, userId, p, i, nowMs))
    storeTeaching(sqlite, watchId, userId, content, ids, plan.sightings, plan.introductions)
    return storedWatch(sqlite, watchId, content, day)
  }).immediate()
}

/** Today's watch (or a practice) for the signed-in trainee, on the server's database. */
export function startWatch(userId: string, deckId: string | undefined, opts: { practice?: boolean } = {}): IssuedWatch {
  return issueWatch(useSqlite(), userId, deckId, Date.now(), serverRandom, opts)
}

// How many sightings a practice would hold: the tracks called before (with a rendered view), at most PRACTICE_SIZE.
function practiceSizeOf(tracks: readonly PlanTrack[], content: DeckContent) {
  const keyed = new Set(trackKeys(content).map(k => `${k.targetTypeId}|${k.aspect}`))
  return Math.min(PRACTICE_SIZE, tracks.filter(t => t.state.reps > 0 && keyed.has(`${t.targetTypeId}|${t.aspect}`)).length)
}

function workloadOf(sqlite: Database, userId: string, content: DeckContent, nowMs: number): DeckWorkload {
  const keys = trackKeys(content)
  const tracks = new Map(readTracks(sqlite, userId, content.deck.id).map(t => [`${t.targetTypeId}|${t.aspect}`, t]))
  let due = 0
  let fresh = 0
  let called = 0
  let nextDueAt: number | null = null
  for (const k of keys) {
    const t = tracks.get(`${k.targetTypeId}|${k.aspect}`)
    if (!t || t.state.reps === 0) fresh++
    else {
      called++
      if (t.state.due <= nowMs) due++
      if (nextDueAt === null || t.state.due < nextDueAt) nextDueAt = t.state.due
    }
  }
  const newAllowed = Math.max(0, content.deck.newPerDay - newIntroducedToday(sqlite, userId, content.deck.id, nowMs))
  due = Math.min(due, WATCH_MAX_SIGHTINGS)
  fresh = Math.min(fresh, newAllowed, WATCH_MAX_SIGHTINGS - due)
  const today = watchDay(nowMs)
  let openWatchId: string | null = null
  let openLeft = 0
  for (const w of openWatchesOf(sqlite, userId, content.deck.id)) {
    if (w.day !== today) continue
    const left = watchSightings(sqlite, w.id).filter(s => !s.called).length
    if (left > 0) {
      openWatchId = w.id
      openLeft = left
      break
    }
  }
  return { deckId: content.deck.id, title: content.deck.title, due, new: fresh, openWatchId, openLeft, nextDueAt, practice: Math.min(PRACTICE_SIZE, called) }
}

/** What each assigned deck holds for today, read only (no track or watch is created). */
export function watchToday(userId: string, nowMs = Date.now(), sqlite: Database = useSqlite()): WatchToday {
  const decks = assignedDecks(sqlite, userId).map(d => workloadOf(sqlite, userId, loadDeckContent(sqlite, d.id)!, nowMs))
  return { day: watchDay(nowMs), decks }
}

// ---------------------------------------------------------------- a watch's call

/**
 * A graded call on a watch's sighting (calls.ts reads, refuses and grades it): the track reviewed by
 * FSRS at the call's own time, the answer revealed, a missed track re-shown at least three
 * sightings later, all in one write with the call (stored once: a resend gets the first result).
 */
export function recordWatchCall(sqlite: Database, s: CallSightingRow, choices: readonly PlannedChoice[], call: CallFields, nowMs: number, random: WatchRandom): CallResult {
  const { sightingId, userId, deckId, calledAt, grade, correct } = call
  return allOrNothing(sqlite, () => {
    const again = storedCallResult<CallResult>(sqlite, sightingId)
    if (again) return again
    const trackRow = s.trackId ? statement<TrackRow, [string]>(sqlite, SQL.track).get(s.trackId) : undefined
    let before: TrackState | null = null
    let after: TrackState | null = null
    let trackOut = { stage: 'new' as CallResult['track']['stage'], due: calledAt }
    if (trackRow) {
      const track = toPlanTrack(trackRow)
      // Calls synced out of order are applied no earlier than the track's last review.
      const reviewAt = Math.max(calledAt, track.state.lastReview ?? 0)
      const review = reviewTrack(track.state, grade, reviewAt, { retention: s.retention ?? 0.9, weights: weightsOfCrew(sqlite, s.crewId) })
      before = review.before
      after = review.after
      trackOut = { stage: stageOf(after, reviewAt, s.retention ?? 0.9), due: after.due }
    }
    const result: CallResult = {
      sightingId,
      grade,
      correct,
      anticipation: call.anticipation,
      calledChoiceId: call.choiceId,
      answer: {
        id: s.targetTypeId, choiceId: choices.length ? s.answerChoiceId : null, name: s.typeName, features: parseFeatures(s.typeFeatures),
        imageUrl: revealPicture(sqlite, s.watchId, s.targetTypeId, s.aspect),
      },
      latencyMs: call.latencyMs,
      calledAt,
      track: trackOut,
      called: null,
    }
    // A wrong name: the type called, beside the right one in the reveal.
    const calledTypeId = call.calledTypeId
    if (!correct && calledTypeId && calledTypeId !== s.targetTypeId) {
      const other = statement<AnswerTypeRow, [string]>(sqlite, SQL.answerType).get(calledTypeId)
      if (other) {
        result.called = { name: other.name, aspect: s.aspect, features: parseFeatures(other.features), imageUrl: revealPicture(sqlite, s.watchId, other.id, s.aspect) }
      }
    }
    let reshow: { plan: PlannedSighting, id: string } | null = null
    if (grade === 'missed' && trackRow && after) {
      const count = statement<{ n: number }, [string, string]>(sqlite, SQL.reshowCount).get(s.watchId, trackRow.id)!.n
      if (count < MAX_RESHOWS_PER_TRACK) {
        // Only the missed track's own views are read: a re-show needs no other rendering.
        const content = loadDeckContent(sqlite, deckId, { targetTypeId: trackRow.targetTypeId, aspect: trackRow.aspect })
        if (content && content.views.length) {
          // The re-show offers the names the missed sighting offered (chosen from look-alikes and the
          // crew's confusions when the watch was issued), in a new order under new ids; so a call
          // reads no crew history, however long it is.
          const offered = new Set([trackRow.targetTypeId, ...choices.map(c => c.typeId)])
          const again = choices.length ? { ...content, types: content.types.filter(t => offered.has(t.id)) } : content
          const plan = planTrackSighting({ ...toPlanTrack(trackRow), state: after }, {
            content: again, confusions: new Map(), ...random,
          })
          reshow = { plan, id: '' }
        }
      }
    }
    // The whole answer is known before the insert, so the stored result is written with the call itself.
    // Only a re-show needs the sightings still to come; otherwise whether any is left.
    const remaining = reshow ? statement<{ id: string, typeId: string, position: number }, [string, string]>(sqlite, SQL.uncalled).all(s.watchId, sightingId) : []
    const anyLeft = reshow ? remaining.length > 0 : !!statement<unknown, [string, string]>(sqlite, SQL.anyUncalled).get(s.watchId, sightingId)
    let order: string[] = []
    if (reshow) {
      reshow.id = newId()
      order = reshowOrder(sightingId, remaining, { id: reshow.id, typeId: s.targetTypeId })
      result.appended = [issuedFromPlan(reshow.id, s.position + 1 + order.indexOf(reshow.id), reshow.plan, s.answerMode ?? 'choices', true)]
    }
    const stored = insertCall(sqlite, call, {
      before: before ? JSON.stringify(before) : null,
      after: after ? JSON.stringify(after) : null,
      result: JSON.stringify(result),
    }, nowMs)
    if (!stored) return storedCallResult<CallResult>(sqlite, sightingId)!
    if (trackRow && after) statement<never, [TrackParams]>(sqlite, SQL.updateTrack).run({ id: trackRow.id, ...after, now: nowMs })
    if (reshow) {
      // The re-show goes in at its place; of the others only those that move are written (the ones
      // after it, mostly), since every row written is one more page in the commit.
      insertSighting(sqlite, s.watchId, userId, reshow.plan, s.position + 1 + order.indexOf(reshow.id), nowMs, sightingId, reshow.id)
      const positionOf = new Map(remaining.map(r => [r.id, r.position]))
      const setPosition = statement<never, [number, string]>(sqlite, SQL.setPosition)
      order.forEach((id, i) => {
        const position = s.position + 1 + i
        if (id !== reshow.id && positionOf.get(id) !== position) setPosition.run(position, id)
      })
    }
    else if (!anyLeft) {
      closeWatch(sqlite, s.watchId, nowMs)
    }
    return result
  })
}

// ---------------------------------------------------------------- a sighting's picture

/** The rendering file of a sighting (watch or check) issued to this trainee; null for anyone else's or an unknown one. */
export function sightingImageFile(userId: string, sightingId: string, sqlite: Database = useSqlite()): string | null {
  return statement<{ file: string }, [string, string]>(sqlite, SQL.sightingFile).get(sightingId, userId)?.file ?? null
}

// ---------------------------------------------------------------- the offline pack

/** The watch's sightings with their answers and features, for feedback with no connection; never a check's. */
export function watchPack(userId: string, watchId: string, sqlite: Database = useSqlite()): WatchPack {
  const w = statement<WatchRow, [string]>(sqlite, SQL.watch).get(watchId)
  if (!w || w.userId !== userId || !w.deckId) throw notFound('No such watch of yours.')
  if (w.kind === 'check') throw createError({ statusCode: 403, message: 'A check has no pack: it runs online only.' })
  const names = statement<{ id: string, name: string }, [string]>(sqlite, SQL.deckNames).all(w.deckId)
  const types = new Map(names.map(n => [n.id, n]))
  const features = new Map<string, Record<string, string>>()
  const rows = watchSightings(sqlite, watchId)
  const { byKey } = watchPictures(sqlite, watchId)
  const pictureAt = (typeId: string, aspect: string) => byKey.get(`${typeId}|${aspect}`) ?? [...byKey.values()].find(p => p.typeId === typeId)
  return {
    id: w.id,
    deckId: w.deckId,
    day: w.day,
    hesitationMs: w.hesitationMs,
    names: names.map(n => ({ id: n.id, name: n.name })),
    introductions: introductionsOf(sqlite, watchId),
    sightings: rows.map((r) => {
      if (!features.has(r.targetTypeId)) {
        const t = statement<AnswerTypeRow, [string]>(sqlite, SQL.answerType).get(r.targetTypeId)
        features.set(r.targetTypeId, parseFeatures(t?.features ?? null))
      }
      const aspect = r.aspect
      return {
        ...issuedFromRow(r, w.answerMode),
        hesitationMs: w.hesitationMs,
        answer: {
          id: r.targetTypeId,
          choiceId: w.answerMode === 'typed' ? null : r.answerChoiceId,
          name: types.get(r.targetTypeId)?.name ?? '',
          features: features.get(r.targetTypeId)!,
          imageUrl: pictureAt(r.targetTypeId, aspect)?.imageUrl ?? null,
        },
        choiceTypes: (JSON.parse(r.choices) as PlannedChoice[]).map((c) => {
          const p = pictureAt(c.typeId, aspect)
          return { choiceId: c.id, name: c.label, aspect, features: p?.features ?? {}, imageUrl: p?.imageUrl ?? null }
        }),
      }
    }),
  }
}

// ---------------------------------------------------------------- voided sightings

interface VoidRow { voidedAt: number | null, variantId: string | null, rangeM: number, binoculars: number, apparentPx: number, exposureMs: number, reshowOf: string | null }

export interface VoidResult { sightingId: string, voidedAt: number, appended: IssuedSighting[] }

/**
 * Voids an uncalled sighting of a watch (the screen was hidden while it showed): it takes no call
 * (409), and a copy with fresh choice ids goes to the end of the same watch. A resend returns the same copy.
 */
export function voidSighting(userId: string, sightingId: string, nowMs = Date.now(), sqlite: Database = useSqlite()): VoidResult {
  return sqlite.transaction(() => {
    const s = sightingForCall(sqlite, sightingId)
    if (!s || s.userId !== userId || !s.deckId) throw notFound('No such sighting was issued to you.')
    if (s.kind !== 'watch') throw createError({ statusCode: 403, message: 'Only a sighting of a watch can be voided.' })
    if (s.result !== null) throw createError({ statusCode: 409, message: 'This sighting was already called; a called sighting cannot be voided.' })
    const row = statement<VoidRow, [string]>(sqlite, SQL.voidRow).get(sightingId)!
    const voidedAt = row.voidedAt ?? nowMs
    const answerMode = s.answerMode ?? 'choices'
    const read = (id: string) => watchSightings(sqlite, s.watchId).filter(r => r.id === id).map(r => issuedFromRow(r, answerMode))
    if (row.voidedAt !== null) {
      const copy = statement<{ id: string }, [string, string, string | null, string | null, number]>(sqlite, SQL.copyOf)
        .get(s.watchId, sightingId, s.trackId, row.variantId, row.voidedAt)
      return { sightingId, voidedAt, appended: copy ? read(copy.id) : [] }
    }
    statement<never, [number, string]>(sqlite, SQL.setVoided).run(voidedAt, sightingId)
    // Fresh choice ids, so nothing links the copy's buttons to the voided sighting's.
    const ids = new Map<string, string>()
    const choices = (JSON.parse(s.choices) as PlannedChoice[]).map((c) => {
      ids.set(c.id, newId())
      return { ...c, id: ids.get(c.id)! }
    })
    const id = newId()
    const position = statement<{ p: number }, [string]>(sqlite, SQL.maxPosition).get(s.watchId)!.p + 1
    // The copy is the same sighting (rendering, range, exposure) under a new id, stored as any other.
    insertSighting(sqlite, s.watchId, userId, {
      trackId: s.trackId, targetTypeId: s.targetTypeId, variantId: row.variantId, aspect: s.aspect, condition: s.condition, rangeM: row.rangeM,
      binoculars: !!row.binoculars, apparentPx: row.apparentPx, exposureMs: row.exposureMs, windowMs: s.windowMs, choices,
      answerChoiceId: ids.get(s.answerChoiceId) ?? s.answerChoiceId,
    }, position, voidedAt, row.reshowOf, id)
    return { sightingId, voidedAt, appended: read(id) }
  }).immediate()
}
