// A sighting and its call as stored, for watches and checks alike: the one INSERT and the one row
// mapper of each, and the read of a sighting a call is made on. Below watches.ts, checks.ts and
// calls.ts, which all write these rows; plain imports, like them (the demo history seed runs this code).
import type { Database } from 'better-sqlite3'
import { isUntilCall, maskUrlFor, sightingImageUrl } from '../core/watch/plan'
import type { PlannedChoice, PlannedSighting } from '../core/watch/plan'
import type { CallGrade } from '../../shared/utils/grade'
import type { IssuedSighting } from '../../shared/types/watch'
import { newCallId, newId } from '../utils/ids'
import { statement } from '../utils/sql'

// ---------------------------------------------------------------- sightings

const INSERT_SIGHTING = `INSERT INTO sightings (id, watch_id, user_id, track_id, target_type_id, position, variant_id, aspect, condition,
  range_m, binoculars, apparent_px, exposure_ms, window_ms, choices, answer_choice_id, reshow_of, issued_at)
  VALUES (@id, @watchId, @userId, @trackId, @targetTypeId, @position, @variantId, @aspect, @condition, @rangeM, @binoculars,
  @apparentPx, @exposureMs, @windowMs, @choices, @answerChoiceId, @reshowOf, @issuedAt)`

interface SightingParams {
  id: string
  watchId: string
  userId: string
  trackId: string | null
  targetTypeId: string
  position: number
  variantId: string | null
  aspect: string
  condition: string
  rangeM: number
  binoculars: number
  apparentPx: number
  exposureMs: number
  windowMs: number
  choices: string
  answerChoiceId: string
  reshowOf: string | null
  issuedAt: number
}

/** What a stored sighting holds of its plan (the rendering null once its view is deleted: a void's copy keeps that). */
export type SightingToStore = Pick<PlannedSighting, 'trackId' | 'targetTypeId' | 'aspect' | 'condition' | 'rangeM' | 'binoculars'
  | 'apparentPx' | 'exposureMs' | 'windowMs' | 'choices' | 'answerChoiceId'> & { variantId: string | null }

/** The one INSERT of a sighting (a watch's, a re-show, a void's copy, a check's) at `position`; returns its id. */
export function insertSighting(sqlite: Database, watchId: string, userId: string, p: SightingToStore, position: number, nowMs: number, reshowOf: string | null = null, id = newId()): string {
  statement<never, [SightingParams]>(sqlite, INSERT_SIGHTING).run({
    id, watchId, userId, trackId: p.trackId, targetTypeId: p.targetTypeId, position, variantId: p.variantId, aspect: p.aspect,
    condition: p.condition, rangeM: p.rangeM, binoculars: p.binoculars ? 1 : 0, apparentPx: p.apparentPx, exposureMs: p.exposureMs,
    windowMs: p.windowMs, choices: JSON.stringify(p.choices), answerChoiceId: p.answerChoiceId, reshowOf, issuedAt: nowMs,
  })
  return id
}

