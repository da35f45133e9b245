// What the learning benchmark's goal asks of any schedule: sightings to ready against recall at 30
// days for simple schedules and for "oracles" that read the simulated learner's own recall
// probability (no server can: they bound what a schedule could reach on this learner, standard and
// budget). Same people, deck, timings, readiness and retention test as learning.bench.ts's papers'
// population; the oracles pick only which track to call, the learner and its parameters are as ever.
// npx tsx tests/bench/learning/frontier.ts [--people N]
import { DEFAULT_STANDARD, readiness } from '../../../server/core/reports/readiness'
import type { CallRecord } from '../../../server/core/reports/crew-stats'
import { gradeCall } from '../../../shared/utils/grade'
import { seededRng } from '../../../server/core/watch/rng'
import { Learner, PAPER_PARAMS } from './learner'
import { choicesFor, deckItems, DEMO_DECK, INTRODUCTION_MS, lookalikes, makePeople, retentionTest, REVEAL_MS, runPerson } from './simulate'
import type { Person, PersonOutcome, Policy, RunSetup } from './simulate'

const DAY_MS = 86_400_000
const args = process.argv.slice(2)
const people = Number(args[args.indexOf('--people') + 1]) || 100
// the benchmark's setup (learning.bench.ts): 40 sightings a day, 60 days, the default standard
const SETUP: RunSetup = { deck: DEMO_DECK, budget: 40, maxDays: 60, testAfterDays: 30, standard: { ...DEFAULT_STANDARD } }

interface Day {
  day: number
  // tracks introduced so far, and those introduced today
  known: number[]
  fresh: number[]
  learner: Learner
  nowS: () => number
  // calls of each track in the last `days` days
  callsSince: (days: number) => Map<number, number>
  call: (index: number) => void
  left: () => number
  // the schedule's own notes on this person, kept from day to day
  memo: Map<string, number>
}

interface Schedule {
  name: string
  // sightings a day (at most the benchmark's budget) and introductions a day
  budget: number | ((day: number) => number)
  newPerDay: number
  plan: (d: Day) => void
}

/** One person under a schedule: introductions first each day, then the schedule's calls. */
function runOne(person: Person, schedule: Schedule): PersonOutcome {
  const { deck, maxDays, standard } = SETUP
  const items = deckItems(deck)
  const look = lookalikes(deck, items)
  const rng = seededRng(person.seed)
  const choiceRng = seededRng(person.seed ^ 0x9E3779B9)
  const learner = new Learner({ params: person.params, items: items.length, lookalike: look, rng, personBeta: person.personBeta, itemBeta: person.itemBeta })
  const trackKeys = items.map(it => ({ targetTypeId: String(it.type), aspect: it.aspect }))
  const start = Date.UTC(2026, 0, 5)
  const calls: CallRecord[] = []
  const callIndex: number[] = []
  const memo = new Map<string, number>()
  let introduced = 0
  let sightings = 0
  let clock = start
  for (let day = 0; day < maxDays; day++) {
    clock = Math.max(clock, start + day * DAY_MS + 9 * 3_600_000)
    let used = 0
    const fresh: number[] = []
    while (introduced < items.length && fresh.length < schedule.newPerDay) {
      learner.see(introduced, clock / 1000)
      fresh.push(introduced++)
      clock += INTRODUCTION_MS
      used++
    }
    const call = (index: number) => {
      const item = items[index]!
      const response = learner.respond(index, choicesFor(item, items, look, deck, choiceRng), clock / 1000)
      const correct = response.choice === index
      const latencyMs = Math.min(response.latencyMs, 60_000)
      const { grade, anticipation } = gradeCall({ correct, latencyMs: latencyMs > deck.windowMs ? null : latencyMs, hesitationMs: deck.hesitationMs, windowMs: deck.windowMs })
      calls.push({ correct, grade, latencyMs, calledAt: clock, aspect: item.aspect, condition: 'clear', targetTypeId: String(item.type), calledTypeId: String(items[response.choice]!.type), anticipation })
      callIndex.push(index)
      clock += latencyMs
      learner.see(index, clock / 1000)
      clock += REVEAL_MS
      used++
    }
    const callsSince = (days: number) => {
      const counts = new Map<number, number>()
      const from = clock - days * DAY_MS
      calls.forEach((c, k) => {
        if (c.calledAt >= from) counts.set(callIndex[k]!, (counts.get(callIndex[k]!) ?? 0) + 1)
      })
      return counts
    }
    schedule.plan({
      day, known: Array.from({ length: introduced }, (_, i) => i), fresh, learner, nowS: () => clock / 1000,
      callsSince, call, memo, left: () => (typeof schedule.budget === 'number' ? schedule.budget : schedule.budget(day)) - used,
    })
    sightings += used
    clock += 60_000
    const r = readiness({ calls, trackKeys, standard, hesitationMs: deck.hesitationMs, nowMs: clock })
    if (r.ready) return { ready: true, sightings, days: day + 1, ...retentionTest(learner, items.length, clock, SETUP) }
  }
  return { ready: false, sightings, days: maxDays, ...retentionTest(learner, items.length, clock, SETUP) }
}

/** Knows nothing: the day's new tracks and every P-th known track, in turn until the budget is spent. */
function block(p: number): Schedule {
  return {
    name: `block rotation, 1/${p} of the deck a day`, budget: SETUP.budget, newPerDay: DEMO_DECK.newPerDay,
    plan: (d) => {
      const group = d.known.filter(i => d.fresh.includes(i) || i % p === d.day % p)
      for (let k = 0; d.left() > 0 && group.length; k++) d.call(group[k % group.length]!)
    },
  }
}

