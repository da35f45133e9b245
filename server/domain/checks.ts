// Qualification checks on the database: an instructor's definition, a trainee's one attempt (a
// watch of kind 'check' issued whole, planned by the watch's own code with the check's overrides;
// no pack, no feedback, no track touched), the score, the lead's reset and sign-off. Plain imports,
// like watches.ts; calls.ts hands a check's calls to recordCheckCall.
import type { Database } from 'better-sqlite3'
import { createError } from 'h3'
import { planCheckSighting, viewsWithRenderings } from '../core/watch/plan'
import type { DeckContent } from '../core/watch/plan'
import { randomIndex } from '../core/watch/rng'
import { PX_BY_RUNG } from '../core/watch/sighting-plan'
import type { CallGrade } from '../../shared/utils/grade'
import type {
  AttemptStatus, AttemptSummary, CheckCallRecorded, CheckInput, CheckLists, CheckPatchInput, CheckResult, CheckToTake, CheckView, CrewChecks,
} from '../../shared/schemas/checks'
import type { IssuedWatch } from '../../shared/types/watch'
import type { Actor } from '../utils/gate'
import { hasRole } from '../utils/gate'
import { crewsLedOver } from './policy'
import { useSqlite } from '../utils/db'
import { allOrNothing } from '../utils/group-commit'
import { newId } from '../utils/ids'
import { statement } from '../utils/sql'
import { insertCall, insertSighting, issuedFromPlan, storedCallResult } from './sightings'
import type { CallFields } from './sightings'
import { crewConfusions, loadDeckContent, serverRandom, watchDay } from './watches'
import type { WatchRandom } from './watches'

const fail = (statusCode: number, message: string) => createError({ statusCode, message })
const noCheck = () => fail(404, 'No such check.')
const noAttempt = () => fail(404, 'No such check attempt.')
export const CHECK_RETAKE_MESSAGE = 'This check is already taken; ask your lead to reset it.'

// A check shows targets at the size of the ladder's middle rung (a track held 1 to 7 days):
// smaller than a new track's, larger than a well-held one's (product rule for the ladder).
const CHECK_PX_RUNG = 2

interface CheckRow {
  id: string
  deckId: string
  deckTitle: string
  deckOwner: string
  deckStatus: string
  title: string
  sightingCount: number
  exposureMs: number
  conditions: string
  aspects: string
  passMark: number
  createdBy: string
  createdAt: number
  attempts: number
  dueAt: number | null
  retiredAt: number | null
  targetTypeIds: string | null
}

const CHECK_SELECT = `SELECT c.id, c.deck_id AS deckId, d.title AS deckTitle, d.owner_id AS deckOwner, d.status AS deckStatus, c.title,
  c.sighting_count AS sightingCount, c.exposure_ms AS exposureMs, c.conditions, c.aspects, c.pass_mark AS passMark,
  c.created_by AS createdBy, c.created_at AS createdAt, c.due_at AS dueAt, c.retired_at AS retiredAt, c.target_type_ids AS targetTypeIds, (SELECT count(*) FROM check_attempts a WHERE a.check_id = c.id) AS attempts
  FROM checks c JOIN decks d ON d.id = c.deck_id`

interface AttemptRow {
  id: string
  checkId: string
  userId: string
  personName: string
  watchId: string | null
  status: AttemptStatus
  score: number | null
  passed: number | null
  signedOffBy: string | null
  signedOffAt: number | null
  signerName: string | null
  signOffRemark: string | null
  withdrawnAt: number | null
  withdrawnByName: string | null
  withdrawReason: string | null
  startedAt: number
  finishedAt: number | null
}

const ATTEMPT_SELECT = `SELECT a.id, a.check_id AS checkId, a.user_id AS userId, u.name AS personName, a.watch_id AS watchId, a.status,
  a.score, a.passed, a.signed_off_by AS signedOffBy, a.signed_off_at AS signedOffAt, a.started_at AS startedAt, a.finished_at AS finishedAt,
  so.name AS signerName, a.sign_off_remark AS signOffRemark, a.withdrawn_at AS withdrawnAt, wd.name AS withdrawnByName, a.withdraw_reason AS withdrawReason
  FROM check_attempts a JOIN users u ON u.id = a.user_id LEFT JOIN users so ON so.id = a.signed_off_by LEFT JOIN users wd ON wd.id = a.withdrawn_by`

