// The learning benchmark's simulation: the same simulated people, deck and daily budget of
// sightings under each schedule. Glint's own schedule runs its real pure code (the watch
// queue with its introductions, re-shows, practice watches, latency grades, FSRS through
// ts-fsrs); the learner (learner.ts) knows nothing of it.
import { buildPracticeQueue, buildWatchQueue, insertReshow, placeIntroductions, PRACTICE_SIZE } from '../../../server/core/watch/queue'
import { newTrackState, reviewTrack } from '../../../server/core/scheduling/fsrs'
import type { TrackState } from '../../../server/core/scheduling/fsrs'
import { readiness } from '../../../server/core/reports/readiness'
import type { ReadinessStandard } from '../../../server/core/reports/readiness'
import type { CallRecord } from '../../../server/core/reports/crew-stats'
import { gradeCall } from '../../../shared/utils/grade'
import type { CallGrade } from '../../../shared/utils/grade'
import { exposureFor } from '../../../shared/utils/exposure'
import { seededRng } from '../../../server/core/watch/rng'
import { Learner, latencyOfS, recallOf } from './learner'
import type { LearnerParams, Rng } from './learner'

const DAY_MS = 86_400_000

export const POLICIES = ['glint', 'selfRated', 'selfRatedNoisy', 'leitner', 'rotation'] as const
export type Policy = typeof POLICIES[number]

export interface DeckSetup {
  types: number
  aspects: readonly string[]
  // the demo decks' settings (schema defaults): hesitation limit, window, recall target, introductions a day
  hesitationMs: number
  windowMs: number
  retention: number
  newPerDay: number
  // choices offered on a sighting (the right one and distractors)
  choices: number
}

export const DEMO_DECK: Readonly<DeckSetup> = Object.freeze({
  types: 10, aspects: ['beam', 'plan', 'head-on'], hesitationMs: 1500, windowMs: 5000, retention: 0.9, newPerDay: 10, choices: 4,
})

export interface RunSetup {
  deck: DeckSetup
  // sightings a day for every schedule (introductions and re-shows included)
  budget: number
  // the longest a person trains before giving up
  maxDays: number
  // days from the end of training to the retention test
  testAfterDays: number
  standard: ReadinessStandard
}

export interface PersonOutcome {
  ready: boolean
  // sightings (introductions included) and days until the first day ending ready; maxDays' totals when never ready
  sightings: number
  days: number
  // mean recall probability over the deck's items and median latency of their retrieval, testAfterDays after training stopped
  recall30: number
  medianLatency30Ms: number
}

export interface Person {
  seed: number
  params: LearnerParams
  personBeta: number
  itemBeta: number[]
}

/** A normal deviate by Box-Muller from two uniforms. */
function normal(rng: Rng): number {
  const u = Math.max(1e-12, rng())
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng())
}

// design value: the spread of a person's and an item's additive activation (the papers fit one β
// per participant and per item; the spread here is not theirs)
const BETA_SD = 0.2

export function makePeople(count: number, params: LearnerParams, items: number, seed: number): Person[] {
  const rng = seededRng(seed)
  return Array.from({ length: count }, (_, i) => ({
    seed: (seed * 7919 + i * 104729) >>> 0,
    params,
    personBeta: BETA_SD * normal(rng),
    itemBeta: Array.from({ length: items }, () => BETA_SD * normal(rng)),
  }))
}

export interface Item {
  index: number
  type: number
  aspect: string
}

export function deckItems(deck: DeckSetup): Item[] {
  const out: Item[] = []
  for (let type = 0; type < deck.types; type++) {
    for (const aspect of deck.aspects) out.push({ index: out.length, type, aspect })
  }
  return out
}

// Look-alike types come in pairs (0 and 1, 2 and 3, ...); an item's look-alike is its twin type at the same aspect.
export function lookalikes(deck: DeckSetup, items: readonly Item[]): number[] {
  return items.map((it) => {
    const twin = it.type ^ 1
    return twin < deck.types ? items.find(o => o.type === twin && o.aspect === it.aspect)!.index : -1
  })
}

// The choices of a sighting, as Glint offers them: the look-alike first, then other types of the same aspect at random.
export function choicesFor(item: Item, items: readonly Item[], look: readonly number[], deck: DeckSetup, rng: Rng): number[] {
  const out = [item.index]
  if (look[item.index]! >= 0) out.push(look[item.index]!)
  const others = items.filter(o => o.aspect === item.aspect && !out.includes(o.index))
  while (out.length < deck.choices && others.length) out.push(others.splice(Math.floor(rng() * others.length), 1)[0]!.index)
  for (let i = out.length - 1; i > 0; i--) {
    const j = Math.floor(rng() * (i + 1))
    ;[out[i], out[j]] = [out[j]!, out[i]!]
  }
  return out
}

type RateFn = (grade: CallGrade, correct: boolean, rng: Rng) => CallGrade

