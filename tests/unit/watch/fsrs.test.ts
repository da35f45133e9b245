import { describe, expect, it } from 'vitest'
import {
  default_learning_steps,
  default_maximum_interval,
  default_request_retention,
  default_w,
  forgetting_curve,
  FSRSVersion,
  Rating,
  State,
} from 'ts-fsrs'
import {
  forgettingCurveConstants,
  fromCard,
  gradeToRating,
  newTrackState,
  retrievability,
  reviewTrack,
  schedulerFor,
  stageOf,
  toCard,
} from '../../../server/core/scheduling/fsrs'
import type { TrackState } from '../../../server/core/scheduling/fsrs'

const DAY = 86_400_000
const T0 = Date.UTC(2025, 2, 3, 9, 0, 0)

// A track in review, last called at T0 with stability s days.
function reviewed(s: number, difficulty = 5): TrackState {
  return {
    due: T0 + Math.round(s) * DAY,
    stability: s,
    difficulty,
    elapsedDays: 0,
    scheduledDays: Math.round(s),
    learningSteps: 0,
    reps: 4,
    lapses: 0,
    state: State.Review,
    lastReview: T0,
  }
}

// check-values.md: R(t,S) = (1 + F·t/S)^D, F = 0.9^(1/D) − 1.
const curve = (decay: number, t: number, s: number) => (1 + (0.9 ** (1 / decay) - 1) * t / s) ** decay

describe('installed ts-fsrs (check-values.md: ts-fsrs defaults, constant.ts)', () => {
  it('is FSRS-6 with the default decay w[20] = 0.1542 and the documented defaults', () => {
    expect(FSRSVersion).toMatch(/FSRS-6/)
    expect(default_w).toHaveLength(21)
    expect(default_w[20]).toBe(0.1542)
    expect(default_request_retention).toBe(0.9)
    expect(default_maximum_interval).toBe(36500)
    expect(forgettingCurveConstants().decay).toBe(-0.1542)
  })
})

describe('forgetting curve, FSRS-6 row of check-values.md (decay 0.1542)', () => {
  const rows: [number, number][] = [[1, 0.9], [2, 0.846], [5, 0.761], [10, 0.693]]
  for (const s of [3, 12.5, 40]) {
    it(`R(kS) for S = ${s} d through retrievability()`, () => {
      for (const [k, r] of rows) {
        expect(retrievability(reviewed(s), T0 + k * s * DAY)).toBeCloseTo(r, 3)
        expect(retrievability(reviewed(s), T0 + k * s * DAY)).toBeCloseTo(curve(-0.1542, k * s, s), 6)
      }
    })
  }

  it('ts-fsrs\'s exported forgetting_curve and get_retrievability give the same values', () => {
    for (const [k, r] of rows) {
      expect(forgetting_curve(0.1542, k * 10, 10)).toBeCloseTo(r, 3)
      expect(forgetting_curve(default_w, k * 10, 10)).toBeCloseTo(r, 3)
      const now = T0 + k * 10 * DAY
      const lib = schedulerFor({ retention: 0.9 }).get_retrievability(toCard(reviewed(10)), new Date(now), false)
      expect(retrievability(reviewed(10), now)).toBeCloseTo(lib, 8)
    }
  })

  it('FSRS-5 row (decay 0.5) through ts-fsrs\'s forgetting_curve, for contrast', () => {
    for (const [k, r] of [[1, 0.9], [2, 0.825], [5, 0.678], [10, 0.547]] as const) {
      expect(forgetting_curve(0.5, k * 10, 10)).toBeCloseTo(r, 3)
    }
  })

  it('a new track has no retrievability (0, as ts-fsrs get_retrievability)', () => {
    const fresh = newTrackState(T0)
    expect(retrievability(fresh, T0 + DAY)).toBe(0)
    expect(schedulerFor({ retention: 0.9 }).get_retrievability(toCard(fresh), new Date(T0 + DAY), false)).toBe(0)
  })
})

describe('interval for retention r (check-values.md: I = S·(r^(1/D) − 1)/F, clamped to [1, maximum_interval])', () => {
  const D = -0.1542
  const F = 0.9 ** (1 / D) - 1
  const expected = (s: number, r: number, max = 36500) => Math.min(max, Math.max(1, Math.round(s * (r ** (1 / D) - 1) / F)))

  for (const r of [0.9, 0.8, 0.95]) {
    it(`r = ${r}: hesitant, sure and instant calls on a reviewed track`, () => {
      const now = T0 + 10 * DAY
      for (const grade of ['hesitant', 'sure', 'instant'] as const) {
        const { after } = reviewTrack(reviewed(10), grade, now, { retention: r })
        expect(after.state).toBe(State.Review)
        expect(after.scheduledDays).toBe(expected(after.stability, r))
        expect(after.due).toBe(now + after.scheduledDays * DAY)
      }
    })
  }

  it('never under one day', () => {
    const { after } = reviewTrack(reviewed(0.3), 'hesitant', T0 + 3_600_000, { retention: 0.95 })
    expect(after.stability * (0.95 ** (1 / D) - 1) / F).toBeLessThan(0.5)
    expect(after.scheduledDays).toBe(1)
  })

  it('never over maximum_interval', () => {
    const now = T0 + 10 * DAY
    for (const grade of ['hesitant', 'sure', 'instant'] as const) {
      const { after } = reviewTrack(reviewed(10), grade, now, { retention: 0.9, maximumInterval: 5 })
      expect(after.scheduledDays).toBe(5)
      expect(after.due).toBe(now + 5 * DAY)
    }
  })
})