/** A stored sighting as the watch shows it again (an open watch, a void's copy, the pack). */
export interface StoredSightingRow {
  id: string
  position: number
  trackId: string | null
  targetTypeId: string
  aspect: string
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

const WATCH_SIGHTINGS = `SELECT s.id, s.position, s.track_id AS trackId, s.target_type_id AS targetTypeId, s.aspect, s.exposure_ms AS exposureMs,
  s.window_ms AS windowMs, s.apparent_px AS apparentPx, s.range_m AS rangeM, s.binoculars, s.choices,
  s.answer_choice_id AS answerChoiceId, s.reshow_of AS reshowOf, x.file, x.width, x.height,
  (SELECT count(*) FROM calls c WHERE c.sighting_id = s.id) + (s.voided_at IS NOT NULL) AS called
  FROM sightings s JOIN variants x ON x.id = s.variant_id WHERE s.watch_id = ? ORDER BY s.position, s.issued_at`

/** A watch's (or a check's) stored sightings in order, each with its rendering and whether it was called or voided. */
export function watchSightings(sqlite: Database, watchId: string): StoredSightingRow[] {
  return statement<StoredSightingRow, [string]>(sqlite, WATCH_SIGHTINGS).all(watchId)
}

/** The choices a trainee sees: ids and labels, never the type behind them. */
export function publicChoices(text: string): { id: string, label: string }[] {
  return (JSON.parse(text) as PlannedChoice[]).map(c => ({ id: c.id, label: c.label }))
}

/** The one mapping of a stored sighting to what the API sends (no answer in it). */
export function issuedFromRow(r: Omit<StoredSightingRow, 'aspect' | 'file'>, answerMode: string): IssuedSighting {
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

/** A planned sighting just stored, as the API sends it: the same mapping as a stored row's. */
export function issuedFromPlan(id: string, position: number, p: PlannedSighting, answerMode: string, reshow: boolean): IssuedSighting {
  return issuedFromRow({
    id, position, trackId: p.trackId, targetTypeId: p.targetTypeId, exposureMs: p.exposureMs, windowMs: p.windowMs,
    apparentPx: p.apparentPx, rangeM: p.rangeM, binoculars: p.binoculars ? 1 : 0, choices: JSON.stringify(p.choices),
    answerChoiceId: p.answerChoiceId, reshowOf: reshow ? 'x' : null, width: p.width, height: p.height, called: 0,
  }, answerMode)
}

// ---------------------------------------------------------------- the sighting a call is made on

/** A sighting with what grading a call on it needs: its watch's kind and its deck's settings. */
export interface CallSightingRow {
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
  // the answer's name and features, for the reveal
  typeName: string
  typeFeatures: string | null
  // the trainee's crew the deck is assigned to (first by id), whose fitted weights schedule the call (crew-fits.ts)
  crewId: string | null
  // the stored answer when the sighting was called already
  result: string | null
}

const SIGHTING_FOR_CALL = `SELECT s.id, s.user_id AS userId, s.watch_id AS watchId, s.track_id AS trackId, s.target_type_id AS targetTypeId,
  s.aspect, s.condition, s.position, s.window_ms AS windowMs, s.choices, s.answer_choice_id AS answerChoiceId,
  s.issued_at AS issuedAt, s.reshow_of AS reshowOf, s.voided_at AS voidedAt, w.kind, w.deck_id AS deckId, d.hesitation_ms AS hesitationMs,
  d.retention, d.answer_mode AS answerMode, t.name AS typeName, t.features AS typeFeatures,
  (SELECT m.crew_id FROM memberships m JOIN deck_crews dc ON dc.crew_id = m.crew_id AND dc.deck_id = w.deck_id
    WHERE m.user_id = s.user_id ORDER BY m.crew_id LIMIT 1) AS crewId,
  (SELECT c.result FROM calls c WHERE c.sighting_id = s.id) AS result
  FROM sightings s JOIN watches w ON w.id = s.watch_id LEFT JOIN decks d ON d.id = w.deck_id JOIN target_types t ON t.id = s.target_type_id
  WHERE s.id = ?`

/** One read for a call: the sighting, its watch's kind, its deck's settings, its answer, the trainee's crew and any stored result. */
export function sightingForCall(sqlite: Database, sightingId: string): CallSightingRow | undefined {
  return statement<CallSightingRow, [string]>(sqlite, SIGHTING_FOR_CALL).get(sightingId)
}

// ---------------------------------------------------------------- calls

/** What a call stores, for a watch's call and a check's alike (a check's has no track and no before/after). */
export interface CallFields {
  sightingId: string
  userId: string
  deckId: string
  trackId: string | null
  kind: 'watch' | 'check'
  targetTypeId: string
  calledTypeId: string | null
  aspect: string
  condition: string
  choiceId: string | null
  typed: string | null
  correct: boolean
  grade: CallGrade
  anticipation: boolean
  latencyMs: number | null
  framesShown: number
  frameIntervalMs: number
  calledAt: number
  offline: boolean
}

// The call's row as bound: CallFields with SQLite's 0/1 for booleans, plus what the server adds.
type CallParams = Omit<CallFields, 'correct' | 'anticipation' | 'offline'> & {
  id: string
  correct: number
  anticipation: number
  offline: number
  receivedAt: number
  before: string | null
  after: string | null
  result: string
}

const INSERT_CALL = `INSERT INTO calls (id, sighting_id, user_id, deck_id, track_id, kind, target_type_id, called_type_id, aspect, condition,
  choice_id, typed, correct, grade, anticipation, latency_ms, frames_shown, frame_interval_ms, called_at, received_at,
  offline, before, after, result)
  VALUES (@id, @sightingId, @userId, @deckId, @trackId, @kind, @targetTypeId, @calledTypeId, @aspect, @condition, @choiceId, @typed,
  @correct, @grade, @anticipation, @latencyMs, @framesShown, @frameIntervalMs, @calledAt, @receivedAt, @offline, @before,
  @after, @result) ON CONFLICT (sighting_id) DO NOTHING`

/**
 * Stores a call with its answer, once per sighting (a unique index): false when a call on the
 * sighting was stored first, whose result then stands.
 */
export function insertCall(sqlite: Database, f: CallFields, stored: { before: string | null, after: string | null, result: string }, nowMs: number): boolean {
  const info = statement<never, [CallParams]>(sqlite, INSERT_CALL).run({
    id: newCallId(),
    ...f,
    correct: f.correct ? 1 : 0,
    anticipation: f.anticipation ? 1 : 0,
    offline: f.offline ? 1 : 0,
    receivedAt: nowMs,
    ...stored,
  })
  return info.changes > 0
}

/** The stored answer of the call on a sighting, if one was made (a resend gets it again). */
export function storedCallResult<T>(sqlite: Database, sightingId: string): T | undefined {
  const row = statement<{ result: string }, [string]>(sqlite, 'SELECT result FROM calls WHERE sighting_id = ?').get(sightingId)
  return row ? JSON.parse(row.result) as T : undefined
}
