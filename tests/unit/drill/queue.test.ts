import { describe, expect, it } from 'vitest'
import { State } from 'ts-fsrs'
import { newTrackState, schedulerFor, toCard } from '../../../server/core/scheduling/fsrs'
import type { TrackState } from '../../../server/core/scheduling/fsrs'
import { buildWatchQueue, insertReshow, spreadByType } from '../../../server/core/watch/queue'
import type { QueueTrack } from '../../../server/core/watch/queue'
import { mulberry32, randomIndex } from '../../../server/core/watch/rng'

const DAY = 86_400_000
const NOW = Date.UTC(2025, 5, 10, 7, 30)

function reviewedState(stability: number, daysAgo: number, dueInDays = 0): TrackState {
  return {
    due: NOW + dueInDays * DAY,
    stability,
    difficulty: 5,
    elapsedDays: 0,
    scheduledDays: daysAgo,
    learningSteps: 0,
    reps: 3,
    lapses: 0,
    state: State.Review,
    lastReview: NOW - daysAgo * DAY,
  }
}

const track = (id: string, targetTypeId: string, state: TrackState): QueueTrack => ({ id, targetTypeId, aspect: 'beam', state })
const noRepeats = (types: string[]) => types.every((t, i) => i === 0 || t !== types[i - 1])

describe('buildWatchQueue (product.md, The drill 2)', () => {
  it('due tracks first, lowest retrievability first, as ts-fsrs get_retrievability ranks them', () => {
    const tracks = [
      track('a', 'T1', reviewedState(30, 20)),
      track('b', 'T2', reviewedState(2, 10)),
      track('c', 'T3', reviewedState(10, 12)),
      track('d', 'T4', reviewedState(5, 5)),
      track('n1', 'T5', newTrackState(NOW)),
    ]
    const queue = buildWatchQueue({ tracks, nowMs: NOW, retention: 0.9, newPerDay: 10, newIntroducedToday: 0 })
    const f = schedulerFor({ retention: 0.9 })
    const byLibrary = tracks.slice(0, 4)
      .map(t => ({ id: t.id, r: f.get_retrievability(toCard(t.state), new Date(NOW), false) }))
      .sort((x, y) => x.r - y.r)
      .map(x => x.id)
    expect(queue).toEqual([...byLibrary, 'n1'])
  })

  it('leaves out tracks not yet due', () => {
    const tracks = [track('due', 'T1', reviewedState(5, 5)), track('later', 'T2', reviewedState(5, 1, 4))]
    expect(buildWatchQueue({ tracks, nowMs: NOW, newPerDay: 10, newIntroducedToday: 0 })).toEqual(['due'])
  })

  it('new tracks only up to the day\'s limit (deck default 10)', () => {
    const tracks = Array.from({ length: 15 }, (_, i) => track(`n${i}`, `T${i}`, newTrackState(NOW)))
    expect(buildWatchQueue({ tracks, nowMs: NOW, newPerDay: 10, newIntroducedToday: 0 })).toHaveLength(10)
    expect(buildWatchQueue({ tracks, nowMs: NOW, newPerDay: 10, newIntroducedToday: 7 })).toHaveLength(3)
    expect(buildWatchQueue({ tracks, nowMs: NOW, newPerDay: 10, newIntroducedToday: 12 })).toHaveLength(0)
  })

  it('maxSightings keeps due tracks before new ones', () => {
    const tracks = [track('n', 'T9', newTrackState(NOW)), track('d1', 'T1', reviewedState(5, 5)), track('d2', 'T2', reviewedState(5, 6))]
    expect(new Set(buildWatchQueue({ tracks, nowMs: NOW, newPerDay: 5, newIntroducedToday: 0, maxSightings: 2 }))).toEqual(new Set(['d1', 'd2']))
  })

  it('property: no target type twice in a row whenever an order allows it (seeded, 400 random sets)', () => {
    const rng = mulberry32(20250610)
    for (let run = 0; run < 400; run++) {
      const typeCount = 1 + randomIndex(rng, 6)
      const n = 1 + randomIndex(rng, 25)
      const tracks: QueueTrack[] = []
      for (let i = 0; i < n; i++) {
        const type = `T${randomIndex(rng, typeCount)}`
        const state = rng() < 0.3 ? newTrackState(NOW) : reviewedState(1 + rng() * 40, randomIndex(rng, 60), rng() < 0.8 ? 0 : 3)
        tracks.push(track(`k${i}`, type, state))
      }
      const newPerDay = randomIndex(rng, 8)
      const queue = buildWatchQueue({ tracks, nowMs: NOW, newPerDay, newIntroducedToday: 0 })
      const byId = new Map(tracks.map(t => [t.id, t]))
      const expectedIds = [
        ...tracks.filter(t => t.state.state !== State.New && t.state.due <= NOW).map(t => t.id),
        ...tracks.filter(t => t.state.state === State.New).slice(0, newPerDay).map(t => t.id),
      ]
      expect(new Set(queue)).toEqual(new Set(expectedIds))
      expect(queue).toHaveLength(expectedIds.length)
      const types = queue.map(id => byId.get(id)!.targetTypeId)
      const counts = new Map<string, number>()
      for (const t of types) counts.set(t, (counts.get(t) ?? 0) + 1)
      // An order with no repeats exists iff no type fills more than ceil(n/2) places (pigeonhole).
      if (Math.max(0, ...counts.values()) <= Math.ceil(types.length / 2)) expect(noRepeats(types)).toBe(true)
    }
  })

  it('a deck with a single target type repeats it: no other order exists', () => {
    const tracks = ['beam', 'head-on', 'plan'].map((aspect, i) => ({ ...track(`s${i}`, 'T1', reviewedState(5, 5 + i)), aspect }))
    expect(buildWatchQueue({ tracks, nowMs: NOW, newPerDay: 0, newIntroducedToday: 0 })).toHaveLength(3)
  })
})

