// The crew table's SQL path (server/domain/stats.ts) on a real SQLite file: its counts and quantiles
// against simple-statistics on the same latencies, and its readiness against readiness() on every row.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Database } from 'better-sqlite3'
import { quantile } from 'simple-statistics'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { applyMigrations, openDatabase } from '../../../server/database/client'
import { DAY_MS, isRightCall } from '../../../server/core/reports/crew-stats'
import type { CallRecord } from '../../../server/core/reports/crew-stats'
import { PAIR_COUNTS_SQL, crewStatsOf, loadPersonCalls, packedSql, personReportOf, readinessOnDecks } from '../../../server/domain/stats'
import { digestDay, digestWeek } from '../../../server/domain/digests'
import { seededRng as rng } from '../../../shared/utils/rng'

const NOW = Date.UTC(2025, 5, 16, 12)
const ASPECTS = ['beam', 'head-on']
const CONDITIONS = ['haze', 'sunlit', 'goggles']
let dir: string
let sqlite: Database
const people = ['p1aaaaaaaa', 'p2aaaaaaaa', 'p3aaaaaaaa']
const types = ['ty1aaaaaaa', 'ty2aaaaaaa', 'ty3aaaaaaa']

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'glint-stats-unit-'))
  const opened = openDatabase(join(dir, 'g.sqlite'))
  applyMigrations(opened.db)
  sqlite = opened.sqlite
  sqlite.pragma('foreign_keys = OFF')
  const r = rng(7)
  sqlite.prepare('INSERT INTO crews (id, name) VALUES (\'crewaaaaaa\', \'Unit crew\')').run()
  sqlite.prepare('INSERT INTO users (id, email, name, password_hash) VALUES (\'ownraaaaaa\', \'o@x.test\', \'Owner\', \'x\')').run()
  sqlite.prepare('INSERT INTO decks (id, title, category, owner_id, hesitation_ms, status) VALUES (\'deckaaaaaa\', \'Unit deck\', \'aircraft\', \'ownraaaaaa\', 1200, \'published\')').run()
  sqlite.prepare('INSERT INTO deck_crews (deck_id, crew_id) VALUES (\'deckaaaaaa\', \'crewaaaaaa\')').run()
  for (const t of types) {
    sqlite.prepare('INSERT INTO target_types (id, deck_id, name, category, affiliation, size_m, features) VALUES (?, \'deckaaaaaa\', ?, \'aircraft\', \'neutral\', 10, \'{}\')').run(t, t)
    for (const a of ASPECTS) sqlite.prepare('INSERT INTO views (id, target_type_id, aspect, source_sha, width, height) VALUES (?, ?, ?, \'s\', 1, 1)').run(`${t}${a}`, t, a)
  }
  // A second deck with one type, so the crew table's per-deck readiness is tested on two decks.
  sqlite.prepare('INSERT INTO decks (id, title, category, owner_id, hesitation_ms, status) VALUES (\'deckbbbbbb\', \'Second deck\', \'vessel\', \'ownraaaaaa\', 900, \'published\')').run()
  sqlite.prepare('INSERT INTO deck_crews (deck_id, crew_id) VALUES (\'deckbbbbbb\', \'crewaaaaaa\')').run()
  sqlite.prepare('INSERT INTO target_types (id, deck_id, name, category, affiliation, size_m, features) VALUES (\'tybbbbbbbb\', \'deckbbbbbb\', \'B\', \'vessel\', \'neutral\', 50, \'{}\')').run()
  sqlite.prepare('INSERT INTO views (id, target_type_id, aspect, source_sha, width, height) VALUES (\'vwbbbbbbbb\', \'tybbbbbbbb\', \'beam\', \'s\', 1, 1)').run()
  const call = sqlite.prepare(`INSERT INTO calls (id, sighting_id, user_id, deck_id, target_type_id, called_type_id, aspect, condition, correct, grade,
    anticipation, latency_ms, called_at, received_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`)
  let n = 0
  people.forEach((p, k) => {
    sqlite.prepare('INSERT INTO users (id, email, name, password_hash) VALUES (?, ?, ?, \'x\')').run(p, `${p}@x.test`, `Person ${k}`)
    sqlite.prepare('INSERT INTO user_roles (user_id, role) VALUES (?, \'trainee\')').run(p)
    sqlite.prepare('INSERT INTO memberships (crew_id, user_id) VALUES (\'crewaaaaaa\', ?)').run(p)
    for (let i = 0; i < 400 + 150 * k; i++) {
      const truth = types[Math.floor(r() * 3)]!
      const correct = r() < 0.85 + 0.05 * k
      const anticipation = correct && r() < 0.02
      const latency = r() < 0.03 ? null : Math.round(300 + r() * 2000)
      const grade = !correct || latency === null || anticipation ? 'missed' : latency <= 600 ? 'instant' : latency <= 1200 ? 'sure' : 'hesitant'
      const at = NOW - Math.floor(r() * 70 * DAY_MS)
      call.run(`c${n}`, `s${n}`, p, 'deckaaaaaa', truth, correct ? truth : types[(types.indexOf(truth) + 1) % 3], ASPECTS[Math.floor(r() * 2)], CONDITIONS[Math.floor(r() * 3)],
        correct ? 1 : 0, grade, anticipation ? 1 : 0, latency, at, at)
      n++
    }
    // On the second deck, also on an aspect without a view; and a few on a type that has lost its views.
    for (let i = 0; i < 20 + 15 * k; i++) {
      const correct = r() < 0.9
      const latency = Math.round(300 + r() * 1200)
      const at = NOW - Math.floor(r() * 40 * DAY_MS)
      call.run(`c${n}`, `s${n}`, p, 'deckbbbbbb', 'tybbbbbbbb', correct ? 'tybbbbbbbb' : null, r() < 0.8 ? 'beam' : 'head-on', 'haze',
        correct ? 1 : 0, correct ? 'sure' : 'missed', 0, latency, at, at)
      n++
    }
    for (let i = 0; i < 5; i++) {
      const at = NOW - Math.floor(r() * 10 * DAY_MS)
      call.run(`c${n}`, `s${n}`, p, 'deckaaaaaa', 'tyorphanaa', 'tyorphanaa', 'beam', 'sunlit', 1, 'sure', 0, 5000, at, at)
      n++
    }
  })
  // One call in seven graded offline, so both readiness paths meet offline calls.
  sqlite.prepare('UPDATE calls SET offline = 1 WHERE rowid % 7 = 0').run()
})