describe('stability after a right call, FSRS-6 formula worked by hand', () => {
  // Published FSRS-6 recall stability (open-spaced-repetition, "The Algorithm"):
  // S' = S·(e^w8·(11 − D)·S^(−w9)·(e^(w10·(1 − R)) − 1)·(w15 if Hard)·(w16 if Easy) + 1),
  // with the library's default weights (ts-fsrs constant.ts) as inputs. For S = 10, D = 5,
  // 10 days elapsed (R = 0.9) and Good: e^1.8722 = 6.5023, 10^−0.1666 = 0.6817,
  // e^(0.0796) − 1 = 0.08285, so S' = 10·(6.5023·6·0.6817·0.08285 + 1) ≈ 32.03.
  const w = default_w
  const byHand = (s: number, d: number, r: number, factor = 1) =>
    s * (Math.exp(w[8]!) * (11 - d) * s ** -w[9]! * (Math.exp(w[10]! * (1 - r)) - 1) * factor + 1)

  it('S = 10, D = 5, 10 days, sure (Good): S\' ≈ 32.03', () => {
    expect(byHand(10, 5, 0.9)).toBeCloseTo(32.03, 2)
    const { after } = reviewTrack(reviewed(10, 5), 'sure', T0 + 10 * DAY, { retention: 0.9 })
    expect(after.stability).toBeCloseTo(32.03, 1)
  })

  it('hesitant (Hard) takes w15, instant (Easy) takes w16', () => {
    const hard = reviewTrack(reviewed(10, 5), 'hesitant', T0 + 10 * DAY, { retention: 0.9 }).after
    const easy = reviewTrack(reviewed(10, 5), 'instant', T0 + 10 * DAY, { retention: 0.9 }).after
    expect(hard.stability).toBeCloseTo(byHand(10, 5, 0.9, w[15]!), 1)
    expect(easy.stability).toBeCloseTo(byHand(10, 5, 0.9, w[16]!), 1)
  })
})

describe('reviewTrack', () => {
  it('maps grades to the ts-fsrs Rating enum (product.md, The drill 1)', () => {
    expect(gradeToRating('missed')).toBe(Rating.Again)
    expect(gradeToRating('hesitant')).toBe(Rating.Hard)
    expect(gradeToRating('sure')).toBe(Rating.Good)
    expect(gradeToRating('instant')).toBe(Rating.Easy)
  })

  it('uses ts-fsrs\'s default learning steps (1m, 10m) for a new track', () => {
    expect(default_learning_steps).toEqual(['1m', '10m'])
    const fresh = newTrackState(T0)
    expect(reviewTrack(fresh, 'missed', T0, { retention: 0.9 }).after.due).toBe(T0 + 60_000)
    const sure = reviewTrack(fresh, 'sure', T0, { retention: 0.9 }).after
    expect(sure.due).toBe(T0 + 10 * 60_000)
    expect(sure.state).toBe(State.Learning)
    // first stability is w[2] for Good (FSRS: S0(G) = w[G−1])
    expect(sure.stability).toBeCloseTo(default_w[2]!, 8)
  })

  it('is deterministic (fuzz off) and leaves the input untouched', () => {
    const state = reviewed(20)
    const copy = { ...state }
    const a = reviewTrack(state, 'instant', T0 + 25 * DAY, { retention: 0.9 })
    const b = reviewTrack(state, 'instant', T0 + 25 * DAY, { retention: 0.9 })
    expect(a).toEqual(b)
    expect(state).toEqual(copy)
    expect(a.before).toEqual(copy)
    expect(schedulerFor({ retention: 0.9 }).parameters.enable_fuzz).toBe(false)
  })

  it('a missed reviewed track lapses into relearning and shows as slipping', () => {
    const { after } = reviewTrack(reviewed(20), 'missed', T0 + 20 * DAY, { retention: 0.9 })
    expect(after.state).toBe(State.Relearning)
    expect(after.lapses).toBe(1)
    expect(after.reps).toBe(5)
    expect(stageOf(after, T0 + 20 * DAY, 0.9)).toBe('slipping')
  })

  it('round-trips through ts-fsrs cards', () => {
    const state = reviewTrack(newTrackState(T0), 'sure', T0, { retention: 0.9 }).after
    expect(fromCard(toCard(state))).toEqual(state)
    expect(fromCard(toCard(newTrackState(T0)))).toEqual(newTrackState(T0))
  })

  it('rejects retention outside (0, 1)', () => {
    expect(() => reviewTrack(reviewed(5), 'sure', T0, { retention: 1 })).toThrow(RangeError)
    expect(() => reviewTrack(reviewed(5), 'sure', T0, { retention: 0 })).toThrow(RangeError)
  })
})

describe('toCard', () => {
  it('rejects a state number outside the ts-fsrs State enum', () => {
    expect(() => toCard({ ...newTrackState(T0), state: 4 })).toThrow(RangeError)
    expect(toCard({ ...newTrackState(T0), state: State.Relearning }).state).toBe(State.Relearning)
  })
})