function toView(r: CheckRow): CheckView {
  return {
    id: r.id, deckId: r.deckId, deckTitle: r.deckTitle, title: r.title, sightingCount: r.sightingCount, exposureMs: r.exposureMs,
    conditions: JSON.parse(r.conditions) as string[], aspects: JSON.parse(r.aspects) as string[], passMark: r.passMark,
    createdBy: r.createdBy, createdAt: r.createdAt, attempts: r.attempts,
    dueDate: r.dueAt === null ? null : new Date(r.dueAt).toISOString().slice(0, 10), retiredAt: r.retiredAt,
    targetTypeIds: r.targetTypeIds === null ? null : JSON.parse(r.targetTypeIds) as string[],
  }
}

function toSummary(r: AttemptRow): AttemptSummary {
  return {
    id: r.id, checkId: r.checkId, userId: r.userId, personName: r.personName, status: r.status, score: r.score,
    passed: r.passed === null ? null : r.passed === 1, startedAt: r.startedAt, finishedAt: r.finishedAt,
    signedOffBy: r.signedOffBy, signedOffAt: r.signedOffAt, signerName: r.signerName, signOffRemark: r.signOffRemark,
    withdrawn: withdrawnOf(r),
  }
}

function withdrawnOf(r: AttemptRow) {
  return r.withdrawnAt ? { name: r.withdrawnByName ?? '', at: r.withdrawnAt, reason: r.withdrawReason ?? '' } : null
}

function checkRow(sqlite: Database, id: string) {
  return statement<CheckRow>(sqlite, `${CHECK_SELECT} WHERE c.id = ?`).get(id)
}

function attemptRow(sqlite: Database, id: string) {
  return statement<AttemptRow>(sqlite, `${ATTEMPT_SELECT} WHERE a.id = ?`).get(id)
}

const ownsCheck = (actor: Actor, c: CheckRow) => c.createdBy === actor.id || c.deckOwner === actor.id

// Is the check's deck assigned to one of the actor's crews (and published, for trainees and leads)?
function assignedToActor(sqlite: Database, actor: Actor, deckId: string) {
  if (!actor.crewIds.length) return false
  return !!statement(sqlite, `SELECT 1 FROM deck_crews dc JOIN decks d ON d.id = dc.deck_id WHERE dc.deck_id = ? AND d.status = 'published'
    AND dc.crew_id IN (SELECT value FROM json_each(?)) LIMIT 1`).get(deckId, JSON.stringify(actor.crewIds))
}

// A lead's reach over an attempt: the check's deck is assigned to a crew the actor leads that the
// trainee is in (crewsLedOver in policy.ts); an attempt of another crew is out of reach.
function leadsAttempt(sqlite: Database, actor: Actor, a: AttemptRow) {
  const led = crewsLedOver(actor, a.userId)
  if (!led.length) return false
  return !!statement(sqlite, `SELECT 1 FROM checks c JOIN deck_crews dc ON dc.deck_id = c.deck_id
    WHERE c.id = ? AND dc.crew_id IN (SELECT value FROM json_each(?)) LIMIT 1`).get(a.checkId, JSON.stringify(led))
}

// ---------------------------------------------------------------- definitions

/** Which (type, aspect, condition) combinations the deck can show under the check's settings. */
function checkCombos(content: DeckContent, aspects: readonly string[], conditions: readonly string[], only: readonly string[] | null = null) {
  const types = new Set(content.types.map(t => t.id).filter(id => !only || only.includes(id)))
  const out = new Map<string, { targetTypeId: string, aspect: string, condition: string }>()
  for (const v of viewsWithRenderings(content)) {
    if (!types.has(v.targetTypeId) || !aspects.includes(v.aspect)) continue
    for (const condition of conditions) {
      const key = `${v.targetTypeId}|${v.aspect}|${condition}`
      if (!out.has(key) && v.variants.some(x => x.condition === condition)) out.set(key, { targetTypeId: v.targetTypeId, aspect: v.aspect, condition })
    }
  }
  return [...out.values()]
}

