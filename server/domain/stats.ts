// Loading of calls for the leads' and instructors' views, and the calls into server/core/reports.
// Raw SQL through statement() (server/utils/sql.ts) on the one SQLite handle, the domain's idiom
// for hot statements: the crew table reads tens of thousands of calls per request, so rows come
// back as arrays and only the columns the reports use. Who may read them: policy.ts.
import type { Database } from 'better-sqlite3'
import { createError } from 'h3'
import { DAY_MS, callsSince, personStats, statsBy } from '../core/reports/crew-stats'
import type { BreakdownRow, CallRecord } from '../core/reports/crew-stats'
import { confusionMatrix, worstPairs } from '../core/reports/confusions'
import type { ConfusionPair } from '../core/reports/confusions'
import { readiness, readinessOfTally, trackKeyOf } from '../core/reports/readiness'
import type { Readiness, ReadinessStandard, ReadinessTally, TrackKey } from '../core/reports/readiness'
import type { CallGrade } from '../../shared/utils/grade'
import { quantileSorted, rollingMedian, sortedCopy } from '../../shared/utils/statistics'
import { localTimeText, percentText, secondsText } from '../../shared/utils/format'
import { trendVerdict } from '../../shared/utils/trend'
import type {
  BreakdownView, CrewConfusions, CrewStats, CrewStatsRow, DeckConfusions, DeckReadinessView, NamedPair, PairSide, PersonReport, SideBySidePair, TrendFigures,
} from '../../shared/types/stats'
import { statement } from '../utils/sql'
import { useSqlite } from '../utils/db'

export interface StatsFilters {
  deckId?: string
  days: number
  aspect?: string
  condition?: string
}

interface CrewRow { id: string, name: string, minAccuracy: number, minCallsPerTrack: number, windowDays: number, offlineCounts: number }
interface DeckRow { id: string, title: string, hesitationMs: number }

// ---------------------------------------------------------------- statements

const CALL_COLUMNS = 'deck_id, target_type_id, called_type_id, aspect, condition, correct, grade, anticipation, latency_ms, called_at, offline'
// Watch calls only: a check's calls are its own measure and show on the check pages alone. The crew
// table's covering indexes hold watch calls only (partial indexes WHERE kind = 'watch').
const WATCH_CALLS = 'kind = \'watch\''

