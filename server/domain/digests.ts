// The weekly digest to each lead of a crew and the opt-out daily reminder to trainees with tracks
// due, sent through the one mail transport. Each mail is claimed in the audit log first (action
// digest.weekly or digest.daily with its period), so a second run for the same week or day sends nothing.
import type { Database } from 'better-sqlite3'
import { DAY_MS, windowStats } from '../core/reports/crew-stats'
import { dailyReminder, weeklyLeadDigest } from '../core/reports/digest'
import type { DigestPerson } from '../core/reports/digest'
import type { DigestRunResult } from '../../shared/types/stats'
import type { DigestKind } from '../../shared/schemas/stats'
import { useSqlite } from '../utils/db'
import { newId } from '../utils/ids'
import { statement } from '../utils/sql'
import { appUrl, sendMail } from '../utils/mail'
import { loadPersonCalls, readinessOnDecks } from './stats'

export interface DigestOptions {
  // the address links in the mails point to
  baseUrl?: string
  // who triggered the run (null: the schedule or the command)
  actorId?: string | null
}

/** The ISO week before the one nowMs is in: [Monday 00:00 UTC, next Monday 00:00 UTC) and its label, e.g. 2026-W09. */
export function digestWeek(nowMs: number): { weekStart: number, weekEnd: number, period: string } {
  const d = new Date(nowMs)
  const midnight = Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate())
  // getUTCDay: 0 is Sunday; ISO weeks start on Monday.
  const weekEnd = midnight - ((d.getUTCDay() + 6) % 7) * DAY_MS
  const weekStart = weekEnd - 7 * DAY_MS
  // The ISO week-numbering year is the year of the week's Thursday (ISO 8601).
  const thursday = new Date(weekStart + 3 * DAY_MS)
  const year = thursday.getUTCFullYear()
  const week = Math.floor((thursday.getTime() - Date.UTC(year, 0, 1)) / (7 * DAY_MS)) + 1
  return { weekStart, weekEnd, period: `${year}-W${String(week).padStart(2, '0')}` }
}

/** The UTC day of nowMs, YYYY-MM-DD: the period of a daily reminder. */
export function digestDay(nowMs: number): string {
  return new Date(nowMs).toISOString().slice(0, 10)
}

function claimer(sqlite: Database, kind: DigestKind, actorId: string | null) {
  const action = `digest.${kind}`
  const seen = statement<number, [string, string, string, string]>(sqlite, `SELECT 1 FROM audit_log WHERE action = ? AND subject_id = ? AND json_extract(detail, '$.period') = ?
    AND json_extract(detail, '$.to') = ? LIMIT 1`, 'pluck')
  const insert = statement<unknown, [string, string | null, string, string, string, string, number]>(sqlite, 'INSERT INTO audit_log (id, actor_id, action, subject_type, subject_id, detail, created_at) VALUES (?, ?, ?, ?, ?, ?, ?)')
  // Check and record in one immediate transaction, so two runs at once cannot both send.
  return sqlite.transaction((subjectType: string, subjectId: string, period: string, to: string): boolean => {
    if (seen.get(action, subjectId, period, to)) return false
    insert.run(newId(), actorId, action, subjectType, subjectId, JSON.stringify({ period, to }), Date.now())
    return true
  })
}

interface DeckRow { id: string, title: string, hesitationMs: number }

interface CrewRow { id: string, name: string, minAccuracy: number, minCallsPerTrack: number, windowDays: number, offlineCounts: number }