describe('spreadByType', () => {
  it('keeps the priority order when it has no repeats, and moves as little as needed otherwise', () => {
    expect(spreadByType(['A1', 'B1', 'A2', 'C1'], s => s[0]!)).toEqual(['A1', 'B1', 'A2', 'C1'])
    expect(spreadByType(['A1', 'A2', 'B1'], s => s[0]!)).toEqual(['A1', 'B1', 'A2'])
    // greedy earliest-first would strand the As: A B C A A; the look-ahead avoids it
    expect(noRepeats(spreadByType(['A1', 'B1', 'C1', 'A2', 'A3'], s => s[0]!).map(s => s[0]!))).toBe(true)
  })
})

describe('insertReshow (product.md: a missed track comes back after at least three other sightings)', () => {
  const queue = ['q0', 'q1', 'q2', 'q3', 'q4', 'q5', 'q6']

  it('places it after three others', () => {
    const out = insertReshow(queue, 'q1', 1)
    expect(out.indexOf('q1', 2) - 1 - 1).toBeGreaterThanOrEqual(3)
    expect(out).toEqual(['q0', 'q1', 'q2', 'q3', 'q4', 'q1', 'q5', 'q6'])
  })

  it('at the end when fewer remain', () => {
    expect(insertReshow(queue, 'q5', 5)).toEqual([...queue, 'q5'])
    expect(insertReshow(queue, 'q3', 3)).toEqual([...queue, 'q3'])
  })

  it('with types, moves on past a neighbour of the same type', () => {
    const type: Record<string, string> = { q0: 'A', q1: 'B', q2: 'C', q3: 'D', q4: 'B', q5: 'E', q6: 'F' }
    const out = insertReshow(queue, 'q1', 1, id => type[id]!)
    const at = out.lastIndexOf('q1')
    expect(at - 1 - 1).toBeGreaterThanOrEqual(3)
    expect(type[out[at - 1]!]).not.toBe('B')
    expect(type[out[at + 1]!]).not.toBe('B')
  })
})