// A check needs a view at every chosen aspect and at least two target types to show.
function assertDrawable(content: DeckContent, aspects: readonly string[], conditions: readonly string[], only: readonly string[] | null = null) {
  if (only) {
    const known = new Set(content.types.map(t => t.id))
    if (only.some(id => !known.has(id))) throw fail(400, 'targetTypeIds: Choose target types of this deck.')
    if (new Set(only).size < 2) throw fail(400, 'targetTypeIds: Choose at least two target types; a check needs two to tell apart.')
  }
  const rendered = viewsWithRenderings(content)
  const missing = aspects.filter(a => !rendered.some(v => v.aspect === a))
  if (missing.length) throw fail(400, `aspects: The deck has no view at ${missing.join(', ')}; choose aspects it has views of.`)
  const combos = checkCombos(content, aspects, conditions, only)
  if (!combos.length) throw fail(400, 'conditions: The deck has no rendering of these aspects under these conditions.')
  if (new Set(combos.map(c => c.targetTypeId)).size < 2) {
    throw fail(400, 'aspects: These aspects and conditions show fewer than two target types; a check needs at least two.')
  }
}

function requireOwnDeckForCheck(sqlite: Database, actor: Actor, deckId: string): DeckContent {
  const deck = statement<{ ownerId: string, status: string }>(sqlite, 'SELECT owner_id AS ownerId, status FROM decks WHERE id = ?').get(deckId)
  if (!deck) throw fail(404, 'deckId: No such deck.')
  if (deck.ownerId !== actor.id) throw fail(403, 'Only the deck\'s own instructor defines checks on it.')
  if (deck.status === 'archived') throw fail(409, 'This deck is archived; checks are defined on live decks.')
  if (deck.status === 'draft') throw fail(409, 'deckId: This deck is a draft; publish it before defining a check on it.')
  return loadDeckContent(sqlite, deckId)!
}

// A due date is the end of that UTC day; one already past is refused.
function dueAtOf(dueDate: string | null | undefined, nowMs: number): number | null {
  if (!dueDate) return null
  const dueAt = Date.parse(`${dueDate}T23:59:59.999Z`)
  if (!Number.isFinite(dueAt)) throw fail(400, 'dueDate: Give the due date as a date (YYYY-MM-DD), or leave it empty.')
  if (dueAt < nowMs) throw fail(400, 'dueDate: That day is past; choose a due date from today on.')
  return dueAt
}

export function createCheck(actor: Actor, input: CheckInput, nowMs = Date.now(), sqlite: Database = useSqlite()): CheckView {
  const content = requireOwnDeckForCheck(sqlite, actor, input.deckId)
  const only = input.targetTypeIds ? [...new Set(input.targetTypeIds)] : null
  assertDrawable(content, input.aspects, input.conditions, only)
  const dueAt = dueAtOf(input.dueDate, nowMs)
  const id = newId()
  statement(sqlite, `INSERT INTO checks (id, deck_id, title, sighting_count, exposure_ms, conditions, aspects, pass_mark, created_by, due_at, target_type_ids,
    created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`).run(id, input.deckId, input.title, input.sightingCount, input.exposureMs,
    JSON.stringify(input.conditions), JSON.stringify(input.aspects), input.passMark, actor.id, dueAt, only && JSON.stringify(only), nowMs, nowMs)
  return toView(checkRow(sqlite, id)!)
}

/** The check as its viewer may see it: its instructor, an admin, or a trainee or lead of a crew its deck is assigned to. */
export function readCheck(actor: Actor, id: string, sqlite: Database = useSqlite()): CheckView {
  const c = checkRow(sqlite, id)
  if (!c) throw noCheck()
  const visible = hasRole(actor, 'admin') || ownsCheck(actor, c)
    || (hasRole(actor, 'trainee', 'lead') && assignedToActor(sqlite, actor, c.deckId))
  if (!visible) throw noCheck()
  return toView(c)
}

function requireOwnCheck(sqlite: Database, actor: Actor, id: string): CheckRow {
  const c = checkRow(sqlite, id)
  if (!c) throw noCheck()
  if (!ownsCheck(actor, c)) throw fail(403, 'Only the check\'s own instructor changes it.')
  return c
}