// The reports' statements, prepared once per handle through statement() (server/utils/sql.ts): the
// crew table and the person page read tens of thousands of calls a request, so rows come back as
// arrays ('raw') or single values ('pluck'), a shape fixed per statement (server/utils/sql.ts), and only the columns the reports use.
const SQL = {
  crew: `SELECT id, name, min_accuracy AS minAccuracy, min_calls_per_track AS minCallsPerTrack, window_days AS windowDays,
    offline_counts AS offlineCounts FROM crews WHERE id = ?`,
  // Published decks only: a draft is shown to nobody but its instructors, and is not in any watch.
  crewDecks: `SELECT d.id, d.title, d.hesitation_ms AS hesitationMs FROM deck_crews dc JOIN decks d ON d.id = dc.deck_id
    WHERE dc.crew_id = ? AND d.status = 'published' ORDER BY d.title, d.id`,
  trainees: `SELECT u.id, u.name FROM memberships m JOIN users u ON u.id = m.user_id
    WHERE m.crew_id = ? AND u.disabled = 0 AND EXISTS (SELECT 1 FROM user_roles r WHERE r.user_id = u.id AND r.role = 'trainee')
    ORDER BY u.name, u.id`,
  // Every (target type, aspect) pair with a view: what the standard asks to be called.
  trackKeys: `SELECT DISTINCT v.target_type_id, v.aspect FROM views v JOIN target_types t ON t.id = v.target_type_id
    WHERE t.deck_id = ?`,
  userCalls: `SELECT ${CALL_COLUMNS} FROM calls WHERE user_id = ? AND ${WATCH_CALLS} AND called_at >= ? AND called_at <= ?
    AND deck_id IN (SELECT value FROM json_each(?))`,
  lastCall: `SELECT called_at FROM calls WHERE user_id = ? AND ${WATCH_CALLS} AND called_at <= ? AND deck_id IN (SELECT value FROM json_each(?))
    ORDER BY called_at DESC LIMIT 1`,
  tracksDue: `SELECT COUNT(*) FROM tracks WHERE user_id = ? AND due <= ? AND deck_id IN (SELECT value FROM json_each(?))`,
  typeNames: `SELECT t.id, t.name FROM target_types t WHERE t.deck_id IN (SELECT value FROM json_each(?)) ORDER BY t.name, t.id`,
  typeName: 'SELECT name FROM target_types WHERE id = ?',
  crewDeckCalls: `SELECT target_type_id, called_type_id FROM calls WHERE deck_id = ? AND ${WATCH_CALLS} AND called_at >= ? AND called_at <= ?
    AND user_id IN (SELECT user_id FROM memberships WHERE crew_id = ?)`,
  deck: 'SELECT id, title, hesitation_ms AS hesitationMs FROM decks WHERE id = ?',
  deckCrews: `SELECT c.id, c.name FROM deck_crews dc JOIN crews c ON c.id = dc.crew_id WHERE dc.deck_id = ? ORDER BY c.name`,
  deckCalls: `SELECT target_type_id, called_type_id, aspect, condition FROM calls WHERE deck_id = ? AND ${WATCH_CALLS} AND called_at >= ? AND called_at <= ?
    AND user_id IN (SELECT m.user_id FROM memberships m JOIN deck_crews dc ON dc.crew_id = m.crew_id WHERE dc.deck_id = ?)`,
  user: 'SELECT id, name, reminders_opt_out AS remindersOptOut FROM users WHERE id = ?',
  userCrews: `SELECT c.id, c.name, c.min_accuracy AS minAccuracy, c.min_calls_per_track AS minCallsPerTrack, c.window_days AS windowDays,
    c.offline_counts AS offlineCounts FROM memberships m JOIN crews c ON c.id = m.crew_id WHERE m.user_id = ? ORDER BY c.name`,
  baseline: 'SELECT simple_ms AS simpleMs, choice_ms AS choiceMs, created_at AS at FROM tap_baselines WHERE user_id = ? ORDER BY created_at DESC LIMIT 1',
  typeOf: 'SELECT id, name, features FROM target_types WHERE id = ?',
  sunlitPicture: `SELECT va.file FROM variants va JOIN views v ON v.id = va.view_id
    WHERE v.target_type_id = ? AND v.aspect = ? AND va.condition = 'sunlit' ORDER BY va.width < 320, va.width LIMIT 1`,
} as const

/** A JSON list of ids, as json_each(?) reads it. */
type IdList = string

type RawCall = [string, string, string | null, string, string, number, CallGrade, number, number | null, number, number]

export interface LoadedCall extends CallRecord {
  deckId: string
}

function toRecord(r: RawCall): LoadedCall {
  return {
    deckId: r[0],
    targetTypeId: r[1],
    calledTypeId: r[2],
    aspect: r[3],
    condition: r[4],
    correct: r[5] === 1,
    grade: r[6],
    anticipation: r[7] === 1,
    latencyMs: r[8],
    calledAt: r[9],
    offline: r[10] === 1,
  }
}

/** A person's calls on the given decks with fromMs <= calledAt <= toMs, oldest first. */
export function loadPersonCalls(sqlite: Database, userId: string, deckIds: readonly string[], fromMs: number, toMs: number): LoadedCall[] {
  if (!deckIds.length) return []
  const rows = statement<RawCall, [string, number, number, IdList]>(sqlite, SQL.userCalls, 'raw').all(userId, fromMs, toMs, JSON.stringify(deckIds))
  const out = rows.map(toRecord)
  out.sort((a, b) => a.calledAt - b.calledAt)
  return out
}

function trackKeysOf(sqlite: Database, deckId: string): TrackKey[] {
  return statement<[string, string], [string]>(sqlite, SQL.trackKeys, 'raw').all(deckId).map(([targetTypeId, aspect]) => ({ targetTypeId, aspect }))
}

function tracksDueOf(sqlite: Database, userId: string, nowMs: number, deckJson: IdList): number {
  return statement<number, [string, number, IdList]>(sqlite, SQL.tracksDue, 'pluck').get(userId, nowMs, deckJson)!
}

function standardOf(crew: CrewRow): ReadinessStandard {
  return { minAccuracy: crew.minAccuracy, minCallsPerTrack: crew.minCallsPerTrack, windowDays: crew.windowDays, offlineCounts: crew.offlineCounts === 1 }
}

// ---------------------------------------------------------------- crew table