afterAll(() => {
  sqlite?.close()
  rmSync(dir, { recursive: true, force: true })
})

const rightLat = (calls: CallRecord[]) => calls.filter(c => isRightCall(c) && c.latencyMs !== null).map(c => c.latencyMs!)

describe('crew table SQL path', () => {
  for (const filters of [{ days: 30 }, { days: 7 }, { days: 45, aspect: 'beam' }, { days: 60, condition: 'haze' }]) {
    it(`counts and quantiles equal simple-statistics on the same calls (${JSON.stringify(filters)})`, () => {
      const stats = crewStatsOf(sqlite, 'crewaaaaaa', filters, NOW)
      expect(stats.rows).toHaveLength(3)
      for (const row of stats.rows) {
        const all = loadPersonCalls(sqlite, row.userId, ['deckaaaaaa', 'deckbbbbbb'], 0, NOW)
        const from = NOW - filters.days * DAY_MS
        const inWindow = all.filter(c => c.calledAt >= from
          && (!('aspect' in filters) || c.aspect === filters.aspect) && (!('condition' in filters) || c.condition === filters.condition))
        const lat = rightLat(inWindow)
        expect(row.calls).toBe(inWindow.length)
        expect(row.accuracy).toBe(inWindow.filter(isRightCall).length / inWindow.length)
        // Reference: simple-statistics quantile (R type 7), as check-values.md asks.
        expect(row.medianMs).toBe(quantile(lat, 0.5))
        expect(row.p90Ms).toBe(quantile(lat, 0.9))
        const prev7 = inWindow.length
          ? all.filter(c => c.calledAt < NOW - 7 * DAY_MS && c.calledAt >= NOW - 14 * DAY_MS
            && (!('aspect' in filters) || c.aspect === filters.aspect) && (!('condition' in filters) || c.condition === filters.condition))
          : []
        if (prev7.length) expect(row.trend7.previousMedianMs).toBe(quantile(rightLat(prev7), 0.5))
      }
    })
  }

  it('reaches the same readiness as readiness() on every call of the window, on one deck and on two', () => {
    const decks = [{ id: 'deckaaaaaa', title: 'Unit deck', hesitationMs: 1200 }, { id: 'deckbbbbbb', title: 'Second deck', hesitationMs: 900 }]
    const keys = new Map([
      ['deckaaaaaa', types.flatMap(t => ASPECTS.map(aspect => ({ targetTypeId: t, aspect })))],
      ['deckbbbbbb', [{ targetTypeId: 'tybbbbbbbb', aspect: 'beam' }]],
    ])
    let checked = 0
    const results: string[] = []
    for (const windowDays of [3, 14, 30, 90]) {
      for (const minAccuracy of [0.8, 0.9]) {
        for (const minCallsPerTrack of [1, 4]) {
          // Offline calls counted under one of the two call minimums, so both settings are compared.
          const offlineCounts = minCallsPerTrack === 4
          sqlite.prepare('UPDATE crews SET min_accuracy = ?, min_calls_per_track = ?, window_days = ?, offline_counts = ? WHERE id = \'crewaaaaaa\'')
            .run(minAccuracy, minCallsPerTrack, windowDays, offlineCounts ? 1 : 0)
          const standard = { minAccuracy, minCallsPerTrack, windowDays, offlineCounts }
          for (const scope of [[decks[0]!], decks]) {
            const stats = crewStatsOf(sqlite, 'crewaaaaaa', { days: 30, deckId: scope.length === 1 ? scope[0]!.id : undefined }, NOW)
            for (const row of stats.rows) {
              const full = loadPersonCalls(sqlite, row.userId, scope.map(d => d.id), 0, NOW)
              const expected = readinessOnDecks(full, stats.decks, keys, standard, NOW)
              expect({ ready: row.ready, missing: row.missing }).toEqual({ ready: expected.ready, missing: expected.missing })
              checked++
              results.push(`${row.ready}`)
            }
          }
        }
      }
    }
    expect(checked).toBe(4 * 2 * 2 * 2 * people.length)
    // Both outcomes occur, so the comparison is not all one answer.
    expect(new Set(results)).toEqual(new Set(['true', 'false']))
  })
})