// Its instructor may change or delete it while nobody has taken it; the due date alone may move
// until it is retired (it changes no result).
function requireEditableCheck(sqlite: Database, actor: Actor, id: string, dueDateOnly = false): CheckRow {
  const c = requireOwnCheck(sqlite, actor, id)
  if (c.retiredAt !== null) throw fail(409, 'This check is retired; it is kept for its results and no longer changes.')
  if (c.attempts > 0 && !dueDateOnly) {
    throw fail(409, 'This check has been taken, so only its due date can change; retire it and define a new one to change the rest.')
  }
  return c
}

export function updateCheck(actor: Actor, id: string, patch: CheckPatchInput, nowMs = Date.now(), sqlite: Database = useSqlite()): CheckView {
  return sqlite.transaction(() => {
    const dueDateOnly = Object.keys(patch).every(k => k === 'dueDate')
    const c = requireEditableCheck(sqlite, actor, id, dueDateOnly)
    const aspects = patch.aspects ?? JSON.parse(c.aspects) as string[]
    const conditions = patch.conditions ?? JSON.parse(c.conditions) as string[]
    const only = c.targetTypeIds === null ? null : JSON.parse(c.targetTypeIds) as string[]
    if (patch.aspects || patch.conditions) assertDrawable(loadDeckContent(sqlite, c.deckId)!, aspects, conditions, only)
    const dueAt = patch.dueDate === undefined ? c.dueAt : dueAtOf(patch.dueDate, nowMs)
    statement(sqlite, `UPDATE checks SET title = ?, sighting_count = ?, exposure_ms = ?, conditions = ?, aspects = ?, pass_mark = ?, due_at = ?, updated_at = ?
      WHERE id = ?`).run(patch.title ?? c.title, patch.sightingCount ?? c.sightingCount, patch.exposureMs ?? c.exposureMs,
      JSON.stringify(conditions), JSON.stringify(aspects), patch.passMark ?? c.passMark, dueAt, nowMs, id)
    return toView(checkRow(sqlite, id)!)
  }).immediate()
}

export function deleteCheck(actor: Actor, id: string, sqlite: Database = useSqlite()) {
  return sqlite.transaction(() => {
    const c = requireEditableCheck(sqlite, actor, id, true)
    if (c.attempts > 0) throw fail(409, 'This check has been taken; retire it instead, so its results are kept.')
    statement(sqlite, 'DELETE FROM checks WHERE id = ?').run(id)
    return toView(c)
  }).immediate()
}

/** Retires a taken check: nobody can start it again; its attempts and results stay readable. */
export function retireCheck(actor: Actor, id: string, nowMs = Date.now(), sqlite: Database = useSqlite()): CheckView {
  return sqlite.transaction(() => {
    const c = requireOwnCheck(sqlite, actor, id)
    if (c.retiredAt !== null) throw fail(409, 'This check is already retired.')
    statement(sqlite, 'UPDATE checks SET retired_at = ?, updated_at = ? WHERE id = ?').run(nowMs, nowMs, id)
    return toView(checkRow(sqlite, id)!)
  }).immediate()
}