function decksInScope(sqlite: Database, crewId: string, deckId: string | undefined, who: string): DeckRow[] {
  const all = statement<DeckRow, [string]>(sqlite, SQL.crewDecks).all(crewId)
  if (!deckId) return all
  const one = all.filter(d => d.id === deckId)
  if (!one.length) throw createError({ statusCode: 404, message: `That deck is not assigned to ${who}. Choose one of its decks.` })
  return one
}

export interface DeckReadinessResult { ready: boolean, missing: string[], accuracy: number | null, medianMs: number | null }

/** Readiness on every deck in scope: ready only when ready on each; what is missing is named per deck when there are several. */
export function combineDeckReadiness(
  decks: readonly DeckRow[],
  readinessOf: (deck: DeckRow, index: number) => Readiness,
): { ready: boolean, missing: string[], perDeck: (DeckReadinessResult & { deck: DeckRow })[] } {
  if (!decks.length) return { ready: false, missing: ['no deck is assigned to the crew'], perDeck: [] }
  const perDeck = decks.map((deck, i) => {
    const r = readinessOf(deck, i)
    return { deck, ready: r.ready, missing: r.missing, accuracy: r.accuracy, medianMs: r.medianMs }
  })
  const missing = perDeck.flatMap(d => decks.length > 1 ? d.missing.map(m => `${d.deck.title}: ${m}`) : d.missing)
  return { ready: perDeck.every(d => d.ready), missing, perDeck }
}

/** readiness() on each deck in scope, over the given calls (see combineDeckReadiness). */
export function readinessOnDecks(
  calls: readonly LoadedCall[],
  decks: readonly DeckRow[],
  keysByDeck: ReadonlyMap<string, TrackKey[]>,
  standard: ReadinessStandard,
  nowMs: number,
) {
  return combineDeckReadiness(decks, deck => readiness({
    calls: calls.filter(c => c.deckId === deck.id),
    trackKeys: keysByDeck.get(deck.id) ?? [],
    standard,
    hesitationMs: deck.hesitationMs,
    nowMs,
  }))
}

// A right call in SQL, the same rule as isRightCall in server/core/reports/crew-stats.ts.
const RIGHT = '(correct = 1 AND grade != \'missed\' AND anticipation = 0)'

// One number per call for the crew table, so a person's calls come back in one scan of the covering
// index as plain integers (no grouping, no sort, no row objects):
//   (((((code · decks + deck) · 2 + onDeckType) · 2 + offline) · 2 + matchesFilter) · 8 + period
// code: 0 not a right call, 1 right without a latency, latency + 2 for a right call with one;
// deck: the call's deck's index in scope; onDeckType: in the standard's window, on a target type
// with a view in its deck, and online unless the standard counts offline calls; offline: graded offline;
// period: how many of the cut times (newest first) the call comes before. Every factor is whole and
// small (a latency is at most MAX_LATENCY_MS), so the number is exact and decodes back in JS.
const PERIOD_SLOTS = 8

interface PackedStatementKey { cuts: number, decks: number, filtered: boolean }

export function packedSql({ cuts, decks, filtered }: PackedStatementKey): string {
  const period = Array.from({ length: cuts }, () => '(called_at < ?)').join(' + ') || '0'
  const deck = decks > 1 ? `(CASE deck_id ${Array.from({ length: decks }, (_, i) => `WHEN ? THEN ${i}`).join(' ')} END)` : '0'
  // Looked up only for calls in the standard's window, the only ones readiness reads.
  const onDeckType = `(called_at >= ? AND (? OR offline = 0) AND target_type_id IN (SELECT v.target_type_id FROM views v
    JOIN target_types t ON t.id = v.target_type_id WHERE t.deck_id IN (SELECT value FROM json_each(?))))`
  const matches = filtered ? '((? IS NULL OR aspect = ?) AND (? IS NULL OR condition = ?))' : '1'
  const code = `(CASE WHEN ${RIGHT} THEN coalesce(latency_ms + 2, 1) ELSE 0 END)`
  return `SELECT (((((${code} * ${decks} + ${deck}) * 2 + ${onDeckType}) * 2 + offline) * 2 + ${matches}) * ${PERIOD_SLOTS} + ${period})
    FROM calls WHERE user_id = ? AND ${WATCH_CALLS} AND deck_id IN (SELECT value FROM json_each(?)) AND called_at >= ? AND called_at < ?`
}