// Issue 14, items 2 and 3, on a crew of its own using the unit deck (3 types x 2 aspects, 1.2 s limit):
// product.md "Offline" (calls graded offline count toward readiness only where the standard says so,
// default no) and "check" (a fixed qualification test, its own measure: its calls stay out of drill figures).
describe('offline calls and check calls in the crew table', () => {
  const CREW = 'crewcccccc'
  const pairs = types.flatMap(t => ASPECTS.map(aspect => ({ t, aspect })))
  beforeAll(() => {
    sqlite.prepare('INSERT INTO crews (id, name) VALUES (?, \'Offline crew\')').run(CREW)
    sqlite.prepare('INSERT INTO deck_crews (deck_id, crew_id) VALUES (\'deckaaaaaa\', ?)').run(CREW)
    const call = sqlite.prepare(`INSERT INTO calls (id, sighting_id, user_id, deck_id, target_type_id, called_type_id, aspect, condition, correct, grade,
      anticipation, latency_ms, called_at, received_at, offline, kind) VALUES (?, ?, ?, 'deckaaaaaa', ?, ?, ?, 'sunlit', ?, ?, 0, 500, ?, ?, ?, ?)`)
    let n = 0
    const add = (user: string, t: string, aspect: string, right: boolean, offline: boolean, kind: string) => {
      const at = NOW - (1 + (n % 5)) * DAY_MS
      call.run(`oc${n}`, `os${n}`, user, t, right ? t : types[(types.indexOf(t) + 1) % 3], aspect, right ? 1 : 0, right ? 'instant' : 'missed', at, at, offline ? 1 : 0, kind)
      n++
    }
    for (const [user, name] of [['q1aaaaaaaa', 'Quill'], ['q2aaaaaaaa', 'Rook']] as const) {
      sqlite.prepare('INSERT INTO users (id, email, name, password_hash) VALUES (?, ?, ?, \'x\')').run(user, `${user}@x.test`, name)
      sqlite.prepare('INSERT INTO user_roles (user_id, role) VALUES (?, \'trainee\')').run(user)
      sqlite.prepare('INSERT INTO memberships (crew_id, user_id) VALUES (?, ?)').run(CREW, user)
    }
    // Quill: every pair twice online and twice offline, all right; and 5 wrong calls in a check.
    for (const { t, aspect } of pairs) {
      for (let k = 0; k < 2; k++) add('q1aaaaaaaa', t, aspect, true, false, 'watch')
      for (let k = 0; k < 2; k++) add('q1aaaaaaaa', t, aspect, true, true, 'watch')
    }
    for (let k = 0; k < 5; k++) add('q1aaaaaaaa', types[k % 3]!, 'beam', false, false, 'check')
    // Rook: every pair three times, all offline and right.
    for (const { t, aspect } of pairs) for (let k = 0; k < 3; k++) add('q2aaaaaaaa', t, aspect, true, true, 'watch')
  })

  const rowOf = (user: string) => crewStatsOf(sqlite, CREW, { days: 30, deckId: 'deckaaaaaa' }, NOW).rows.find(r => r.userId === user)!

  it('counts check calls nowhere in the drill figures, and shows how many calls were offline', () => {
    sqlite.prepare('UPDATE crews SET min_accuracy = 0.9, min_calls_per_track = 2, window_days = 14, offline_counts = 0 WHERE id = ?').run(CREW)
    const quill = rowOf('q1aaaaaaaa')
    // 24 drill calls (12 online, 12 offline); the 5 check calls are not among them.
    expect(quill.calls).toBe(24)
    expect(quill.offlineCalls).toBe(12)
    expect(quill.accuracy).toBe(1)
    // Counted, the 5 wrong check calls would take accuracy to 24 / 29 (82.8 %), under the 90 % mark.
    expect(quill.ready).toBe(true)
    expect(loadPersonCalls(sqlite, 'q1aaaaaaaa', ['deckaaaaaa'], 0, NOW)).toHaveLength(24)
    const rook = rowOf('q2aaaaaaaa')
    expect(rook.calls).toBe(18)
    expect(rook.offlineCalls).toBe(18)
  })

  it('leaves offline calls out of readiness by default, and counts them when the standard says so', () => {
    sqlite.prepare('UPDATE crews SET min_accuracy = 0.9, min_calls_per_track = 2, window_days = 14, offline_counts = 0 WHERE id = ?').run(CREW)
    const rook = rowOf('q2aaaaaaaa')
    expect(rook.ready).toBe(false)
    expect(rook.missing).toEqual(['no calls in the last 14 days', '6 target type/aspect pairs called fewer than 2 times in 14 days'])
    // Quill's 12 online calls meet the standard by themselves (2 a pair, all right, median 0.5 s).
    expect(rowOf('q1aaaaaaaa').ready).toBe(true)
    sqlite.prepare('UPDATE crews SET offline_counts = 1 WHERE id = ?').run(CREW)
    expect(rowOf('q2aaaaaaaa')).toMatchObject({ ready: true, missing: [] })
    // Quill with 3 a pair needed: 2 online a pair fall short; with the offline ones, 4 a pair suffice.
    sqlite.prepare('UPDATE crews SET min_calls_per_track = 3 WHERE id = ?').run(CREW)
    expect(rowOf('q1aaaaaaaa').ready).toBe(true)
    sqlite.prepare('UPDATE crews SET offline_counts = 0 WHERE id = ?').run(CREW)
    expect(rowOf('q1aaaaaaaa').missing).toEqual(['6 target type/aspect pairs called fewer than 3 times in 14 days'])
  })

  it('the person page reads the same readiness as the crew table', () => {
    for (const offlineCounts of [0, 1]) {
      sqlite.prepare('UPDATE crews SET min_calls_per_track = 2, offline_counts = ? WHERE id = ?').run(offlineCounts, CREW)
      const report = personReportOf(sqlite, 'q2aaaaaaaa', 'q2aaaaaaaa', { days: 30, deckId: 'deckaaaaaa' }, NOW)
      expect(report.readiness[0]!.ready).toBe(offlineCounts === 1)
      expect(report.summary.calls).toBe(18)
      const quill = personReportOf(sqlite, 'q1aaaaaaaa', 'q1aaaaaaaa', { days: 30, deckId: 'deckaaaaaa' }, NOW)
      expect(quill.summary.calls).toBe(24)
      expect(quill.confusions).toEqual([])
    }
  })
})