// The statements a weekly digest reads.
function digestReader(sqlite: Database) {
  const decksOf = statement<DeckRow, [string]>(sqlite, `SELECT d.id, d.title, d.hesitation_ms AS hesitationMs FROM deck_crews dc JOIN decks d ON d.id = dc.deck_id
    WHERE dc.crew_id = ? AND d.status = 'published' ORDER BY d.title, d.id`)
  const traineesOf = statement<{ id: string, name: string }, [string]>(sqlite, `SELECT u.id, u.name FROM memberships m JOIN users u ON u.id = m.user_id
    WHERE m.crew_id = ? AND u.disabled = 0 AND EXISTS (SELECT 1 FROM user_roles r WHERE r.user_id = u.id AND r.role = 'trainee') ORDER BY u.name`)
  const keysOf = statement<{ targetTypeId: string, aspect: string }, [string]>(sqlite, `SELECT DISTINCT v.target_type_id AS targetTypeId, v.aspect FROM views v JOIN target_types t ON t.id = v.target_type_id WHERE t.deck_id = ?`)
  const lastCall = statement<number, [string, number, string]>(sqlite, `SELECT called_at FROM calls WHERE user_id = ? AND kind = 'watch' AND called_at < ?
    AND deck_id IN (SELECT value FROM json_each(?)) ORDER BY called_at DESC LIMIT 1`, 'pluck')
  // One crew's digest of the week [weekStart, weekEnd), counting calls made before `asOf`.
  return (crew: CrewRow, weekStart: number, weekEnd: number, base: string, asOf = weekEnd) => {
    const decks = decksOf.all(crew.id)
    const deckIds = decks.map(d => d.id)
    const keys = new Map(decks.map(d => [d.id, keysOf.all(d.id)]))
    const standard = { minAccuracy: crew.minAccuracy, minCallsPerTrack: crew.minCallsPerTrack, windowDays: crew.windowDays, offlineCounts: crew.offlineCounts === 1 }
    const until = Math.min(asOf, weekEnd)
    const people: DigestPerson[] = traineesOf.all(crew.id).map((t) => {
      const calls = loadPersonCalls(sqlite, t.id, deckIds, weekStart - crew.windowDays * DAY_MS, until - 1)
      const weekAgo = calls.filter(c => c.calledAt <= weekStart)
      return {
        name: t.name,
        readyNow: readinessOnDecks(calls, decks, keys, standard, until).ready,
        readyWeekAgo: readinessOnDecks(weekAgo, decks, keys, standard, weekStart).ready,
        accuracyNow: windowStats(calls, until, crew.windowDays).accuracy,
        accuracyWeekAgo: windowStats(weekAgo, weekStart, crew.windowDays).accuracy,
        lastCallAt: deckIds.length ? lastCall.get(t.id, until, JSON.stringify(deckIds)) ?? null : null,
      }
    })
    return weeklyLeadDigest({ crewName: crew.name, people, weekStart, weekEnd, crewUrl: `${base}/crews/${crew.id}` })
  }
}

const CREWS_SQL = `SELECT id, name, min_accuracy AS minAccuracy, min_calls_per_track AS minCallsPerTrack, window_days AS windowDays,
    offline_counts AS offlineCounts FROM crews`

/** The weekly digest of the week before nowMs to every lead of every crew who has not turned it off. */
export async function runWeeklyDigests(nowMs: number, opts: DigestOptions = {}): Promise<DigestRunResult> {
  const sqlite = useSqlite()
  const { weekStart, weekEnd, period } = digestWeek(nowMs)
  const base = opts.baseUrl ?? appUrl()
  const claim = claimer(sqlite, 'weekly', opts.actorId ?? null)
  const crews = statement<CrewRow, []>(sqlite, `${CREWS_SQL} ORDER BY name`).all()
  const leadsOf = statement<{ id: string, name: string, email: string }, [string]>(sqlite, `SELECT u.id, u.name, u.email FROM memberships m JOIN users u ON u.id = m.user_id
    WHERE m.crew_id = ? AND u.disabled = 0 AND u.digest_opt_out = 0 AND EXISTS (SELECT 1 FROM user_roles r WHERE r.user_id = u.id AND r.role = 'lead') ORDER BY u.name`)
  const digestOf = digestReader(sqlite)

  const result: DigestRunResult = { kind: 'weekly', period, sent: 0, alreadySent: 0, skipped: 0 }
  for (const crew of crews) {
    const leads = leadsOf.all(crew.id)
    if (!leads.length) {
      result.skipped++
      continue
    }
    const digest = digestOf(crew, weekStart, weekEnd, base)
    for (const lead of leads) {
      if (!claim('crew', crew.id, period, lead.id)) {
        result.alreadySent++
        continue
      }
      await sendMail({ to: lead.email, subject: digest.subject, text: digest.text, html: digest.html })
      result.sent++
    }
  }
  return result
}