// Watch calls on each (target type, aspect) pair of a JSON list in [from, to], in the list's order
// (offline ones only when the second ? is 1): one seek of calls_user_deck_pair_time_idx a pair.
export const PAIR_COUNTS_SQL = `SELECT (SELECT COUNT(*) FROM calls c WHERE c.user_id = ? AND c.kind = 'watch' AND c.deck_id = ?
  AND c.target_type_id = k.value ->> 0 AND c.aspect = k.value ->> 1 AND c.called_at >= ? AND c.called_at <= ? AND (? OR c.offline = 0))
  FROM json_each(?) k ORDER BY k.key`

// The pairs of a deck as the JSON list PAIR_COUNTS_SQL reads, made once per list of keys.
const pairLists = new WeakMap<readonly TrackKey[], string>()
function pairListOf(keys: readonly TrackKey[]): string {
  let json = pairLists.get(keys)
  if (json === undefined) {
    json = JSON.stringify(keys.map(k => [k.targetTypeId, k.aspect]))
    pairLists.set(keys, json)
  }
  return json
}

// The packed statement's SQL text by its shape, made once a shape (statement() keys its cache by the text).
const packedTexts = new Map<string, string>()
function packedSqlOf(key: PackedStatementKey): string {
  const k = `${key.cuts}:${key.decks}:${key.filtered}`
  let text = packedTexts.get(k)
  if (text === undefined) packedTexts.set(k, text = packedSql(key))
  return text
}

function quantileOf(sorted: Float64Array, p: number): number | null {
  return sorted.length ? quantileSorted(sorted, p) : null
}

/** Per period: calls, of them offline, right calls and right calls' latencies that match the filters. */
interface PeriodFigures { calls: number[], offline: number[], right: number[], latencies: number[][] }

/**
 * One person's calls on the decks in scope, counted per period (newest first) for the table, and
 * per deck over the standard's window for readiness: the tally readiness() would take of the
 * same calls (see readinessOfTally).
 */
export function personTallies(
  sqlite: Database,
  userId: string,
  decks: readonly DeckRow[],
  keysByDeck: ReadonlyMap<string, readonly TrackKey[]>,
  scope: { cutTimes: readonly number[], oldestMs: number, windowFromMs: number, nowMs: number, offlineCounts: boolean },
  filter: { aspect: string | null, condition: string | null },
): { periods: PeriodFigures, readiness: ReadinessTally[] } {
  const n = scope.cutTimes.length + 1
  const periods: PeriodFigures = {
    calls: Array(n).fill(0), offline: Array(n).fill(0), right: Array(n).fill(0), latencies: Array.from({ length: n }, () => []),
  }
  const tallies = decks.map(() => ({ calls: 0, right: 0, latencies: [] as number[] }))
  if (!decks.length) return { periods, readiness: [] }
  const deckIds = decks.map(d => d.id)
  const deckJson = JSON.stringify(deckIds)
  const filtered = filter.aspect !== null || filter.condition !== null
  // In the order the placeholders come in packedSql: deck, onDeckType, matches, period, then WHERE.
  const offlineCounts = scope.offlineCounts ? 1 : 0
  const onDeckType = [scope.windowFromMs, offlineCounts, deckJson]
  const args: (string | number | null)[] = decks.length > 1 ? [...deckIds, ...onDeckType] : onDeckType
  if (filtered) args.push(filter.aspect, filter.aspect, filter.condition, filter.condition)
  args.push(...scope.cutTimes, userId, deckJson, scope.oldestMs, scope.nowMs + 1)
  const values = statement<number>(sqlite, packedSqlOf({ cuts: scope.cutTimes.length, decks: decks.length, filtered }), 'pluck').all(...args)
  const nDecks = decks.length
  for (const v of values) {
    // Below 2^31 (any latency up to MAX_LATENCY_MS on up to 550 decks) bit operations are exact
    // and fast; above it, the same fields by division.
    const small = v < 0x80000000
    const period = small ? v & 7 : v % 8
    const matches = small ? (v >> 3) & 1 : Math.floor(v / 8) % 2
    const offline = small ? (v >> 4) & 1 : Math.floor(v / 16) % 2
    const onDeckType = small ? (v >> 5) & 1 : Math.floor(v / 32) % 2
    const rest = small ? v >>> 6 : Math.floor(v / 64)
    const deck = nDecks === 1 ? 0 : rest % nDecks
    const code = nDecks === 1 ? rest : (rest - deck) / nDecks
    if (matches) {
      periods.calls[period]!++
      if (offline) periods.offline[period]!++
      if (code > 0) periods.right[period]!++
      if (code > 1) periods.latencies[period]!.push(code - 2)
    }
    if (onDeckType) {
      const tally = tallies[deck]!
      tally.calls++
      if (code > 0) tally.right++
      if (code > 1) tally.latencies.push(code - 2)
    }
  }
  const readinessTallies = decks.map((deck, i): ReadinessTally => {
    const keys = keysByDeck.get(deck.id) ?? []
    const n = statement<number, [string, string, number, number, number, string]>(sqlite, PAIR_COUNTS_SQL, 'pluck')
      .all(userId, deck.id, scope.windowFromMs, scope.nowMs, offlineCounts, pairListOf(keys))
    const counts = new Map(keys.map((k, j) => [trackKeyOf(k.targetTypeId, k.aspect), n[j]!]))
    const { calls, right, latencies } = tallies[i]!
    return { calls, right, latencies: sortedCopy(latencies), counts }
  })
  return { periods, readiness: readinessTallies }
}

