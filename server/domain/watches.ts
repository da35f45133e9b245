// The watch on the database: tracks created lazily, a day's watch issued at once, calls graded
// and scheduled in one transaction, the offline pack. Plain imports (no Nitro auto-imports) so
// that the demo history seed runs this same code over simulated days.
// A watch day is the UTC date of issue (YYYY-MM-DD): one open watch per trainee, deck and day.
import { randomBytes as cryptoRandomBytes, randomInt } from 'node:crypto'
import type { Database, Statement } from 'better-sqlite3'
import { createError } from 'h3'
import { newTrackState, reviewTrack, stageOf } from '../core/scheduling/fsrs'
import type { TrackState } from '../core/scheduling/fsrs'
import type { Rng } from '../core/watch/rng'
import { gradeAnswer } from '../../shared/utils/call'
import type { CallInput } from '../../shared/schemas/drill'
import type { CallResult, DeckWorkload, Introduction, IssuedSighting, IssuedWatch, TeachingPicture, WatchPack, WatchToday } from '../../shared/types/drill'
import {
  canPractise, drillableKeys, isUntilCall, maskUrlFor, MAX_RESHOWS_PER_TRACK, planTrackSighting, planWatchItems, reshowOrder,
  sightingImageUrl, teachingVariant, WATCH_MAX_SIGHTINGS,
} from './watch-plan'
import { PRACTICE_SIZE } from '../core/watch/queue'
import type { ContentVariant, ContentView, DeckContent, PlannedChoice, PlannedIntroduction, PlannedSighting, PlanTrack } from './watch-plan'
import { allOrNothing } from '../utils/group-commit'
import { newCallId, newId } from '../utils/ids'
import { recordCheckCall } from './checks'
import { weightsForCall } from './crew-fits'
import type { CheckCallRecorded } from '../../shared/schemas/checks'

const DAY_MS = 86_400_000
// An offline call may be applied at its own time up to this long after the sighting was issued.
export const CALL_LATE_LIMIT_MS = 36 * 3_600_000
// A voided sighting (screen hidden while it showed) takes no call; its copy later in the watch does.
export const VOIDED_MESSAGE = 'This sighting was voided (the screen was hidden while it showed), so this call is not counted; it is shown again later in the watch.'
// A call made this long before it reached the server counts as made offline.
const OFFLINE_AFTER_MS = 30_000

export interface DrillRandom { rng: Rng, randomBytes: (size: number) => Uint8Array }

const serverRandom: DrillRandom = { rng: () => randomInt(0, 2 ** 32) / 2 ** 32, randomBytes: n => cryptoRandomBytes(n) }

export function watchDay(nowMs: number) {
  return new Date(nowMs).toISOString().slice(0, 10)
}

function dayStart(nowMs: number) {
  return Math.floor(nowMs / DAY_MS) * DAY_MS
}

const notFound = (message: string) => createError({ statusCode: 404, message })