/** The lists of /checks, one section per role the actor holds. */
export function listChecks(actor: Actor, sqlite: Database = useSqlite()): CheckLists {
  const out: CheckLists = { defined: [], toTake: [], crews: [] }
  if (hasRole(actor, 'admin')) {
    out.defined = statement<CheckRow>(sqlite, `${CHECK_SELECT} ORDER BY c.created_at DESC`).all().map(toView)
  }
  else if (hasRole(actor, 'instructor')) {
    out.defined = statement<CheckRow>(sqlite, `${CHECK_SELECT} WHERE c.created_by = ? OR d.owner_id = ? ORDER BY c.created_at DESC`)
      .all(actor.id, actor.id).map(toView)
  }
  const crews = JSON.stringify(actor.crewIds)
  const assigned = statement<CheckRow>(sqlite, `${CHECK_SELECT} WHERE d.status = 'published'
    AND c.deck_id IN (SELECT deck_id FROM deck_crews WHERE crew_id IN (SELECT value FROM json_each(?))) ORDER BY c.created_at DESC`)
  if (hasRole(actor, 'trainee') && actor.crewIds.length) {
    const newest = statement<AttemptRow>(sqlite, `${ATTEMPT_SELECT} WHERE a.check_id = ? AND a.user_id = ? ORDER BY a.started_at DESC LIMIT 1`)
    out.toTake = assigned.all(crews).map((c): CheckToTake => {
      const a = newest.get(c.id, actor.id)
      return {
        ...toView(c),
        status: a?.status ?? 'none',
        attemptId: a?.id ?? null,
        score: a && a.status !== 'reset' ? a.score : null,
        passed: a && a.status !== 'reset' && a.passed !== null ? a.passed === 1 : null,
      }
    })
      // A retired check is no longer offered; one the trainee took stays for its result.
      .filter(c => c.retiredAt === null || c.status !== 'none')
  }
  if (hasRole(actor, 'lead') && actor.crewIds.length) {
    const crewRows = statement<{ id: string, name: string }>(sqlite, 'SELECT id, name FROM crews WHERE id IN (SELECT value FROM json_each(?)) ORDER BY name').all(crews)
    const ofCrew = statement<CheckRow>(sqlite, `${CHECK_SELECT} WHERE d.status = 'published'
      AND c.deck_id IN (SELECT deck_id FROM deck_crews WHERE crew_id = ?) ORDER BY c.created_at DESC`)
    const attempts = statement<AttemptRow>(sqlite, `${ATTEMPT_SELECT} WHERE a.check_id = ?
      AND a.user_id IN (SELECT user_id FROM memberships WHERE crew_id = ?) ORDER BY a.started_at DESC`)
    // The crew's trainees with no attempt that counts (running or finished): reset ones must take it again.
    const notTaken = statement<{ userId: string, name: string }>(sqlite, `SELECT u.id AS userId, u.name FROM memberships m JOIN users u ON u.id = m.user_id
      WHERE m.crew_id = ? AND u.disabled = 0 AND EXISTS (SELECT 1 FROM user_roles r WHERE r.user_id = u.id AND r.role = 'trainee')
      AND NOT EXISTS (SELECT 1 FROM check_attempts a WHERE a.check_id = ? AND a.user_id = u.id AND a.status != 'reset')
      ORDER BY u.name COLLATE NOCASE`)
    out.crews = crewRows.map((crew): CrewChecks => ({
      crewId: crew.id,
      crewName: crew.name,
      checks: ofCrew.all(crew.id).map(c => ({
        ...toView(c),
        attemptsOfCrew: attempts.all(c.id, crew.id).map(toSummary),
        notTaken: notTaken.all(crew.id, c.id),
      })),
    }))
  }
  return out
}

// ---------------------------------------------------------------- taking a check

export interface IssuedCheck extends IssuedWatch {
  id: string
  attemptId: string
  checkId: string
  title: string
  sightingCount: number
  exposureMs: number
}

/**
 * The order of a check: `count` draws among the combinations, never the same target type twice
 * in a row, each draw among the least-used combinations so that the check covers them evenly.
 */
export function drawCheckOrder<T extends { targetTypeId: string }>(combos: readonly T[], count: number, rng: () => number): T[] {
  const used = new Map<T, number>(combos.map(c => [c, 0]))
  const out: T[] = []
  for (let i = 0; i < count; i++) {
    const prev = out[out.length - 1]?.targetTypeId
    const allowed = combos.filter(c => c.targetTypeId !== prev)
    const pool = allowed.length ? allowed : [...combos]
    const least = Math.min(...pool.map(c => used.get(c)!))
    const fewest = pool.filter(c => used.get(c) === least)
    const pick = fewest[randomIndex(rng, fewest.length)]!
    used.set(pick, least + 1)
    out.push(pick)
  }
  return out
}