/**
 * The crew table: one row per trainee of the crew. Calls, accuracy and the quantiles of right
 * calls cover the `days` days up to nowMs with the aspect and condition filters, counted in SQL;
 * readiness always follows the crew's standard on the decks in scope, unfiltered (readiness()).
 */
export function crewStatsOf(sqlite: Database, crewId: string, filters: StatsFilters, nowMs: number): CrewStats {
  const crew = statement<CrewRow, [string]>(sqlite, SQL.crew).get(crewId)
  if (!crew) throw createError({ statusCode: 404, message: 'No such crew.' })
  const decks = decksInScope(sqlite, crewId, filters.deckId, 'this crew')
  const deckIds = decks.map(d => d.id)
  const deckJson = JSON.stringify(deckIds)
  const standard = standardOf(crew)
  const keysByDeck = new Map(decks.map(d => [d.id, trackKeysOf(sqlite, d.id)]))
  const trainees = statement<{ id: string, name: string }, [string]>(sqlite, SQL.trainees).all(crewId)

  // Periods back from now, in days: the table's window, both trends, the period before each, and
  // the standard's window. Period i is [now - cuts[i+1] days, now - cuts[i] days), the newest
  // including now itself; "the last d days" is periods 0 .. upTo(d).
  const cuts = [...new Set([0, 7, 14, 30, 60, filters.days, standard.windowDays])].sort((a, b) => a - b)
  const upTo = (d: number) => cuts.indexOf(d) - 1
  const scope = {
    cutTimes: cuts.slice(1, -1).map(d => nowMs - d * DAY_MS),
    oldestMs: nowMs - cuts[cuts.length - 1]! * DAY_MS,
    windowFromMs: nowMs - standard.windowDays * DAY_MS,
    nowMs,
    offlineCounts: standard.offlineCounts,
  }
  const aspect = filters.aspect ?? null
  const condition = filters.condition ?? null

  const rows: CrewStatsRow[] = trainees.map((person) => {
    const { periods, readiness: tallies } = personTallies(sqlite, person.id, decks, keysByDeck, scope, { aspect, condition })
    const spans = new Map<string, { n: number, r: number, offline: number, sorted: Float64Array }>()
    const span = (from: number, to: number) => {
      const key = `${from}:${to}`
      let figures = spans.get(key)
      if (!figures) {
        figures = spanOf(from, to)
        spans.set(key, figures)
      }
      return figures
    }
    const spanOf = (from: number, to: number) => {
      let n = 0
      let r = 0
      let o = 0
      const l: number[] = []
      for (let i = from; i <= to; i++) {
        n += periods.calls[i]!
        o += periods.offline[i]!
        r += periods.right[i]!
        for (const x of periods.latencies[i]!) l.push(x)
      }
      return { n, r, offline: o, sorted: sortedCopy(l) }
    }
    const window = (d: number) => span(0, upTo(d))
    const before = (d: number) => span(upTo(d) + 1, upTo(2 * d))
    const trend = (d: number): TrendFigures => {
      const cur = window(d)
      const prev = before(d)
      return {
        days: d,
        calls: cur.n,
        accuracy: cur.n ? cur.r / cur.n : null,
        medianMs: quantileOf(cur.sorted, 0.5),
        previousAccuracy: prev.n ? prev.r / prev.n : null,
        previousMedianMs: quantileOf(prev.sorted, 0.5),
      }
    }
    const main = window(filters.days)
    const ready = combineDeckReadiness(decks, (deck, i) =>
      readinessOfTally(tallies[i]!, keysByDeck.get(deck.id) ?? [], standard, deck.hesitationMs))
    const last = deckIds.length ? statement<number, [string, number, IdList]>(sqlite, SQL.lastCall, 'pluck').get(person.id, nowMs, deckJson) : undefined
    return {
      userId: person.id,
      name: person.name,
      calls: main.n,
      offlineCalls: main.offline,
      accuracy: main.n ? main.r / main.n : null,
      medianMs: quantileOf(main.sorted, 0.5),
      p90Ms: quantileOf(main.sorted, 0.9),
      ready: ready.ready,
      trend7: trend(7),
      trend30: trend(30),
      lastWatchAt: last ?? null,
      tracksDue: deckIds.length ? tracksDueOf(sqlite, person.id, nowMs, deckJson) : 0,
      missing: ready.missing,
    }
  })

  return {
    crew: { id: crew.id, name: crew.name },
    standard,
    decks,
    filters: { deckId: filters.deckId ?? null, days: filters.days, aspect, condition },
    generatedAt: nowMs,
    rows,
  }
}

