// A crew of fresh people with a deck and a known set of calls, written straight into the test
// database (the running server reads the same SQLite file), for the crew table, person page,
// confusion and digest tests. Every figure a test checks is derived from the calls listed here.
import { randomBytes } from 'node:crypto'
import Database from 'better-sqlite3'
import { inject } from 'vitest'
import { freshPerson, signedIn } from './client'
import type { Client } from './client'

export const DAY = 86_400_000
export const HESITATION_MS = 1500
export const TYPE_NAMES = ['Fixture Gannet', 'Fixture Petrel', 'Fixture Skua'] as const
export const ASPECTS = ['beam', 'head-on'] as const

export interface FixtureCall {
  userId: string
  targetTypeId: string
  calledTypeId: string | null
  aspect: string
  condition: string
  correct: boolean
  grade: 'missed' | 'hesitant' | 'sure' | 'instant'
  latencyMs: number | null
  calledAt: number
}

export interface Person { id: string, email: string, password: string, client: Client }

export interface StatsFixture {
  crewId: string
  crewName: string
  deckId: string
  typeIds: string[]
  lead: Person
  instructor: Person
  // T90: 18 of 20 right; T89: 17 of 19; TMED: median exactly the limit; TSLOW: median 1 ms over it
  trainees: { t90: Person, t89: Person, tmed: Person, tslow: Person }
  calls: FixtureCall[]
  nowMs: number
}

const id = () => randomBytes(16).toString('base64url')

function gradeOf(correct: boolean, latencyMs: number | null): FixtureCall['grade'] {
  if (!correct || latencyMs === null) return 'missed'
  return latencyMs <= HESITATION_MS / 2 ? 'instant' : latencyMs <= HESITATION_MS ? 'sure' : 'hesitant'
}

/**
 * Call i of a person is of type i % 3 and aspect floor(i / 3) % 2, so 20 or more calls cover every
 * (type, aspect) pair at least three times. `wrong` maps a call index to what was called instead.
 */
function series(userId: string, typeIds: string[], latencies: number[], wrong: Record<number, number | null>, endMs: number): FixtureCall[] {
  return latencies.map((latencyMs, i) => {
    const truth = typeIds[i % 3]!
    const isWrong = i in wrong
    const called = isWrong ? (wrong[i] === null ? null : typeIds[wrong[i]!]!) : truth
    return {
      userId,
      targetTypeId: truth,
      calledTypeId: called,
      aspect: ASPECTS[Math.floor(i / 3) % 2]!,
      condition: i % 2 ? 'sunlit' : 'haze',
      correct: !isWrong,
      grade: gradeOf(!isWrong, called === null ? null : latencyMs),
      latencyMs: called === null ? null : latencyMs,
      // spread over the last ten days, one call an hour apart within each day
      calledAt: endMs - (1 + (i % 10)) * DAY + Math.floor(i / 10) * 3_600_000,
    }
  })
}