// ---------------------------------------------------------------- prepared statements

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
  confusions: `SELECT c.target_type_id AS shown, c.called_type_id AS called, count(*) AS n FROM calls c
    WHERE c.deck_id = ? AND c.kind = 'watch' AND c.correct = 0 AND c.called_type_id IS NOT NULL AND c.called_type_id <> c.target_type_id
    AND c.user_id IN (SELECT m2.user_id FROM memberships m1 JOIN memberships m2 ON m2.crew_id = m1.crew_id WHERE m1.user_id = ?)
    GROUP BY 1, 2`,
  openWatches: `SELECT id, day FROM watches WHERE user_id = ? AND deck_id = ? AND kind = 'watch' AND status = 'open' ORDER BY created_at DESC`,
  closeWatch: `UPDATE watches SET status = 'closed', closed_at = ?, updated_at = ? WHERE id = ? AND status = 'open'`,
  insertWatch: `INSERT INTO watches (id, user_id, deck_id, kind, day, status, created_at, updated_at) VALUES (?, ?, ?, 'watch', ?, 'open', ?, ?)`,
  watch: `SELECT w.id, w.user_id AS userId, w.deck_id AS deckId, w.kind, w.day, d.title, d.hesitation_ms AS hesitationMs,
    d.answer_mode AS answerMode FROM watches w LEFT JOIN decks d ON d.id = w.deck_id WHERE w.id = ?`,
  insertSighting: `INSERT INTO sightings (id, watch_id, user_id, track_id, target_type_id, position, variant_id, aspect, condition,
    range_m, binoculars, apparent_px, exposure_ms, window_ms, choices, answer_choice_id, reshow_of, issued_at)
    VALUES (@id, @watchId, @userId, @trackId, @targetTypeId, @position, @variantId, @aspect, @condition, @rangeM, @binoculars,
    @apparentPx, @exposureMs, @windowMs, @choices, @answerChoiceId, @reshowOf, @issuedAt)`,
  watchSightings: `SELECT s.id, s.position, s.track_id AS trackId, s.target_type_id AS targetTypeId, s.exposure_ms AS exposureMs,
    s.window_ms AS windowMs, s.apparent_px AS apparentPx, s.range_m AS rangeM, s.binoculars, s.choices,
    s.answer_choice_id AS answerChoiceId, s.reshow_of AS reshowOf, x.file, x.width, x.height,
    (SELECT count(*) FROM calls c WHERE c.sighting_id = s.id) + (s.voided_at IS NOT NULL) AS called
    FROM sightings s JOIN variants x ON x.id = s.variant_id WHERE s.watch_id = ? ORDER BY s.position, s.issued_at`,
  sightingForCall: `SELECT s.id, s.user_id AS userId, s.watch_id AS watchId, s.track_id AS trackId, s.target_type_id AS targetTypeId,
    s.aspect, s.condition, s.position, s.window_ms AS windowMs, s.choices, s.answer_choice_id AS answerChoiceId,
    s.issued_at AS issuedAt, s.reshow_of AS reshowOf, s.voided_at AS voidedAt, w.kind, w.deck_id AS deckId, d.hesitation_ms AS hesitationMs,
    d.retention, d.answer_mode AS answerMode
    FROM sightings s JOIN watches w ON w.id = s.watch_id LEFT JOIN decks d ON d.id = w.deck_id WHERE s.id = ?`,
  callResult: `SELECT result FROM calls WHERE sighting_id = ?`,
  answerType: `SELECT id, name, features FROM target_types WHERE id = ?`,
  deckNames: `SELECT id, name FROM target_types WHERE deck_id = ?`,
  insertCall: `INSERT INTO calls (id, sighting_id, user_id, deck_id, track_id, target_type_id, called_type_id, aspect, condition,
    choice_id, typed, correct, grade, anticipation, latency_ms, frames_shown, frame_interval_ms, called_at, received_at,
    offline, before, after, result)
    VALUES (@id, @sightingId, @userId, @deckId, @trackId, @targetTypeId, @calledTypeId, @aspect, @condition, @choiceId, @typed,
    @correct, @grade, @anticipation, @latencyMs, @framesShown, @frameIntervalMs, @calledAt, @receivedAt, @offline, @before,
    @after, @result) ON CONFLICT (sighting_id) DO NOTHING`,
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
} as const

type StatementName = keyof typeof SQL
const prepared = new WeakMap<Database, Map<StatementName, Statement>>()

function stmt(sqlite: Database, name: StatementName): Statement {
  let cache = prepared.get(sqlite)
  if (!cache) {
    cache = new Map()
    prepared.set(sqlite, cache)
  }
  let s = cache.get(name)
  if (!s) {
    s = sqlite.prepare(SQL[name])
    cache.set(name, s)
  }
  return s
}

// ---------------------------------------------------------------- deck content and tracks

interface DeckRow { id: string, title: string, category: string, status: string, hesitationMs: number, windowMs: number, newPerDay: number, retention: number, choiceCount: number, answerMode: string, minExposureMs: number }