/** The CSV's column names: what each holds and in which unit. */
export function crewCsvColumns(timeZone: string): string[] {
  return [
    'Name', 'Ready', 'Right (%)', 'Median of right calls (s)', '90th percentile of right calls (s)', 'Calls', 'Calls graded offline',
    'Right, last 7 days (%)', 'Median, last 7 days (s)', 'Trend, last 7 days', 'Right, last 30 days (%)', 'Median, last 30 days (s)', 'Trend, last 30 days',
    `Last watch (${timeZone})`, 'Tracks due', 'Not ready because', 'Person id',
  ]
}

/**
 * The crew table flattened for CSV, written as the table writes it: shares in whole percent (one
 * decimal near a mark), latencies in seconds with two decimals, times in the reader's time zone,
 * yes/no for ready, the trend's one verdict; empty for no value.
 */
export function crewStatsRecords(stats: CrewStats, timeZone: string): (string | number | null)[][] {
  const pct = (x: number | null) => (x === null ? null : percentText(x))
  const sec = (x: number | null) => (x === null ? null : secondsText(x))
  return stats.rows.map(r => [
    r.name, r.ready ? 'yes' : 'no', pct(r.accuracy), sec(r.medianMs), sec(r.p90Ms), r.calls, r.offlineCalls,
    pct(r.trend7.accuracy), sec(r.trend7.medianMs), trendVerdict(r.trend7), pct(r.trend30.accuracy), sec(r.trend30.medianMs), trendVerdict(r.trend30),
    r.lastWatchAt === null ? null : localTimeText(r.lastWatchAt, timeZone), r.tracksDue, r.missing.join('; '), r.userId,
  ])
}

// ---------------------------------------------------------------- confusions

function namesOf(sqlite: Database, deckIds: readonly string[]): Map<string, string> {
  const rows = statement<{ id: string, name: string }, [IdList]>(sqlite, SQL.typeNames).all(JSON.stringify(deckIds))
  return new Map(rows.map(r => [r.id, r.name]))
}

function nameOf(sqlite: Database, names: Map<string, string>, id: string): string {
  let n = names.get(id)
  if (n === undefined) {
    n = statement<string, [string]>(sqlite, SQL.typeName, 'pluck').get(id) ?? 'an unknown target type'
    names.set(id, n)
  }
  return n
}

function namedPairs(sqlite: Database, names: Map<string, string>, pairs: readonly ConfusionPair[]): NamedPair[] {
  return pairs.map(p => ({
    ...p,
    truthName: nameOf(sqlite, names, p.truthId),
    calledName: nameOf(sqlite, names, p.calledId),
  }))
}