/** A trainee's attempt: 409 if one was taken and not reset; else a watch of kind 'check' issued whole. */
export function startCheckAttempt(actor: Actor, checkId: string, nowMs = Date.now(), random: WatchRandom = serverRandom, sqlite: Database = useSqlite()): IssuedCheck {
  return sqlite.transaction(() => {
    const c = checkRow(sqlite, checkId)
    if (!c || !assignedToActor(sqlite, actor, c.deckId)) throw noCheck()
    if (c.retiredAt !== null) throw fail(409, 'This check is retired; your instructor no longer sets it.')
    const taken = statement(sqlite, `SELECT 1 FROM check_attempts WHERE check_id = ? AND user_id = ? AND status <> 'reset'`).get(checkId, actor.id)
    if (taken) throw fail(409, CHECK_RETAKE_MESSAGE)
    const content = loadDeckContent(sqlite, c.deckId)!
    const only = c.targetTypeIds === null ? null : JSON.parse(c.targetTypeIds) as string[]
    const combos = checkCombos(content, JSON.parse(c.aspects) as string[], JSON.parse(c.conditions) as string[], only)
    if (new Set(combos.map(x => x.targetTypeId)).size < 2) {
      throw fail(409, 'The deck no longer has views for this check\'s aspects and conditions; ask your instructor.')
    }
    const deck = content.deck
    const watchId = newId()
    const day = watchDay(nowMs)
    statement(sqlite, `INSERT INTO watches (id, user_id, deck_id, kind, check_id, day, status, created_at, updated_at)
      VALUES (?, ?, ?, 'check', ?, ?, 'open', ?, ?)`).run(watchId, actor.id, deck.id, checkId, day, nowMs, nowMs)
    // Planned by the watch's code (planCheckSighting), with the check's condition, exposure and size band.
    const ctx = { content, confusions: crewConfusions(sqlite, actor.id, deck.id), ...random }
    const pxBand = PX_BY_RUNG[CHECK_PX_RUNG]!
    const sightings = drawCheckOrder(combos, c.sightingCount, random.rng).map((combo, position) => {
      const plan = planCheckSighting(combo, { condition: combo.condition, exposureMs: c.exposureMs, pxBand }, ctx)
      const id = insertSighting(sqlite, watchId, actor.id, plan, position, nowMs)
      return issuedFromPlan(id, position, plan, deck.answerMode, false)
    })
    const attemptId = newId()
    statement(sqlite, `INSERT INTO check_attempts (id, check_id, user_id, watch_id, status, started_at) VALUES (?, ?, ?, ?, 'running', ?)`)
      .run(attemptId, checkId, actor.id, watchId, nowMs)
    return {
      id: watchId, deckId: deck.id, deckTitle: deck.title, day, hesitationMs: deck.hesitationMs, sightings, nextDueAt: null,
      attemptId, checkId, title: c.title, sightingCount: c.sightingCount, exposureMs: c.exposureMs,
    }
  }).immediate()
}

/**
 * A graded call on a check's sighting (calls.ts reads, refuses and grades it): stored once with no
 * track, answered with no feedback; the last call of the attempt finishes it. A finished or reset
 * attempt takes no call.
 */
export function recordCheckCall(sqlite: Database, watchId: string, call: CallFields, nowMs: number): CheckCallRecorded {
  return allOrNothing(sqlite, () => {
    const again = storedCallResult<CheckCallRecorded>(sqlite, call.sightingId)
    if (again) return again
    const attempt = statement<{ id: string, status: string }, [string]>(sqlite, 'SELECT id, status FROM check_attempts WHERE watch_id = ?').get(watchId)
    if (!attempt || attempt.status !== 'running') throw fail(409, 'This check attempt is over; its sightings take no more calls.')
    const result: CheckCallRecorded = { recorded: true, sightingId: call.sightingId }
    insertCall(sqlite, { ...call, trackId: null }, { before: null, after: null, result: JSON.stringify(result) }, nowMs)
    const left = statement<{ n: number }, [string]>(sqlite, `SELECT count(*) AS n FROM sightings s WHERE s.watch_id = ?
      AND NOT EXISTS (SELECT 1 FROM calls c WHERE c.sighting_id = s.id)`).get(watchId)!.n
    if (left === 0) finishAttemptRow(sqlite, attempt.id, nowMs)
    return result
  })
}

/** score = right calls / sightings of the attempt (an uncalled sighting counts as wrong); passed when score >= pass mark. */
export function checkScore(right: number, count: number, passMark: number) {
  const score = count > 0 ? right / count : 0
  // Compared on the counts, so that 3 of 5 passes a mark of 0.6 despite binary fractions.
  return { score, passed: right >= passMark * count - 1e-9 }
}