// The rating each FSRS schedule gives a call, written as the grade whose rating it is
// (missed = Again, hesitant = Hard, sure = Good, instant = Easy).
const RATE: Record<'glint' | 'selfRated' | 'selfRatedNoisy', RateFn> = {
  glint: grade => grade,
  selfRated: (_g, correct) => (correct ? 'sure' : 'missed'),
  // design values: a right call rated Hard or Easy 15 % of the time each, a wrong one Hard 10 %
  selfRatedNoisy: (_g, correct, rng) => {
    const u = rng()
    if (correct) return u < 0.15 ? 'hesitant' : u < 0.3 ? 'instant' : 'sure'
    return u < 0.1 ? 'hesitant' : 'missed'
  },
}

// Leitner's boxes: a right call moves an item up one box, a wrong one back to the first;
// box k comes back after 2^(k−1) days (common practice, no source).
const LEITNER_DAYS = [0, 1, 2, 4, 8, 16]

// A sighting's time on the phone: the call, then a 2 s reveal and the next image (design value).
export const REVEAL_MS = 2000
export const INTRODUCTION_MS = 4000
const MAX_RESHOWS = 2

// Every schedule spends the same budget: what its own rule leaves free is filled, for the FSRS
// schedules with practice watches as the server issues them when nothing is due (buildPracticeQueue:
// lowest retrievability and the worst-confused types in turn, PRACTICE_SIZE a watch), for Leitner's
// boxes with the lowest boxes first (the boxes' own priority), the rotation by going on round.
// The server's watch holds at most 30 sightings (WATCH_MAX_SIGHTINGS in server/core/watch/plan.ts).
const WATCH_MAX_SIGHTINGS = 30

/** Type ids of the person's confused pairs, the most frequent pair first, both sides (as the server ranks a crew's). */
function worstConfusedTypes(calls: readonly CallRecord[]): string[] {
  const pairs = new Map<string, { a: string, b: string, n: number }>()
  for (const c of calls) {
    if (!c.calledTypeId || c.calledTypeId === c.targetTypeId) continue
    const key = `${c.targetTypeId}|${c.calledTypeId}`
    const pair = pairs.get(key) ?? { a: c.targetTypeId, b: c.calledTypeId, n: 0 }
    pair.n++
    pairs.set(key, pair)
  }
  const sorted = [...pairs.values()].sort((x, y) => y.n - x.n || (x.a + x.b < y.a + y.b ? -1 : 1))
  return [...new Set(sorted.flatMap(p => [p.a, p.b]))]
}