/** The crew's confusion matrix on one deck (the first assigned one when none is given) over `days` days. */
export function crewConfusionsOf(sqlite: Database, crewId: string, deckId: string | undefined, days: number, nowMs: number): CrewConfusions {
  const decks = decksInScope(sqlite, crewId, deckId, 'this crew')
  const deck = decks[0]
  if (!deck) return { deck: null, days, types: [], counts: [], noCall: [], totals: [] }
  const names = namesOf(sqlite, [deck.id])
  const rows = statement<[string, string | null], [string, number, number, string]>(sqlite, SQL.crewDeckCalls, 'raw')
    .all(deck.id, nowMs - days * DAY_MS, nowMs, crewId)
  const m = confusionMatrix(rows.map(([targetTypeId, calledTypeId]) => ({ targetTypeId, calledTypeId })), { types: [...names.keys()] })
  return {
    deck,
    days,
    types: m.types.map(id => ({ id, name: nameOf(sqlite, names, id) })),
    counts: m.types.map(truth => m.types.map(called => m.counts[truth]![called]!)),
    noCall: m.types.map(t => m.noCall[t]!),
    totals: m.types.map(t => m.totals[t]!),
  }
}

/** The worst pairs of a deck across the crews it is assigned to: overall, by aspect and by condition. */
export function deckConfusionsOf(sqlite: Database, deckId: string, days: number, nowMs: number, limit = 12): DeckConfusions {
  const deck = statement<DeckRow, [string]>(sqlite, SQL.deck).get(deckId)
  if (!deck) throw createError({ statusCode: 404, message: 'No such deck.' })
  const names = namesOf(sqlite, [deckId])
  const rows = statement<[string, string | null, string, string], [string, number, number, string]>(sqlite, SQL.deckCalls, 'raw')
    .all(deckId, nowMs - days * DAY_MS, nowMs, deckId)
  const calls = rows.map(([targetTypeId, calledTypeId, aspect, condition]) => ({ targetTypeId, calledTypeId, aspect, condition }))
  return {
    deck: { id: deck.id, title: deck.title },
    crews: statement<{ id: string, name: string }, [string]>(sqlite, SQL.deckCrews).all(deckId),
    days,
    calls: calls.length,
    overall: namedPairs(sqlite, names, worstPairs(calls, { limit })),
    byAspect: namedPairs(sqlite, names, worstPairs(calls, { by: 'aspect', limit })),
    byCondition: namedPairs(sqlite, names, worstPairs(calls, { by: 'condition', limit })),
    sideBySide: sideBySide(sqlite, namedPairs(sqlite, names, worstPairs(calls, { by: 'aspect', limit }))),
  }
}

// The first pairs of distinct types, at the aspect where each was confused most: the two types side
// by side with their features and a sunlit picture (for the deck's instructor, who may see renderings).
const SIDE_BY_SIDE = 3
function sideBySide(sqlite: Database, pairs: NamedPair[]): SideBySidePair[] {
  const typeOf = statement<{ id: string, name: string, features: string }, [string]>(sqlite, SQL.typeOf)
  const picture = statement<string, [string, string]>(sqlite, SQL.sunlitPicture, 'pluck')
  const side = (id: string, aspect: string): PairSide => {
    const t = typeOf.get(id)!
    const file = picture.get(id, aspect)
    return { id: t.id, name: t.name, features: JSON.parse(t.features) as Record<string, string>, imageUrl: file ? `/images/${file}` : null }
  }
  const seen = new Set<string>()
  const out: SideBySidePair[] = []
  for (const p of pairs) {
    const key = [p.truthId, p.calledId].sort().join('|')
    if (seen.has(key) || !p.aspect) continue
    seen.add(key)
    out.push({ aspect: p.aspect, count: p.count, share: p.share, truth: side(p.truthId, p.aspect), called: side(p.calledId, p.aspect) })
    if (out.length === SIDE_BY_SIDE) break
  }
  return out
}

// ---------------------------------------------------------------- person page

// The rolling median of the latency chart: over this many right calls (common practice, no source).
export const ROLLING_WINDOW = 15
// At most this many points in the latency chart (the most recent ones).
export const LATENCY_POINTS = 600

function breakdown(rows: readonly BreakdownRow[], label: (key: string) => string): BreakdownView[] {
  return rows.map(r => ({ ...r, label: label(r.key) }))
}