function finishAttemptRow(sqlite: Database, attemptId: string, nowMs: number) {
  const a = statement<{ watchId: string, passMark: number }>(sqlite, `SELECT a.watch_id AS watchId, c.pass_mark AS passMark FROM check_attempts a
    JOIN checks c ON c.id = a.check_id WHERE a.id = ?`).get(attemptId)!
  const counts = statement<{ n: number, right: number }>(sqlite, `SELECT count(*) AS n, coalesce(sum(c.correct), 0) AS right FROM sightings s
    LEFT JOIN calls c ON c.sighting_id = s.id WHERE s.watch_id = ?`).get(a.watchId)!
  const { score, passed } = checkScore(counts.right, counts.n, a.passMark)
  statement(sqlite, `UPDATE check_attempts SET status = 'finished', score = ?, passed = ?, finished_at = ? WHERE id = ? AND status = 'running'`)
    .run(score, passed ? 1 : 0, nowMs, attemptId)
  statement(sqlite, `UPDATE watches SET status = 'closed', closed_at = ?, updated_at = ? WHERE id = ? AND status = 'open'`).run(nowMs, nowMs, a.watchId)
}

/** The trainee ends a running attempt early: the sightings not called count as wrong. */
export function finishCheckAttempt(actor: Actor, attemptId: string, nowMs = Date.now(), sqlite: Database = useSqlite()): CheckResult {
  sqlite.transaction(() => {
    const a = attemptRow(sqlite, attemptId)
    if (!a || a.userId !== actor.id) throw noAttempt()
    if (a.status !== 'running') throw fail(409, 'This check attempt is already over.')
    finishAttemptRow(sqlite, attemptId, nowMs)
  }).immediate()
  return checkResult(sqlite, attemptId)
}

// ---------------------------------------------------------------- results, reset, sign-off

/** Who may read a result: the trainee once it is finished, a lead of the crew it belongs to, the check's instructor, an admin. */
function requireResultAccess(sqlite: Database, actor: Actor, attemptId: string) {
  const a = attemptRow(sqlite, attemptId)
  if (!a) throw noAttempt()
  if (hasRole(actor, 'admin') || leadsAttempt(sqlite, actor, a)) return a
  const c = checkRow(sqlite, a.checkId)!
  if (hasRole(actor, 'instructor') && ownsCheck(actor, c)) return a
  if (a.userId === actor.id) {
    if (a.finishedAt === null) throw fail(409, 'The result shows once the check is finished.')
    return a
  }
  throw fail(403, 'You can see the check results of your own crews only.')
}

interface ResultRow {
  position: number
  targetTypeName: string
  aspect: string
  condition: string
  calledName: string | null
  correct: number | null
  latencyMs: number | null
  grade: CallGrade | null
}

function checkResult(sqlite: Database, attemptId: string): CheckResult {
  const a = attemptRow(sqlite, attemptId)!
  const c = checkRow(sqlite, a.checkId)!
  const rows = a.watchId
    ? statement<ResultRow>(sqlite, `SELECT s.position, t.name AS targetTypeName, s.aspect, s.condition, ct.name AS calledName, c.correct, c.latency_ms AS latencyMs,
      c.grade FROM sightings s JOIN target_types t ON t.id = s.target_type_id LEFT JOIN calls c ON c.sighting_id = s.id
      LEFT JOIN target_types ct ON ct.id = c.called_type_id WHERE s.watch_id = ? ORDER BY s.position`).all(a.watchId)
    : []
  const signer = a.signedOffBy ? statement<{ name: string }>(sqlite, 'SELECT name FROM users WHERE id = ?').get(a.signedOffBy) : undefined
  const crews = statement<{ name: string }>(sqlite, `SELECT c.name FROM memberships m JOIN crews c ON c.id = m.crew_id WHERE m.user_id = ? ORDER BY c.name`)
    .all(a.userId).map(r => r.name)
  return {
    attemptId: a.id,
    checkId: c.id,
    title: c.title,
    deckTitle: c.deckTitle,
    exposureMs: c.exposureMs,
    passMark: c.passMark,
    sightingCount: rows.length || c.sightingCount,
    person: { id: a.userId, name: a.personName },
    crews,
    status: a.status,
    startedAt: a.startedAt,
    finishedAt: a.finishedAt,
    right: rows.filter(r => r.correct === 1).length,
    score: a.score,
    passed: a.passed === null ? null : a.passed === 1,
    signedOff: a.signedOffBy && a.signedOffAt ? { by: a.signedOffBy, name: signer?.name ?? '', at: a.signedOffAt, remark: a.signOffRemark } : null,
    withdrawn: withdrawnOf(a),
    items: rows.map(r => ({
      position: r.position,
      targetTypeName: r.targetTypeName,
      aspect: r.aspect,
      condition: r.condition,
      calledName: r.calledName,
      correct: r.correct === 1,
      latencyMs: r.latencyMs,
      grade: r.grade ?? 'missed',
    })),
  }
}

