// Several weeks of invented call history for the demo trainees (owned by the watch work): the
// real watch code (issueWatch → planWatch → buildWatchQueue/planSighting, callSighting →
// gradeCall/reviewTrack) run over simulated days by simulated trainees of varied skill.
// Idempotent: a trainee who already has calls is left alone. Needs the demo decks (seedDecks).
import { randomBytes } from 'node:crypto'
import type { GlintDb } from '../database/client'
import { seededRng, seedFromString } from '../core/watch/rng'
import type { Rng } from '../core/watch/rng'
import { callSighting } from '../domain/calls'
import { issueWatch } from '../domain/watches'
import type { IssuedSighting } from '../../shared/types/watch'
import type { SeedContext } from './decks'

export const HISTORY_DAYS = 35
const DAY_MS = 86_400_000

interface Profile {
  // chance of a right call on a track that has been called before, and on a new one
  accuracy: number
  // median latency of a call in ms (log-normal spread)
  medianMs: number
  // chance of drilling on a given day
  diligence: number
  // days ago the trainee last drilled (0: still drilling)
  stoppedDaysAgo?: number
  // accuracy lost per day over the last two weeks
  slipPerDay?: number
}

// Invented profiles, by the demo trainee's place in the list (people.ts).
const PROFILES: Record<string, Profile> = {
  'trainee@glint.demo': { accuracy: 0.86, medianMs: 950, diligence: 0.8 },
  'trainee2@glint.demo': { accuracy: 0.95, medianMs: 620, diligence: 0.95 },
  'trainee3@glint.demo': { accuracy: 0.9, medianMs: 900, diligence: 0.85, slipPerDay: 0.02 },
  'trainee4@glint.demo': { accuracy: 0.84, medianMs: 1100, diligence: 0.85, stoppedDaysAgo: 10 },
  'trainee5@glint.demo': { accuracy: 0.93, medianMs: 700, diligence: 0.9 },
  'trainee6@glint.demo': { accuracy: 0.8, medianMs: 1250, diligence: 0.7 },
  'trainee7@glint.demo': { accuracy: 0.72, medianMs: 1500, diligence: 0.75 },
  'trainee8@glint.demo': { accuracy: 0.88, medianMs: 850, diligence: 0.5 },
}

// A log-normal latency around the median (reaction times are right-skewed; common practice, no source).
function latency(rng: Rng, medianMs: number): number {
  const u = Math.max(1e-9, rng())
  const v = rng()
  const z = Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v)
  return Math.round(Math.min(9000, Math.max(180, medianMs * Math.exp(0.35 * z))))
}

export async function seedHistory(db: GlintDb, _ctx: SeedContext) {
  const sqlite = db.$client
  const trainees = sqlite.prepare(`SELECT u.id, u.email FROM users u JOIN user_roles r ON r.user_id = u.id
    WHERE r.role = 'trainee' AND u.email LIKE '%@glint.demo' ORDER BY u.email`).all() as { id: string, email: string }[]
  const decksOf = sqlite.prepare(`SELECT DISTINCT d.id FROM decks d JOIN deck_crews dc ON dc.deck_id = d.id
    JOIN memberships m ON m.crew_id = dc.crew_id JOIN users o ON o.id = d.owner_id
    WHERE m.user_id = ? AND d.status = 'published' AND o.email = 'instructor@glint.demo' ORDER BY d.title`)
  const hasCalls = sqlite.prepare('SELECT 1 FROM calls WHERE user_id = ? LIMIT 1')
  const today = Math.floor(Date.now() / DAY_MS) * DAY_MS
  let created = 0

  for (const person of trainees) {
    const profile = PROFILES[person.email]
    if (!profile || hasCalls.get(person.id)) continue
    const decks = (decksOf.all(person.id) as { id: string }[]).map(d => d.id)
    if (!decks.length) continue
    const rng = seededRng(seedFromString(person.email))
    const random = { rng, randomBytes: (n: number) => randomBytes(n) }
    sqlite.transaction(() => {
      for (let daysAgo = HISTORY_DAYS; daysAgo >= 1; daysAgo--) {
        if (profile.stoppedDaysAgo && daysAgo < profile.stoppedDaysAgo) break
        if (rng() > profile.diligence) continue
        const slip = profile.slipPerDay && daysAgo < 14 ? (14 - daysAgo) * profile.slipPerDay : 0
        // Start between 07:00 and 19:00 UTC; a watch takes about four seconds a sighting.
        let clock = today - daysAgo * DAY_MS + (7 + rng() * 12) * 3_600_000
        for (const deckId of decks) {
          const watch = issueWatch(sqlite, person.id, deckId, clock, random)
          const queue: IssuedSighting[] = watch.sightings.filter(s => !s.called)
          for (let i = 0; i < queue.length; i++) {
            const s = queue[i]!
            clock += 2500 + rng() * 3000
            const p = Math.max(0.3, (s.untilCall ? profile.accuracy - 0.12 : profile.accuracy) - slip)
            const right = rng() < p
            const answer = watch.id ? answerChoiceOf(sqlite, s.id) : null
            const others = s.choices.filter(c => c.id !== answer)
            const choiceId = right || !others.length ? answer : others[Math.floor(rng() * others.length)]!.id
            const ms = latency(rng, (s.untilCall ? 1.35 : 1) * profile.medianMs * (1 + slip))
            const result = callSighting(sqlite, person.id, s.id, {
              choiceId, latencyMs: ms, framesShown: Math.round(Math.min(s.exposureMs, ms) / 16.7), frameIntervalMs: 16.7, calledAt: clock,
            }, clock + 200, random)
            created++
            for (const re of result.appended ?? []) queue.splice(Math.min(queue.length, i + 4), 0, re)
          }
          clock += 60_000
        }
      }
    })()
  }
  return { created }
}

function answerChoiceOf(sqlite: GlintDb['$client'], sightingId: string): string {
  return (sqlite.prepare('SELECT answer_choice_id AS a FROM sightings WHERE id = ?').get(sightingId) as { a: string }).a
}