/** Everything the person page shows, for `days` days up to nowMs on the decks of the person's crews. */
/** The person page; crewIds (see requirePersonAccess in policy.ts) limits it to those crews and their decks. */
export function personReportOf(
  sqlite: Database, userId: string, viewerId: string, filters: { deckId?: string, days: number }, nowMs: number, crewIds: readonly string[] | null = null,
): PersonReport {
  const user = statement<{ id: string, name: string, remindersOptOut: number }, [string]>(sqlite, SQL.user).get(userId)
  if (!user) throw createError({ statusCode: 404, message: 'No such person.' })
  const crews = statement<CrewRow, [string]>(sqlite, SQL.userCrews).all(userId).filter(c => !crewIds || crewIds.includes(c.id))
  // Decks of all the person's crews, each read against the standard of the first crew it is assigned to.
  const deckCrew = new Map<string, CrewRow>()
  const allDecks: DeckRow[] = []
  for (const crew of crews) {
    for (const d of statement<DeckRow, [string]>(sqlite, SQL.crewDecks).all(crew.id)) {
      if (deckCrew.has(d.id)) continue
      deckCrew.set(d.id, crew)
      allDecks.push(d)
    }
  }
  let decks = allDecks
  if (filters.deckId) {
    decks = allDecks.filter(d => d.id === filters.deckId)
    if (!decks.length) throw createError({ statusCode: 404, message: 'That deck is not assigned to this person\'s crew. Choose one of its decks.' })
  }
  const deckIds = decks.map(d => d.id)
  const maxWindow = Math.max(filters.days, ...decks.map(d => deckCrew.get(d.id)!.windowDays))
  const all = loadPersonCalls(sqlite, userId, deckIds, nowMs - maxWindow * DAY_MS, nowMs)
  const calls = callsSince(all, nowMs, filters.days)
  const summary = personStats(calls, nowMs)

  const right = calls.filter(c => c.correct && c.grade !== 'missed' && !c.anticipation && c.latencyMs !== null)
  const rolling = rollingMedian(right.map(c => c.latencyMs!), ROLLING_WINDOW)
  const latency = right.map((c, i) => ({ at: c.calledAt, ms: c.latencyMs!, rolling: rolling[i]! })).slice(-LATENCY_POINTS)

  const names = namesOf(sqlite, deckIds)
  const typeLabel = (id: string) => nameOf(sqlite, names, id)
  const baselineRow = statement<{ simpleMs: number, choiceMs: number, at: number }, [string]>(sqlite, SQL.baseline).get(userId)

  const readinessViews: DeckReadinessView[] = decks.map((deck) => {
    const r = readinessOnDecks(all, [deck], new Map([[deck.id, trackKeysOf(sqlite, deck.id)]]), standardOf(deckCrew.get(deck.id)!), nowMs)
    const d = r.perDeck[0]!
    return { deckId: deck.id, title: deck.title, ready: d.ready, missing: d.missing, accuracy: d.accuracy, medianMs: d.medianMs, hesitationMs: deck.hesitationMs }
  })

  return {
    person: { id: user.id, name: user.name, crews: crews.map(c => ({ id: c.id, name: c.name })) },
    self: viewerId === userId,
    remindersOptOut: viewerId === userId ? user.remindersOptOut === 1 : null,
    decks: allDecks,
    filters: { deckId: filters.deckId ?? null, days: filters.days },
    summary: { calls: summary.calls, accuracy: summary.accuracy, medianMs: summary.medianMs, p90Ms: summary.p90Ms, lastCallAt: summary.lastCallAt },
    latency,
    rollingWindow: ROLLING_WINDOW,
    byAspect: breakdown(statsBy(calls, 'aspect'), k => k),
    byCondition: breakdown(statsBy(calls, 'condition'), k => k),
    weakest: breakdown(statsBy(calls, 'targetTypeId').slice(0, 5), typeLabel),
    confusions: namedPairs(sqlite, names, worstPairs(calls, { limit: 8 })),
    baseline: baselineRow ?? null,
    netMs: baselineRow && summary.medianMs !== null ? Math.max(0, summary.medianMs - baselineRow.choiceMs) : null,
    readiness: readinessViews,
    tracksDue: deckIds.length ? tracksDueOf(sqlite, userId, nowMs, JSON.stringify(deckIds)) : 0,
  }
}

// ---------------------------------------------------------------- for the routes (the server's one handle)

export const crewStats = (crewId: string, filters: StatsFilters) => crewStatsOf(useSqlite(), crewId, filters, Date.now())
export const crewConfusions = (crewId: string, deckId: string | undefined, days: number) => crewConfusionsOf(useSqlite(), crewId, deckId, days, Date.now())
export const deckConfusions = (deckId: string, days: number) => deckConfusionsOf(useSqlite(), deckId, days, Date.now())
export const personReport = (userId: string, viewerId: string, filters: { deckId?: string, days: number }, crewIds: readonly string[] | null) =>
  personReportOf(useSqlite(), userId, viewerId, filters, Date.now(), crewIds)