/** A check result for whoever may read it (requireResultAccess). */
export function readCheckResult(actor: Actor, attemptId: string, sqlite: Database = useSqlite()): CheckResult {
  requireResultAccess(sqlite, actor, attemptId)
  return checkResult(sqlite, attemptId)
}

// A lead of a crew the trainee is in and the check is assigned to; never for one's own attempt.
function requireLeadOf(sqlite: Database, actor: Actor, attemptId: string): AttemptRow {
  const a = attemptRow(sqlite, attemptId)
  if (!a) throw noAttempt()
  if (!leadsAttempt(sqlite, actor, a)) throw fail(403, 'Only a lead of the crew this check belongs to can do this; ask that crew\'s lead.')
  if (a.userId === actor.id) throw fail(403, 'Another lead must do this for your own check.')
  return a
}

/** The lead lets the trainee take the check again: the attempt reads 'reset', its watch is closed. */
export function resetCheckAttempt(actor: Actor, attemptId: string, nowMs = Date.now(), sqlite: Database = useSqlite()): AttemptSummary {
  return sqlite.transaction(() => {
    const a = requireLeadOf(sqlite, actor, attemptId)
    if (a.status === 'reset') throw fail(409, 'This attempt is already reset.')
    if (a.signedOffAt) throw fail(409, 'This attempt is signed off; a signed-off check cannot be reset.')
    statement(sqlite, `UPDATE check_attempts SET status = 'reset' WHERE id = ?`).run(attemptId)
    if (a.watchId) statement(sqlite, `UPDATE watches SET status = 'closed', closed_at = ?, updated_at = ? WHERE id = ? AND status = 'open'`).run(nowMs, nowMs, a.watchId)
    return toSummary(attemptRow(sqlite, attemptId)!)
  }).immediate()
}

/** The lead signs off a finished attempt, once, with an optional remark. */
export function signOffCheckAttempt(actor: Actor, attemptId: string, nowMs = Date.now(), remark: string | null = null, sqlite: Database = useSqlite()): AttemptSummary {
  return sqlite.transaction(() => {
    const a = requireLeadOf(sqlite, actor, attemptId)
    if (a.status !== 'finished') throw fail(409, 'Only a finished attempt can be signed off.')
    if (a.signedOffAt) throw fail(409, 'This attempt is already signed off.')
    statement(sqlite, 'UPDATE check_attempts SET signed_off_by = ?, signed_off_at = ?, sign_off_remark = ? WHERE id = ?').run(actor.id, nowMs, remark || null, attemptId)
    return toSummary(attemptRow(sqlite, attemptId)!)
  }).immediate()
}

/** A lead withdraws a sign-off with a reason; the attempt can then be signed off again or reset. */
export function withdrawSignOff(actor: Actor, attemptId: string, reason: string, nowMs = Date.now(), sqlite: Database = useSqlite()): { before: AttemptSummary, after: AttemptSummary } {
  return sqlite.transaction(() => {
    const a = requireLeadOf(sqlite, actor, attemptId)
    if (!a.signedOffAt) throw fail(409, 'This attempt is not signed off, so there is nothing to withdraw.')
    statement(sqlite, `UPDATE check_attempts SET signed_off_by = NULL, signed_off_at = NULL, sign_off_remark = NULL,
      withdrawn_by = ?, withdrawn_at = ?, withdraw_reason = ? WHERE id = ?`).run(actor.id, nowMs, reason, attemptId)
    return { before: toSummary(a), after: toSummary(attemptRow(sqlite, attemptId)!) }
  }).immediate()
}