export async function createStatsFixture(): Promise<StatsFixture> {
  const admin = await signedIn('admin@glint.demo')
  const crewName = `Fixture Station ${Date.now().toString(36)}`
  const crew = await admin.post('/api/crews', { name: crewName })
  if (crew.status !== 201 && crew.status !== 200) throw new Error(`crew: ${crew.status} ${crew.text}`)
  const crewId = crew.body.id as string
  const lead = await freshPerson('lead', crewId)
  const instructor = await freshPerson('instructor', crewId)
  const t90 = await freshPerson('trainee', crewId)
  const t89 = await freshPerson('trainee', crewId)
  const tmed = await freshPerson('trainee', crewId)
  const tslow = await freshPerson('trainee', crewId)
  const nowMs = Date.now()

  const db = new Database(inject('dbPath'))
  db.pragma('busy_timeout = 5000')
  const deckId = id()
  const typeIds = TYPE_NAMES.map(() => id())
  // 20 calls: latencies 700..1650 in 50 ms steps; wrong: #0 Gannet called Petrel, #1 Petrel called Skua.
  const lat20 = Array.from({ length: 20 }, (_, i) => 700 + 50 * i)
  // 19 calls; wrong: #0 Gannet called Petrel, #3 Gannet with no call in time.
  const lat19 = Array.from({ length: 19 }, (_, i) => 800 + 40 * i)
  // 21 right calls: ten under the limit, one at it, ten over: the median is the 11th, exactly 1500 ms.
  const medAt = [...Array.from({ length: 10 }, (_, i) => 1000 + 40 * i), 1500, ...Array.from({ length: 10 }, (_, i) => 1600 + 40 * i)]
  const medOver = medAt.map(x => (x === 1500 ? 1501 : x))
  const calls = [
    ...series(t90.id, typeIds, lat20, { 0: 1, 1: 2 }, nowMs),
    ...series(t89.id, typeIds, lat19, { 0: 1, 3: null }, nowMs),
    ...series(tmed.id, typeIds, medAt, {}, nowMs),
    ...series(tslow.id, typeIds, medOver, {}, nowMs),
    // T90's older calls, 20 days ago: inside the 30-day trend, outside the 14-day standard and the 7-day trend.
    ...series(t90.id, typeIds, [900, 1100, 1300], {}, nowMs - 19 * DAY),
  ]

  db.transaction(() => {
    db.prepare('INSERT INTO decks (id, title, category, owner_id, status, hesitation_ms) VALUES (?, ?, ?, ?, ?, ?)')
      .run(deckId, `Fixture deck ${crewName}`, 'aircraft', instructor.id, 'published', HESITATION_MS)
    db.prepare('INSERT INTO deck_crews (deck_id, crew_id) VALUES (?, ?)').run(deckId, crewId)
    const type = db.prepare('INSERT INTO target_types (id, deck_id, name, category, affiliation, size_m, features) VALUES (?, ?, ?, ?, ?, ?, ?)')
    const view = db.prepare('INSERT INTO views (id, target_type_id, aspect, source_sha, width, height) VALUES (?, ?, ?, ?, ?, ?)')
    typeIds.forEach((t, i) => {
      type.run(t, deckId, TYPE_NAMES[i], 'aircraft', 'neutral', 18 + i, '{}')
      for (const a of ASPECTS) view.run(id(), t, a, 'fixture', 64, 64)
    })
    const watch = db.prepare('INSERT INTO watches (id, user_id, deck_id, day, status) VALUES (?, ?, ?, ?, ?)')
    const sighting = db.prepare(`INSERT INTO sightings (id, watch_id, user_id, target_type_id, position, aspect, condition, range_m, apparent_px,
      exposure_ms, window_ms, choices, answer_choice_id, issued_at) VALUES (?, ?, ?, ?, ?, ?, ?, 2000, 40, 1000, 5000, '[]', 'x', ?)`)
    const call = db.prepare(`INSERT INTO calls (id, sighting_id, user_id, deck_id, target_type_id, called_type_id, aspect, condition, correct, grade,
      anticipation, latency_ms, called_at, received_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 0, ?, ?, ?)`)
    const watches = new Map<string, string>()
    calls.forEach((c, i) => {
      let w = watches.get(c.userId)
      if (!w) {
        w = id()
        watch.run(w, c.userId, deckId, new Date(nowMs).toISOString().slice(0, 10), 'closed')
        watches.set(c.userId, w)
      }
      const s = id()
      sighting.run(s, w, c.userId, c.targetTypeId, i, c.aspect, c.condition, c.calledAt - 2000)
      call.run(id(), s, c.userId, deckId, c.targetTypeId, c.calledTypeId, c.aspect, c.condition, c.correct ? 1 : 0, c.grade, c.latencyMs, c.calledAt, c.calledAt + 100)
    })
    // T90: two of six tracks due (one a day ago, one now), four later; a tap baseline.
    const track = db.prepare('INSERT INTO tracks (id, user_id, deck_id, target_type_id, aspect, due) VALUES (?, ?, ?, ?, ?, ?)')
    let k = 0
    for (const t of typeIds) {
      for (const a of ASPECTS) {
        track.run(id(), t90.id, deckId, t, a, k < 2 ? nowMs - DAY * (1 - k) : nowMs + 3 * DAY)
        k++
      }
    }
    db.prepare('INSERT INTO tap_baselines (id, user_id, simple_ms, choice_ms, trials, created_at) VALUES (?, ?, ?, ?, ?, ?)')
      .run(id(), t90.id, 260, 420, 20, nowMs - 5 * DAY)
  })()
  db.close()
  return { crewId, crewName, deckId, typeIds, lead, instructor, trainees: { t90, t89, tmed, tslow }, calls, nowMs }
}

/** Extra calls written into the test database (for a week with fixed times). */
export function insertCalls(deckId: string, calls: FixtureCall[]) {
  const db = new Database(inject('dbPath'))
  db.pragma('busy_timeout = 5000')
  db.transaction(() => {
    const watch = id()
    const user = calls[0]!.userId
    db.prepare('INSERT INTO watches (id, user_id, deck_id, day, status) VALUES (?, ?, ?, ?, ?)').run(watch, user, deckId, '2000-01-01', 'closed')
    const sighting = db.prepare(`INSERT INTO sightings (id, watch_id, user_id, target_type_id, position, aspect, condition, range_m, apparent_px,
      exposure_ms, window_ms, choices, answer_choice_id, issued_at) VALUES (?, ?, ?, ?, ?, ?, ?, 2000, 40, 1000, 5000, '[]', 'x', ?)`)
    const call = db.prepare(`INSERT INTO calls (id, sighting_id, user_id, deck_id, target_type_id, called_type_id, aspect, condition, correct, grade,
      anticipation, latency_ms, called_at, received_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 0, ?, ?, ?)`)
    calls.forEach((c, i) => {
      const s = id()
      sighting.run(s, watch, c.userId, c.targetTypeId, i, c.aspect, c.condition, c.calledAt - 2000)
      call.run(id(), s, c.userId, deckId, c.targetTypeId, c.calledTypeId, c.aspect, c.condition, c.correct ? 1 : 0, c.grade, c.latencyMs, c.calledAt, c.calledAt + 100)
    })
  })()
  db.close()
}

export { series as fixtureSeries }