export interface DigestPreview {
  optedOut: boolean
  // when the next weekly digest is sent (the schedule: Mondays 06:00 UTC) and the week it covers
  sendsAt: number
  weekStart: number
  weekEnd: number
  crews: { crewId: string, crewName: string, subject: string, text: string }[]
}

/** The next weekly digest a lead would get, for each crew they lead, with the calls made so far this week. */
export function previewWeeklyDigest(leadId: string, crewIds: string[], nowMs: number, base: string): DigestPreview {
  const sqlite = useSqlite()
  // The run on the coming Monday covers the week now is in.
  const { weekStart, weekEnd } = digestWeek(nowMs + 7 * DAY_MS)
  const sendsAt = weekEnd + 6 * 60 * 60 * 1000
  const optedOut = statement<number, [string]>(sqlite, 'SELECT digest_opt_out FROM users WHERE id = ?', 'pluck').get(leadId) === 1
  const crews = statement<CrewRow, [string]>(sqlite, `${CREWS_SQL} WHERE id IN (SELECT value FROM json_each(?)) ORDER BY name`).all(JSON.stringify(crewIds))
  const digestOf = digestReader(sqlite)
  return {
    optedOut,
    sendsAt,
    weekStart,
    weekEnd,
    crews: crews.map((crew) => {
      const d = digestOf(crew, weekStart, weekEnd, base, nowMs)
      return { crewId: crew.id, crewName: crew.name, subject: d.subject, text: d.text }
    }),
  }
}

/** The daily reminder for nowMs's day to every trainee with tracks due who has not opted out. */
export async function runDailyReminders(nowMs: number, opts: DigestOptions = {}): Promise<DigestRunResult> {
  const sqlite = useSqlite()
  const period = digestDay(nowMs)
  const base = opts.baseUrl ?? appUrl()
  const claim = claimer(sqlite, 'daily', opts.actorId ?? null)
  const trainees = statement<{ id: string, name: string, email: string, optOut: number }, []>(sqlite, `SELECT u.id, u.name, u.email, u.reminders_opt_out AS optOut FROM users u
    WHERE u.disabled = 0 AND EXISTS (SELECT 1 FROM user_roles r WHERE r.user_id = u.id AND r.role = 'trainee') ORDER BY u.name`)
    .all()
  // Tracks due on the decks assigned to the trainee's crews.
  const due = statement<number, [string, number, string]>(sqlite, `SELECT COUNT(*) FROM tracks t WHERE t.user_id = ? AND t.due <= ? AND t.deck_id IN (
    SELECT dc.deck_id FROM deck_crews dc JOIN memberships m ON m.crew_id = dc.crew_id WHERE m.user_id = ?)`, 'pluck')

  const result: DigestRunResult = { kind: 'daily', period, sent: 0, alreadySent: 0, skipped: 0 }
  for (const t of trainees) {
    const tracksDue = t.optOut ? 0 : due.get(t.id, nowMs, t.id)!
    if (!tracksDue) {
      result.skipped++
      continue
    }
    if (!claim('user', t.id, period, t.id)) {
      result.alreadySent++
      continue
    }
    const mail = dailyReminder({ name: t.name, tracksDue, appUrl: `${base}/watch` })
    await sendMail({ to: t.email, ...mail })
    result.sent++
  }
  return result
}

export function runDigests(kind: DigestKind, nowMs: number, opts: DigestOptions = {}): Promise<DigestRunResult> {
  return kind === 'weekly' ? runWeeklyDigests(nowMs, opts) : runDailyReminders(nowMs, opts)
}