describe('crew table query plans', () => {
  // The app keeps no planner statistics (no ANALYZE: with this SQLite build's STAT4, every rebind of
  // a range statement recompiles it), so the plans must come from the indexes alone. Read with
  // EXPLAIN QUERY PLAN (sqlite.org/eqp.html).
  const plan = (sql: string) => (sqlite.prepare(`EXPLAIN QUERY PLAN ${sql}`).all(...Array(sql.split('?').length - 1).fill(null)) as { detail: string }[])
    .map(r => r.detail).join(' | ')

  it('reads a person\'s calls from the covering index in one range, without a sort or a temporary table', () => {
    for (const key of [{ cuts: 5, decks: 1, filtered: false }, { cuts: 4, decks: 3, filtered: true }]) {
      const p = plan(packedSql(key))
      expect(p).toContain('SEARCH calls USING COVERING INDEX calls_user_deck_time_idx (user_id=? AND deck_id=? AND called_at>? AND called_at<?)')
      expect(p).not.toMatch(/TEMP B-TREE|SCAN calls/)
    }
  })

  it('counts each (target type, aspect) pair by one seek of the pair index', () => {
    const p = plan(PAIR_COUNTS_SQL)
    expect(p).toContain('SEARCH c USING COVERING INDEX calls_user_deck_pair_time_idx (user_id=? AND deck_id=? AND target_type_id=? AND aspect=? AND called_at>? AND called_at<?)')
    expect(p).not.toMatch(/SCAN c\b/)
  })
})

describe('digest periods', () => {
  // ISO 8601 week numbering (from memory: 2020 has 53 weeks; 2024-01-01 is a Monday, week 1).
  it('names the ISO week before now', () => {
    expect(digestWeek(Date.UTC(2024, 2, 4, 7))).toEqual({ weekStart: Date.UTC(2024, 1, 26), weekEnd: Date.UTC(2024, 2, 4), period: '2024-W09' })
    expect(digestWeek(Date.UTC(2021, 0, 4, 7)).period).toBe('2020-W53')
    expect(digestWeek(Date.UTC(2024, 0, 8, 0)).period).toBe('2024-W01')
    // A Sunday belongs to the week that started the Monday before.
    expect(digestWeek(Date.UTC(2024, 2, 10, 23)).weekEnd).toBe(Date.UTC(2024, 2, 4))
    expect(digestDay(Date.UTC(2024, 2, 4, 23, 59))).toBe('2024-03-04')
  })
})