/**
 * Oracle: first every track short of the standard's calls in the window (less two days' margin), then
 * the track whose recall probability now is nearest `learn` for the share `share` of the day's picks
 * and nearest `pad` for the rest (never the same track twice in a row).
 */
function oracle(learn: number, share: number, pad: number, budget: number, newPerDay: number): Schedule {
  const name = share >= 1
    ? `oracle: recall nearest ${learn}`
    : `oracle: ${Math.round(share * 100)} % nearest ${learn}, the rest nearest ${pad}`
  return {
    name: `${name}; ${budget} a day, ${newPerDay} new a day`, budget, newPerDay,
    plan: (d) => {
      const counts = d.callsSince(SETUP.standard.windowDays - 2)
      let last = -1
      for (const i of d.known) {
        if ((counts.get(i) ?? 0) < SETUP.standard.minCallsPerTrack && d.left() > 0) {
          d.call(i)
          last = i
        }
      }
      for (let k = 0; d.left() > 0; k++) {
        const target = (k % 10) < share * 10 ? learn : pad
        let best = -1
        let gap = Infinity
        for (const i of d.known) {
          if (i === last) continue
          const g = Math.abs(d.learner.recallProbability(i, d.nowS()) - target)
          if (g < gap) {
            gap = g
            best = i
          }
        }
        if (best < 0) break
        d.call(best)
        last = best
      }
    },
  }
}

/** Knows nothing: every known track in turn, `budget` a day. */
function rotation(budget: number, newPerDay: number): Schedule {
  return {
    name: `rotation, ${budget} a day`, budget, newPerDay,
    plan: (d) => {
      let turn = d.memo.get('turn') ?? 0
      while (d.left() > 0 && d.known.length) d.call(d.known[turn++ % d.known.length]!)
      d.memo.set('turn', turn)
    },
  }
}

/** `first` for `days` days, then `then` (the introductions a day of `then`). */
function twoPhase(days: number, first: Schedule, then: Schedule): Schedule {
  const budgetOf = (s: Schedule, day: number) => (typeof s.budget === 'number' ? s.budget : s.budget(day))
  return {
    name: `${days} days of ${first.name.replace(/, \d+ new a day$/, '')}, then ${then.name.replace(/, \d+ new a day$/, '')}`,
    budget: day => budgetOf(day < days ? first : then, day),
    newPerDay: then.newPerDay,
    plan: d => (d.day < days ? first.plan(d) : then.plan(d)),
  }
}

const SCHEDULES: Schedule[] = [
  block(1), block(2), block(3), block(5),
  oracle(0.6, 1, 0, 40, 10), oracle(0.65, 1, 0, 40, 10), oracle(0.67, 1, 0, 40, 10),
  oracle(0.3, 0.5, 0.97, 40, 30), oracle(0.3, 0.5, 0.97, 20, 30),
  // a fifth of the budget for 40 days (sightings count, days do not), then 40 a day
  twoPhase(40, rotation(8, 30), rotation(40, 30)),
  twoPhase(40, rotation(8, 30), oracle(0.88, 1, 0, 40, 30)),
  twoPhase(40, oracle(0.5, 1, 0, 8, 30), oracle(0.3, 0.3, 0.97, 40, 30)),
  twoPhase(40, oracle(0.5, 1, 0, 8, 30), oracle(0.3, 0.3, 0.97, 30, 30)),
]

const mean = (xs: readonly number[]) => xs.reduce((s, x) => s + x, 0) / xs.length
const crowd = makePeople(people, PAPER_PARAMS, DEMO_DECK.types * DEMO_DECK.aspects.length, 2026)
const row = (name: string, o: PersonOutcome[]) => ({ name, sightings: mean(o.map(x => x.sightings)), days: mean(o.map(x => x.days)), recall30: mean(o.map(x => x.recall30)), ready: mean(o.map(x => (x.ready ? 1 : 0))) })
const reference = Object.fromEntries((['glint', 'selfRated', 'leitner'] as Policy[]).map(p => [p, row(p, crowd.map(person => runPerson(person, p, SETUP)))]))
// issue 18's goal as a corner: at most 75 % of self-rated FSRS's sightings and 60 % of Leitner's, recall no lower than self-rated's
const corner = { sightings: Math.min(0.75 * reference.selfRated!.sightings, 0.6 * reference.leitner!.sightings), recall30: reference.selfRated!.recall30 }
console.log(`papers' population, ${people} people; the goal's corner: at most ${corner.sightings.toFixed(0)} sightings to ready with recall at 30 d at least ${corner.recall30.toFixed(3)}`)
console.log('schedule | ready | sightings to ready | days | recall at 30 d | in the corner')
for (const r of [...Object.values(reference), ...SCHEDULES.map(s => row(s.name, crowd.map(person => runOne(person, s))))]) {
  const inCorner = r.sightings <= corner.sightings && r.recall30 >= corner.recall30
  console.log(`  ${r.name.padEnd(62)} ${r.ready.toFixed(2)} ${r.sightings.toFixed(0).padStart(5)} ${r.days.toFixed(1).padStart(5)} ${r.recall30.toFixed(3)} ${inCorner ? 'yes' : 'no'}`)
}
