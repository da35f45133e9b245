import { describe, expect, it } from 'vitest'
import { State } from 'ts-fsrs'
import { newTrackState, schedulerFor, toCard } from '../../../server/core/scheduling/fsrs'
import type { TrackState } from '../../../server/core/scheduling/fsrs'
import { buildPracticeQueue, buildWatchQueue, INTRO_GAP, insertReshow, placeIntroductions, spreadByType } from '../../../server/core/watch/queue'
import type { QueueTrack, WatchItem } from '../../../server/core/watch/queue'
import { seededRng, randomIndex } from '../../../server/core/watch/rng'

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
    const rng = seededRng(20250610)
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

describe('placeIntroductions (product.md, The drill 2: each new one introduced before its first timed sighting; issue 15 item 1)', () => {
  // Counts the appearances (introductions or sightings) and the timed sightings strictly between a
  // track's introduction and its first timed sighting.
  function between(items: WatchItem[], trackId: string) {
    const intro = items.findIndex(x => x.kind === 'introduction' && x.trackId === trackId)
    const first = items.findIndex(x => x.kind === 'sighting' && x.trackId === trackId)
    const inside = items.slice(intro + 1, first)
    return { intro, first, others: inside.length, sightings: inside.filter(x => x.kind === 'sighting').length }
  }

  it('with due sightings first, every new track has at least two timed sightings between its introduction and its first timed sighting', () => {
    const queue = ['d1', 'n1', 'd2', 'n2', 'd3', 'n3', 'd4']
    const items = placeIntroductions(queue, new Set(['n1', 'n2', 'n3']))
    expect(items.filter(x => x.kind === 'sighting').map(x => x.trackId)).toEqual(queue)
    for (const n of ['n1', 'n2', 'n3']) {
      const b = between(items, n)
      expect(b.intro, n).toBeGreaterThanOrEqual(0)
      expect(b.intro).toBeLessThan(b.first)
      // n1 is the second sighting: only one sighting comes before it, so the introductions of n2 and n3 stand between.
      if (n === 'n1') expect(b.others).toBeGreaterThanOrEqual(INTRO_GAP)
      else expect(b.sightings).toBeGreaterThanOrEqual(INTRO_GAP)
    }
    // Due tracks are not introduced.
    expect(items.filter(x => x.kind === 'introduction')).toHaveLength(3)
  })

  it('a watch of new tracks only: introductions lead, two other appearances before each first sighting', () => {
    const queue = Array.from({ length: 10 }, (_, i) => `n${i}`)
    const items = placeIntroductions(queue, new Set(queue))
    expect(items.slice(0, 3).every(x => x.kind === 'introduction')).toBe(true)
    for (const n of queue) {
      const b = between(items, n)
      expect(b.others, n).toBeGreaterThanOrEqual(INTRO_GAP)
      // From the third track on, the gap is made of timed sightings.
      if (queue.indexOf(n) >= INTRO_GAP) expect(b.sightings, n).toBeGreaterThanOrEqual(INTRO_GAP)
    }
  })

  it('introduces a track once, before its first sighting only (a re-show is not introduced again)', () => {
    const items = placeIntroductions(['d1', 'd2', 'n1', 'd3', 'n1'], new Set(['n1']))
    expect(items.map(x => `${x.kind[0]}:${x.trackId}`)).toEqual(['i:n1', 's:d1', 's:d2', 's:n1', 's:d3', 's:n1'])
  })

  it('refuses a negative gap', () => {
    expect(() => placeIntroductions(['a'], new Set(), -1)).toThrow(RangeError)
  })
})

describe('buildPracticeQueue (product.md, practice: lowest retrievability and the crew\'s worst confusions; issue 15 item 3)', () => {
  const f = schedulerFor({ retention: 0.9 })
  const rOf = (t: QueueTrack) => f.get_retrievability(toCard(t.state), new Date(NOW), false)

  it('takes in turn the track ts-fsrs rates least retrievable and the worst-confused type, never new tracks, no type twice in a row', () => {
    const tracks = [
      track('a', 'T1', reviewedState(30, 2, 20)),
      track('b', 'T2', reviewedState(2, 1, 1)),
      track('c', 'T3', reviewedState(10, 5, 3)),
      track('d', 'T4', reviewedState(50, 1, 40)),
      track('e', 'T5', reviewedState(40, 1, 30)),
      track('n', 'T6', newTrackState(NOW)),
    ]
    const queue = buildPracticeQueue({ tracks, nowMs: NOW, confusedTypeIds: ['T4', 'T5'], size: 4 })
    expect(queue).toHaveLength(4)
    expect(queue).not.toContain('n')
    // The least retrievable of all by the library's own formula, and the two confused types.
    const lowest = tracks.slice(0, 5).sort((x, y) => rOf(x) - rOf(y)).map(t => t.id)
    expect(queue).toContain(lowest[0])
    expect(queue).toContain(lowest[1])
    expect(queue).toContain('d')
    expect(queue).toContain('e')
    expect(noRepeats(queue.map(id => tracks.find(t => t.id === id)!.targetTypeId))).toBe(true)
  })

  it('is as long as the tracks allow, and empty with nothing called before', () => {
    const known = [track('a', 'T1', reviewedState(3, 1, 2)), track('b', 'T2', reviewedState(3, 1, 2))]
    expect(buildPracticeQueue({ tracks: known, nowMs: NOW, confusedTypeIds: [], size: 10 }).sort()).toEqual(['a', 'b'])
    expect(buildPracticeQueue({ tracks: [track('n', 'T1', newTrackState(NOW))], nowMs: NOW, confusedTypeIds: [], size: 10 })).toEqual([])
    expect(() => buildPracticeQueue({ tracks: known, nowMs: NOW, confusedTypeIds: [], size: -1 })).toThrow(RangeError)
  })
})