/** Runs one person under one schedule. */
export function runPerson(person: Person, policy: Policy, setup: RunSetup): PersonOutcome {
  const { deck, budget, maxDays, standard } = setup
  const items = deckItems(deck)
  const look = lookalikes(deck, items)
  const rng = seededRng(person.seed)
  const choiceRng = seededRng(person.seed ^ 0x9E3779B9)
  const learner = new Learner({ params: person.params, items: items.length, lookalike: look, rng, personBeta: person.personBeta, itemBeta: person.itemBeta })
  const start = Date.UTC(2026, 0, 5)
  const tracks: TrackState[] = items.map(() => newTrackState(start))
  const introduced = new Array<boolean>(items.length).fill(false)
  const box = new Array<number>(items.length).fill(0)
  const boxDay = new Array<number>(items.length).fill(0)
  let rotation = 0
  const calls: CallRecord[] = []
  const trackKeys = deck.types ? items.map(it => ({ targetTypeId: String(it.type), aspect: it.aspect })) : []
  let sightings = 0
  let clock = start

  for (let day = 0; day < maxDays; day++) {
    clock = Math.max(clock, start + day * DAY_MS + 9 * 3_600_000)
    let used = 0
    const sight = (index: number): boolean => {
      const item = items[index]!
      if (!introduced[index]) {
        // Leitner's boxes and the rotation show a new item just before its first call
        introduce(index)
        if (used >= budget) return false
      }
      // the exposure ladder decides how long the image shows; the learner has no term for it
      exposureFor({ reps: tracks[index]!.reps, stability: tracks[index]!.stability })
      const response = learner.respond(index, choicesFor(item, items, look, deck, choiceRng), clock / 1000)
      const correct = response.choice === index
      const latencyMs = Math.min(response.latencyMs, 60_000)
      const { grade, anticipation } = gradeCall({ correct, latencyMs: latencyMs > deck.windowMs ? null : latencyMs, hesitationMs: deck.hesitationMs, windowMs: deck.windowMs })
      calls.push({ correct, grade, latencyMs, calledAt: clock, aspect: item.aspect, condition: 'clear', targetTypeId: String(item.type), calledTypeId: String(items[response.choice]!.type), anticipation })
      clock += latencyMs
      learner.see(index, clock / 1000)
      clock += REVEAL_MS
      used++
      if (policy === 'glint' || policy === 'selfRated' || policy === 'selfRatedNoisy') {
        const rated = RATE[policy](grade, correct && grade !== 'missed', rng)
        tracks[index] = reviewTrack(tracks[index]!, rated, clock, { retention: deck.retention }).after
        return rated === 'missed'
      }
      if (policy === 'leitner') {
        box[index] = correct && grade !== 'missed' ? Math.min(5, box[index]! + 1) : 1
        boxDay[index] = day
        return box[index] === 1
      }
      tracks[index] = { ...tracks[index]!, reps: tracks[index]!.reps + 1 }
      return false
    }

    const introduce = (index: number) => {
      learner.see(index, clock / 1000)
      introduced[index] = true
      used++
      clock += INTRODUCTION_MS
    }
    // one watch: its sightings in order, a missed one re-shown (at most MAX_RESHOWS times, after at
    // least RESHOW_GAP others: insertReshow); introductions before the sighting the server puts them before
    const runQueue = (start: readonly string[], introBefore = new Map<number, number[]>()) => {
      let queue = start.slice()
      const reshows = new Map<string, number>()
      for (let i = 0; i < queue.length && used < budget; i++) {
        for (const t of introBefore.get(i) ?? []) {
          if (!introduced[t] && used < budget) introduce(t)
        }
        if (used >= budget) break
        const id = queue[i]!
        const again = sight(Number(id))
        if (again && (reshows.get(id) ?? 0) < MAX_RESHOWS) {
          reshows.set(id, (reshows.get(id) ?? 0) + 1)
          queue = insertReshow(queue, id, i, x => String(items[Number(x)]!.type))
          // introductions keep their sighting: those after the re-show's place move one on
          const placed = queue.indexOf(id, i + 1)
          const shifted = new Map<number, number[]>()
          for (const [pos, ts] of introBefore) shifted.set(pos >= placed ? pos + 1 : pos, ts)
          introBefore = shifted
        }
      }
    }
    if (policy === 'rotation') {
      while (used < budget) {
        sight(rotation % items.length)
        rotation++
      }
    }
    else if (policy === 'leitner') {
      const due = items.filter(it => box[it.index]! > 0 && day - boxDay[it.index]! >= LEITNER_DAYS[box[it.index]!]!)
        .sort((x, y) => box[x.index]! - box[y.index]! || x.index - y.index)
      const fresh = items.filter(it => box[it.index] === 0).slice(0, deck.newPerDay)
      let queue = [...due, ...fresh].map(it => String(it.index))
      if (queue.length < budget) {
        const taken = new Set(queue)
        queue = [...queue, ...items.filter(it => box[it.index]! > 0 && !taken.has(String(it.index)))
          .sort((x, y) => box[x.index]! - box[y.index]! || boxDay[x.index]! - boxDay[y.index]! || x.index - y.index)
          .slice(0, budget - queue.length).map(it => String(it.index))]
      }
      runQueue(queue)
    }
    else {
      // the day's watch (due first, then new tracks, each introduced before its first sighting) ...
      const queueTracks = () => items.map(it => ({ id: String(it.index), targetTypeId: String(it.type), aspect: it.aspect, state: tracks[it.index]! }))
      const queue = buildWatchQueue({
        tracks: queueTracks(),
        nowMs: clock,
        retention: deck.retention,
        newPerDay: deck.newPerDay,
        newIntroducedToday: 0,
        maxSightings: Math.min(WATCH_MAX_SIGHTINGS, budget),
      })
      const plan = placeIntroductions(queue, new Set(queue.filter(id => !introduced[Number(id)])))
      // introductions shown where the server places them: before the k-th sighting of the queue
      const introBefore = new Map<number, number[]>()
      let k = 0
      for (const item of plan) {
        if (item.kind === 'sighting') k++
        else introBefore.set(k, [...(introBefore.get(k) ?? []), Number(item.trackId)])
      }
      runQueue(queue, introBefore)
      // ... then practice watches while the day's budget lasts (product.md: with nothing due, practice)
      while (used < budget) {
        const practice = buildPracticeQueue({ tracks: queueTracks(), nowMs: clock, confusedTypeIds: worstConfusedTypes(calls), size: Math.min(PRACTICE_SIZE, budget - used) })
        if (!practice.length) break
        runQueue(practice)
      }
    }
    sightings += used
    clock += 60_000
    // readiness reads only the standard's window: older calls can go
    const from = clock - standard.windowDays * DAY_MS
    let keep = 0
    while (keep < calls.length && calls[keep]!.calledAt < from) keep++
    if (keep) calls.splice(0, keep)
    const r = readiness({ calls, trackKeys, standard, hesitationMs: deck.hesitationMs, nowMs: clock })
    if (r.ready) return { ready: true, sightings, days: day + 1, ...retentionTest(learner, items.length, clock, setup) }
  }
  return { ready: false, sightings, days: maxDays, ...retentionTest(learner, items.length, clock, setup) }
}

export function retentionTest(learner: Learner, count: number, endMs: number, setup: RunSetup) {
  const at = (endMs + setup.testAfterDays * DAY_MS) / 1000
  let recall = 0
  const latencies: number[] = []
  for (let i = 0; i < count; i++) {
    const a = learner.activation(i, at)
    recall += recallOf(a, learner.params)
    latencies.push(1000 * latencyOfS(a, learner.params))
  }
  latencies.sort((x, y) => x - y)
  const mid = latencies.length >> 1
  const median = latencies.length % 2 ? latencies[mid]! : (latencies[mid - 1]! + latencies[mid]!) / 2
  return { recall30: recall / count, medianLatency30Ms: median }
}