/** A deck's settings, types and look-alikes, with every rendered view (or only those of one type and aspect). */
export function loadDrillContent(sqlite: Database, deckId: string, only?: { targetTypeId: string, aspect: string }): DeckContent | null {
  const deck = stmt(sqlite, 'deck').get(deckId) as DeckRow | undefined
  if (!deck) return null
  const types = (stmt(sqlite, 'types').all(deckId) as { id: string, name: string, category: string, sizeM: number, features: string }[])
    .map(t => ({ ...t, features: parseFeatures(t.features) }))
  const views = new Map<string, ContentView>()
  const rows = only ? stmt(sqlite, 'variantsOf').all(only.targetTypeId, only.aspect) : stmt(sqlite, 'variants').all(deckId)
  for (const r of rows as (ContentVariant & { viewId: string, targetTypeId: string, aspect: string })[]) {
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
  for (const l of stmt(sqlite, 'lookAlikes').all(deckId) as { typeId: string, otherId: string }[]) {
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

type TrackRow = TrackState & { id: string, targetTypeId: string, aspect: string }

function toPlanTrack(r: TrackRow): PlanTrack {
  const { id, targetTypeId, aspect, ...state } = r
  return { id, targetTypeId, aspect, state }
}

function readTracks(sqlite: Database, userId: string, deckId: string): PlanTrack[] {
  return (stmt(sqlite, 'tracks').all(userId, deckId) as TrackRow[]).map(toPlanTrack)
}

/** Creates the missing tracks (one per target type x aspect with a rendered view); returns them all. */
export function ensureTracks(sqlite: Database, userId: string, content: DeckContent, nowMs: number): PlanTrack[] {
  const existing = readTracks(sqlite, userId, content.deck.id)
  const have = new Set(existing.map(t => `${t.targetTypeId}|${t.aspect}`))
  const fresh = newTrackState(nowMs)
  let added = false
  for (const k of drillableKeys(content)) {
    if (have.has(`${k.targetTypeId}|${k.aspect}`)) continue
    stmt(sqlite, 'insertTrack').run({ id: newId(), userId, deckId: content.deck.id, ...k, ...fresh, now: nowMs })
    added = true
  }
  if (!added) return existing
  // New tracks in the order of drillableKeys (the order they are introduced in).
  const order = new Map(drillableKeys(content).map((k, i) => [`${k.targetTypeId}|${k.aspect}`, i]))
  return readTracks(sqlite, userId, content.deck.id)
    .sort((a, b) => (order.get(`${a.targetTypeId}|${a.aspect}`) ?? 1e9) - (order.get(`${b.targetTypeId}|${b.aspect}`) ?? 1e9))
}

function confusionsFor(sqlite: Database, userId: string, deckId: string) {
  const out = new Map<string, Map<string, number>>()
  const rows = stmt(sqlite, 'confusions').all(deckId, userId)
  for (const r of rows as { shown: string, called: string, n: number }[]) {
    if (!out.has(r.shown)) out.set(r.shown, new Map())
    out.get(r.shown)!.set(r.called, r.n)
  }
  return out
}

function assignedDecks(sqlite: Database, userId: string) {
  return stmt(sqlite, 'assigned').all(userId) as { id: string, title: string }[]
}

function newIntroducedToday(sqlite: Database, userId: string, deckId: string, nowMs: number) {
  return (stmt(sqlite, 'newToday').get(userId, deckId, dayStart(nowMs)) as { n: number }).n
}

// ---------------------------------------------------------------- issuing

interface StoredSightingRow {
  id: string
  position: number
  trackId: string | null
  targetTypeId: string
  exposureMs: number
  windowMs: number
  apparentPx: number
  rangeM: number
  binoculars: number
  choices: string
  answerChoiceId: string
  reshowOf: string | null
  file: string
  width: number
  height: number
  called: number
}

function publicChoices(text: string): { id: string, label: string }[] {
  return (JSON.parse(text) as PlannedChoice[]).map(c => ({ id: c.id, label: c.label }))
}

function issuedFromRow(r: StoredSightingRow, answerMode: string): IssuedSighting {
  return {
    id: r.id,
    position: r.position,
    imageUrl: sightingImageUrl(r.id),
    maskUrl: maskUrlFor(r.id),
    choices: publicChoices(r.choices),
    answerMode: answerMode === 'typed' ? 'typed' : 'choices',
    exposureMs: r.exposureMs,
    untilCall: isUntilCall(r.exposureMs),
    windowMs: r.windowMs,
    apparentPx: Math.round(r.apparentPx),
    rangeM: Math.round(r.rangeM),
    binoculars: !!r.binoculars,
    width: r.width,
    height: r.height,
    called: r.called > 0,
    reshow: r.reshowOf !== null,
  }
}

function issuedFromPlan(id: string, position: number, p: PlannedSighting, answerMode: string, reshow: boolean): IssuedSighting {
  return issuedFromRow({
    id, position, trackId: p.trackId, targetTypeId: p.targetTypeId, exposureMs: p.exposureMs, windowMs: p.windowMs,
    apparentPx: p.apparentPx, rangeM: p.rangeM, binoculars: p.binoculars ? 1 : 0, choices: JSON.stringify(p.choices),
    answerChoiceId: p.answerChoiceId, reshowOf: reshow ? 'x' : null, file: p.file, width: p.width, height: p.height, called: 0,
  }, answerMode)
}

function insertPlanned(sqlite: Database, watchId: string, userId: string, p: PlannedSighting, position: number, nowMs: number, reshowOf: string | null, id = newId()) {
  stmt(sqlite, 'insertSighting').run({
    id, watchId, userId, trackId: p.trackId, targetTypeId: p.targetTypeId, position, variantId: p.variantId, aspect: p.aspect,
    condition: p.condition, rangeM: p.rangeM, binoculars: p.binoculars ? 1 : 0, apparentPx: p.apparentPx, exposureMs: p.exposureMs,
    windowMs: p.windowMs, choices: JSON.stringify(p.choices), answerChoiceId: p.answerChoiceId, reshowOf, issuedAt: nowMs,
  })
  return id
}

function storedWatch(sqlite: Database, watchId: string, content: DeckContent, day: string): IssuedWatch {
  const rows = stmt(sqlite, 'watchSightings').all(watchId) as StoredSightingRow[]
  const flags = stmt(sqlite, 'watchFlags').get(watchId) as { practice: number } | undefined
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
  stmt(sqlite, 'insertPicture').run(newId(), watchId, userId, typeId, v.aspect, v.variant.id)
  const row = stmt(sqlite, 'pictureOf').get(watchId, typeId, v.aspect) as { id: string }
  return { id: row.id, aspect: v.aspect }
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
    stmt(sqlite, 'insertIntroduction').run({
      id: newId(), watchId, userId, trackId: intro.trackId, beforeSightingId: sightingIds[intro.beforeIndex]!, ord,
      targetTypeId: intro.targetTypeId, aspect: picture.aspect, pictureId: picture.id,
      lookAlikeTypeId: look ? intro.lookAlikeTypeId : null, lookAlikePictureId: look?.id ?? null,
    })
  })
}

interface WatchPictureRow { id: string, typeId: string, aspect: string, name: string, features: string }

function watchPictures(sqlite: Database, watchId: string) {
  const rows = stmt(sqlite, 'watchPictures').all(watchId) as WatchPictureRow[]
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
  const rows = stmt(sqlite, 'watchIntroductions').all(watchId) as { id: string, beforeSightingId: string, pictureId: string, lookAlikePictureId: string | null }[]
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
export function pictureFileFor(sqlite: Database, userId: string, pictureId: string): string | null {
  return (stmt(sqlite, 'pictureFile').get(pictureId, userId) as { file: string } | undefined)?.file ?? null
}

// The picture of a type at an aspect in a watch, as a reveal shows it.
function revealPicture(sqlite: Database, watchId: string, typeId: string, aspect: string): string | null {
  const row = stmt(sqlite, 'revealPicture').get(watchId, typeId, aspect) as { id: string } | undefined
  return row ? pictureUrl(row.id) : null
}

function closeWatch(sqlite: Database, watchId: string, nowMs: number) {
  stmt(sqlite, 'closeWatch').run(nowMs, nowMs, watchId)
}

// Today's open watch of a deck, if any; open watches of earlier days, or with every sighting called, are closed.
function openWatchToday(sqlite: Database, userId: string, deckId: string, nowMs: number): string | null {
  const today = watchDay(nowMs)
  let found: string | null = null
  for (const w of stmt(sqlite, 'openWatches').all(userId, deckId) as { id: string, day: string }[]) {
    const left = (stmt(sqlite, 'watchSightings').all(w.id) as StoredSightingRow[]).filter(s => !s.called).length
    if (w.day === today && left > 0 && !found) found = w.id
    else closeWatch(sqlite, w.id, nowMs)
  }
  return found
}

function pickDeck(sqlite: Database, userId: string, deckId: string | undefined, nowMs: number): DeckContent {
  const decks = assignedDecks(sqlite, userId)
  if (deckId) {
    if (!decks.some(d => d.id === deckId)) throw notFound('No such deck among the decks assigned to your crew.')
    return loadDrillContent(sqlite, deckId)!
  }
  if (!decks.length) throw notFound('No published deck is assigned to your crew yet. Ask your instructor.')
  let first: DeckContent | null = null
  for (const d of decks) {
    const content = loadDrillContent(sqlite, d.id)!
    first ??= content
    const w = workloadOf(sqlite, userId, content, nowMs)
    if (w.openLeft > 0 || w.due > 0 || w.new > 0) return content
  }
  return first!
}

/**
 * Today's watch for a trainee: the open one of today again, or a new one planned by planWatch and
 * stored at once (every sighting with its id, the answer kept server-side). Nothing to drill: id null.
 */
export function issueWatch(sqlite: Database, userId: string, deckId: string | undefined, nowMs = Date.now(), random: DrillRandom = serverRandom, opts: { practice?: boolean } = {}): IssuedWatch {
  return sqlite.transaction(() => {
    const content = pickDeck(sqlite, userId, deckId, nowMs)
    const day = watchDay(nowMs)
    const open = openWatchToday(sqlite, userId, content.deck.id, nowMs)
    if (open) return storedWatch(sqlite, open, content, day)
    const tracks = ensureTracks(sqlite, userId, content, nowMs)
    const confusions = confusionsFor(sqlite, userId, content.deck.id)
    const input = { content, tracks, nowMs, newIntroducedToday: newIntroducedToday(sqlite, userId, content.deck.id, nowMs), confusions, ...random }
    let plan = planWatchItems(input)
    let practice = false
    if (opts.practice) {
      // Practice is what the watch offers when nothing is due: sightings that are due go first.
      if (plan.sightings.length) {
        throw createError({ statusCode: 409, message: 'Sightings are due on this deck: start the watch instead of a practice.' })
      }
      if (!canPractise(tracks)) {
        throw createError({ statusCode: 409, message: 'Nothing to practise yet: a practice repeats types you have called before.' })
      }
      plan = planWatchItems({ ...input, practice: true })
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
    stmt(sqlite, 'insertWatch').run(watchId, userId, content.deck.id, day, nowMs, nowMs)
    if (practice) sqlite.prepare('UPDATE watches SET practice = 1 WHERE id = ?').run(watchId)
    const ids = plan.sightings.map((p, i) => insertPlanned(sqlite, watchId, userId, p, i, nowMs, null))
    storeTeaching(sqlite, watchId, userId, content, ids, plan.sightings, plan.introductions)
    return storedWatch(sqlite, watchId, content, day)
  }).immediate()
}

// How many sightings a practice would hold: the tracks called before (with a rendered view), at most PRACTICE_SIZE.
function practiceSizeOf(tracks: readonly PlanTrack[], content: DeckContent) {
  const drillable = new Set(drillableKeys(content).map(k => `${k.targetTypeId}|${k.aspect}`))
  return Math.min(PRACTICE_SIZE, tracks.filter(t => t.state.reps > 0 && drillable.has(`${t.targetTypeId}|${t.aspect}`)).length)
}

function workloadOf(sqlite: Database, userId: string, content: DeckContent, nowMs: number): DeckWorkload {
  const keys = drillableKeys(content)
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
  for (const w of stmt(sqlite, 'openWatches').all(userId, content.deck.id) as { id: string, day: string }[]) {
    if (w.day !== today) continue
    const left = (stmt(sqlite, 'watchSightings').all(w.id) as StoredSightingRow[]).filter(s => !s.called).length
    if (left > 0) {
      openWatchId = w.id
      openLeft = left
      break
    }
  }
  return { deckId: content.deck.id, title: content.deck.title, due, new: fresh, openWatchId, openLeft, nextDueAt, practice: Math.min(PRACTICE_SIZE, called) }
}

/** What each assigned deck holds for today, read only (no track or watch is created). */
export function watchToday(sqlite: Database, userId: string, nowMs = Date.now()): WatchToday {
  const decks = assignedDecks(sqlite, userId).map(d => workloadOf(sqlite, userId, loadDrillContent(sqlite, d.id)!, nowMs))
  return { day: watchDay(nowMs), decks }
}

// ---------------------------------------------------------------- calls

interface CallSightingRow {
  id: string
  userId: string
  watchId: string
  trackId: string | null
  targetTypeId: string
  aspect: string
  condition: string
  position: number
  windowMs: number
  choices: string
  answerChoiceId: string
  issuedAt: number
  reshowOf: string | null
  voidedAt: number | null
  kind: string
  deckId: string | null
  hesitationMs: number | null
  retention: number | null
  answerMode: string | null
}

/**
 * Takes one call: graded by gradeCall, the track reviewed by FSRS at the call's own time
 * (calledAt bounded to [issuedAt, now]; more than CALL_LATE_LIMIT_MS after issue is refused), the
 * call stored once (a unique index: a resend gets the first stored result), a missed track
 * re-shown at least three sightings later. Another trainee's sighting answers 404, as an unknown one.
 */
export function callSighting(sqlite: Database, userId: string, sightingId: string, input: CallInput, nowMs = Date.now(), random: DrillRandom = serverRandom): CallResult | CheckCallRecorded {
  const s = stmt(sqlite, 'sightingForCall').get(sightingId) as CallSightingRow | undefined
  if (!s || s.userId !== userId || !s.deckId) throw notFound('No such sighting was issued to you.')
  const stored = stmt(sqlite, 'callResult').get(sightingId) as { result: string } | undefined
  if (stored) return JSON.parse(stored.result) as CallResult
  if (s.voidedAt !== null) throw createError({ statusCode: 409, message: VOIDED_MESSAGE })

  const calledAt = Math.min(Math.max(input.calledAt ?? nowMs, s.issuedAt), nowMs)
  if (calledAt - s.issuedAt > CALL_LATE_LIMIT_MS) {
    throw createError({ statusCode: 409, message: 'This sighting was issued more than 36 hours before the call; start today\'s watch for fresh ones.' })
  }
  const choices = JSON.parse(s.choices) as PlannedChoice[]
  const type = stmt(sqlite, 'answerType').get(s.targetTypeId) as { id: string, name: string, features: string }
  const choice = input.typed === undefined && input.choiceId ? choices.find(c => c.id === input.choiceId) : undefined
  if (input.typed === undefined && input.choiceId && !choice) throw createError({ statusCode: 400, message: 'choiceId: That choice does not belong to this sighting.' })
  const choiceId = choice?.id ?? null
  const latencyMs = input.latencyMs
  const { correct, grade, anticipation, typedTypeId } = gradeAnswer({ choiceId, typed: input.typed, latencyMs }, {
    answerTypeId: s.targetTypeId,
    answerChoiceId: s.answerChoiceId,
    names: () => stmt(sqlite, 'deckNames').all(s.deckId) as { id: string, name: string }[],
    hesitationMs: s.hesitationMs,
    windowMs: s.windowMs,
  })
  const calledTypeId = input.typed !== undefined ? typedTypeId : choice?.typeId ?? null
  // A check's call gives no feedback and leaves the tracks alone (server/domain/checks.ts).
  if (s.kind === 'check') {
    return recordCheckCall(sqlite, {
      sightingId, userId, watchId: s.watchId, deckId: s.deckId, targetTypeId: s.targetTypeId, calledTypeId, aspect: s.aspect,
      condition: s.condition, choiceId, typed: input.typed ?? null, correct, grade, anticipation, latencyMs,
      framesShown: input.framesShown, frameIntervalMs: input.frameIntervalMs, calledAt, offline: nowMs - calledAt > OFFLINE_AFTER_MS,
    }, nowMs)
  }

  return allOrNothing(sqlite, () => {
    const again = stmt(sqlite, 'callResult').get(sightingId) as { result: string } | undefined
    if (again) return JSON.parse(again.result) as CallResult
    const trackRow = s.trackId ? stmt(sqlite, 'track').get(s.trackId) as TrackRow | undefined : undefined
    let before: TrackState | null = null
    let after: TrackState | null = null
    let trackOut = { stage: 'new' as CallResult['track']['stage'], due: calledAt }
    if (trackRow) {
      const track = toPlanTrack(trackRow)
      // Calls synced out of order are applied no earlier than the track's last review.
      const reviewAt = Math.max(calledAt, track.state.lastReview ?? 0)
      const review = reviewTrack(track.state, grade, reviewAt, { retention: s.retention ?? 0.9, weights: weightsForCall(sqlite, userId, s.deckId!) })
      before = review.before
      after = review.after
      trackOut = { stage: stageOf(after, reviewAt, s.retention ?? 0.9), due: after.due }
    }
    const result: CallResult = {
      sightingId,
      grade,
      correct,
      anticipation,
      calledChoiceId: choiceId,
      answer: {
        id: type.id, choiceId: choices.length ? s.answerChoiceId : null, name: type.name, features: parseFeatures(type.features),
        imageUrl: revealPicture(sqlite, s.watchId, type.id, s.aspect),
      },
      latencyMs,
      calledAt,
      track: trackOut,
      called: null,
    }
    // A wrong name: the type called, beside the right one in the reveal.
    if (!correct && calledTypeId && calledTypeId !== type.id) {
      const other = stmt(sqlite, 'answerType').get(calledTypeId) as { id: string, name: string, features: string } | undefined
      if (other) {
        result.called = { name: other.name, aspect: s.aspect, features: parseFeatures(other.features), imageUrl: revealPicture(sqlite, s.watchId, other.id, s.aspect) }
      }
    }
    let reshow: { plan: PlannedSighting, id: string } | null = null
    if (grade === 'missed' && trackRow && after && s.kind === 'watch') {
      const count = (stmt(sqlite, 'reshowCount').get(s.watchId, trackRow.id) as { n: number }).n
      if (count < MAX_RESHOWS_PER_TRACK) {
        // Only the missed track's own views are read: a re-show needs no other rendering.
        const content = loadDrillContent(sqlite, s.deckId!, { targetTypeId: trackRow.targetTypeId, aspect: trackRow.aspect })
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
    const remaining = reshow ? stmt(sqlite, 'uncalled').all(s.watchId, sightingId) as { id: string, typeId: string, position: number }[] : []
    const anyLeft = reshow ? remaining.length > 0 : !!stmt(sqlite, 'anyUncalled').get(s.watchId, sightingId)
    let order: string[] = []
    if (reshow) {
      reshow.id = newId()
      order = reshowOrder(sightingId, remaining, { id: reshow.id, typeId: s.targetTypeId })
      result.appended = [issuedFromPlan(reshow.id, s.position + 1 + order.indexOf(reshow.id), reshow.plan, s.answerMode ?? 'choices', true)]
    }
    const info = stmt(sqlite, 'insertCall').run({
      id: newCallId(),
      sightingId,
      userId,
      deckId: s.deckId,
      trackId: s.trackId,
      targetTypeId: s.targetTypeId,
      calledTypeId,
      aspect: s.aspect,
      condition: s.condition,
      choiceId,
      typed: input.typed ?? null,
      correct: correct ? 1 : 0,
      grade,
      anticipation: anticipation ? 1 : 0,
      latencyMs,
      framesShown: input.framesShown,
      frameIntervalMs: input.frameIntervalMs,
      calledAt,
      receivedAt: nowMs,
      offline: nowMs - calledAt > OFFLINE_AFTER_MS ? 1 : 0,
      before: before ? JSON.stringify(before) : null,
      after: after ? JSON.stringify(after) : null,
      result: JSON.stringify(result),
    })
    if (info.changes === 0) {
      return JSON.parse((stmt(sqlite, 'callResult').get(sightingId) as { result: string }).result) as CallResult
    }
    if (trackRow && after) stmt(sqlite, 'updateTrack').run({ id: trackRow.id, ...after, now: nowMs })
    if (reshow) {
      // The re-show goes in at its place; of the others only those that move are written (the ones
      // after it, mostly), since every row written is one more page in the commit.
      insertPlanned(sqlite, s.watchId, userId, reshow.plan, s.position + 1 + order.indexOf(reshow.id), nowMs, sightingId, reshow.id)
      const positionOf = new Map(remaining.map(r => [r.id, r.position]))
      order.forEach((id, i) => {
        const position = s.position + 1 + i
        if (id !== reshow.id && positionOf.get(id) !== position) stmt(sqlite, 'setPosition').run(position, id)
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
export function sightingImageFile(sqlite: Database, userId: string, sightingId: string): string | null {
  const row = stmt(sqlite, 'sightingFile').get(sightingId, userId) as { file: string } | undefined
  return row?.file ?? null
}

// ---------------------------------------------------------------- the offline pack

/** The watch's sightings with their answers and features, for feedback with no connection; never a check's. */
export function watchPack(sqlite: Database, userId: string, watchId: string): WatchPack {
  const w = stmt(sqlite, 'watch').get(watchId) as { id: string, userId: string, deckId: string | null, kind: string, day: string, title: string, hesitationMs: number, answerMode: string } | undefined
  if (!w || w.userId !== userId || !w.deckId) throw notFound('No such watch of yours.')
  if (w.kind === 'check') throw createError({ statusCode: 403, message: 'A check has no pack: it runs online only.' })
  const names = stmt(sqlite, 'deckNames').all(w.deckId) as { id: string, name: string }[]
  const types = new Map(names.map(n => [n.id, n]))
  const features = new Map<string, Record<string, string>>()
  const rows = stmt(sqlite, 'watchSightings').all(watchId) as StoredSightingRow[]
  const aspects = new Map((sqlite.prepare('SELECT id, aspect FROM sightings WHERE watch_id = ?').all(watchId) as { id: string, aspect: string }[]).map(r => [r.id, r.aspect]))
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
        const t = stmt(sqlite, 'answerType').get(r.targetTypeId) as { features: string } | undefined
        features.set(r.targetTypeId, parseFeatures(t?.features ?? null))
      }
      const aspect = aspects.get(r.id) ?? ''
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

const VOID_SQL = {
  setVoided: `UPDATE sightings SET voided_at = ? WHERE id = ? AND voided_at IS NULL
    AND NOT EXISTS (SELECT 1 FROM calls c WHERE c.sighting_id = sightings.id)`,
  copyOf: `SELECT id FROM sightings WHERE watch_id = ? AND id <> ? AND track_id IS ? AND variant_id IS ? AND issued_at = ?`,
  copy: `INSERT INTO sightings (id, watch_id, user_id, track_id, target_type_id, position, variant_id, aspect, condition, range_m,
    binoculars, apparent_px, exposure_ms, window_ms, choices, answer_choice_id, reshow_of, issued_at)
    SELECT @id, watch_id, user_id, track_id, target_type_id, @position, variant_id, aspect, condition, range_m, binoculars,
    apparent_px, exposure_ms, window_ms, @choices, @answerChoiceId, reshow_of, @now FROM sightings WHERE id = @from`,
  row: `SELECT voided_at AS voidedAt, variant_id AS variantId FROM sightings WHERE id = ?`,
} as const

export interface VoidResult { sightingId: string, voidedAt: number, appended: IssuedSighting[] }

/**
 * Voids an uncalled sighting of a watch (the screen was hidden while it showed): it takes no call
 * (409), and a copy with fresh choice ids goes to the end of the same watch. A resend returns the same copy.
 */
export function voidSighting(sqlite: Database, userId: string, sightingId: string, nowMs = Date.now()): VoidResult {
  return sqlite.transaction(() => {
    const s = stmt(sqlite, 'sightingForCall').get(sightingId) as CallSightingRow | undefined
    if (!s || s.userId !== userId || !s.deckId) throw notFound('No such sighting was issued to you.')
    if (s.kind !== 'watch') throw createError({ statusCode: 403, message: 'Only a sighting of a watch can be voided.' })
    if (stmt(sqlite, 'callResult').get(sightingId)) throw createError({ statusCode: 409, message: 'This sighting was already called; a called sighting cannot be voided.' })
    const row = sqlite.prepare(VOID_SQL.row).get(sightingId) as { voidedAt: number | null, variantId: string | null }
    const voidedAt = row.voidedAt ?? nowMs
    const answerMode = s.answerMode ?? 'choices'
    const read = (id: string) => (stmt(sqlite, 'watchSightings').all(s.watchId) as StoredSightingRow[]).filter(r => r.id === id).map(r => issuedFromRow(r, answerMode))
    if (row.voidedAt !== null) {
      const copy = sqlite.prepare(VOID_SQL.copyOf).get(s.watchId, sightingId, s.trackId, row.variantId, row.voidedAt) as { id: string } | undefined
      return { sightingId, voidedAt, appended: copy ? read(copy.id) : [] }
    }
    sqlite.prepare(VOID_SQL.setVoided).run(voidedAt, sightingId)
    // Fresh choice ids, so nothing links the copy's buttons to the voided sighting's.
    const ids = new Map<string, string>()
    const choices = (JSON.parse(s.choices) as PlannedChoice[]).map((c) => {
      ids.set(c.id, newId())
      return { ...c, id: ids.get(c.id)! }
    })
    const id = newId()
    const position = (stmt(sqlite, 'maxPosition').get(s.watchId) as { p: number }).p + 1
    sqlite.prepare(VOID_SQL.copy).run({ id, position, choices: JSON.stringify(choices), answerChoiceId: ids.get(s.answerChoiceId) ?? s.answerChoiceId, now: voidedAt, from: sightingId })
    return { sightingId, voidedAt, appended: read(id) }
  }).immediate()
}
