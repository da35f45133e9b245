// Fitting a crew's FSRS parameters (server/core/scheduling/optimize.ts, fit.ts) with the fsrs-rs optimizer of
// @open-spaced-repetition/binding. Synthetic calls are drawn from a forgetting curve far steeper
// than FSRS's defaults, R(t) = 0.5^(t / 1.5 days) (an exponential curve, Ebbinghaus-style: design
// value), so a fit to them must predict held-out calls better than the defaults.
import { describe, expect, it } from 'vitest'
import { default_w } from 'ts-fsrs'
import { calibration, byTrack, forgettingByGap, MIN_FIT_CALLS, shouldAdopt } from '../../../server/core/scheduling/fit'
import { fitParameters, toItems } from '../../../server/core/scheduling/optimize'
import type { ReviewLog } from '../../../server/core/scheduling/fit'

const DAY_MS = 86_400_000

function synthetic(tracks: number, perTrack: number, seed = 7): ReviewLog[] {
  let a = seed
  const rng = () => {
    a = (a + 0x6D2B79F5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
  const logs: ReviewLog[] = []
  const start = Date.UTC(2026, 0, 5, 9)
  for (let k = 0; k < tracks; k++) {
    let at = start + Math.floor(rng() * 10) * DAY_MS
    logs.push({ trackId: `t${k}`, calledAt: at, grade: 'sure' })
    for (let i = 1; i < perTrack; i++) {
      const gap = 1 + Math.floor(rng() * 6)
      at += gap * DAY_MS
      const right = rng() < 0.5 ** (gap / 1.5)
      logs.push({ trackId: `t${k}`, calledAt: at, grade: right ? 'sure' : 'missed' })
    }
  }
  return logs
}

describe('fitting FSRS parameters to a crew\'s calls', () => {
  it('refuses too few calls, stays on the defaults and says how many more are needed', async () => {
    // 10 tracks of 10 calls on different days: 9 usable calls a track (each after the track's first)
    const out = await fitParameters(synthetic(10, 10))
    expect(out).toEqual({ status: 'too-few', calls: 100, tracks: 10, needed: MIN_FIT_CALLS - 90 })
  })

  it('counts no call whose history stays on one day (fsrs-rs needs a later-day review) and refuses, not crashes', async () => {
    const day = Date.UTC(2026, 0, 5, 9)
    const logs = Array.from({ length: 2000 }, (_, i) => ({ trackId: `t${i % 50}`, calledAt: day + i * 1000, grade: 'sure' as const }))
    expect(toItems(byTrack(logs))).toHaveLength(0)
    expect(await fitParameters(logs)).toEqual({ status: 'too-few', calls: 2000, tracks: 50, needed: MIN_FIT_CALLS })
  })

  it('adopts a fitted set only when its held-out log loss is lower (equal or higher keeps the defaults)', () => {
    expect(shouldAdopt({ logLoss: 0.40, rmse: 0.05 }, { logLoss: 0.35, rmse: 0.09 })).toBe(true)
    expect(shouldAdopt({ logLoss: 0.40, rmse: 0.05 }, { logLoss: 0.40, rmse: 0.01 })).toBe(false)
    expect(shouldAdopt({ logLoss: 0.40, rmse: 0.05 }, { logLoss: 0.41, rmse: 0.01 })).toBe(false)
    expect(shouldAdopt({ logLoss: 0.40, rmse: 0.05 }, { logLoss: Number.NaN, rmse: 0.01 })).toBe(false)
  })

  it('one optimizer item per call after a track\'s first, delta_t in whole days, the first 0 (fsrs-rs FSRSItem)', () => {
    const items = toItems(byTrack([
      { trackId: 'a', calledAt: Date.UTC(2026, 0, 1, 9), grade: 'sure' },
      { trackId: 'a', calledAt: Date.UTC(2026, 0, 3, 20), grade: 'missed' },
      { trackId: 'a', calledAt: Date.UTC(2026, 0, 4, 1), grade: 'instant' },
    ]))
    expect(items.map(i => i.reviews.map(r => [r.rating, r.deltaT]))).toEqual([
      [[3, 0], [1, 2]],
      [[3, 0], [1, 2], [4, 1]],
    ])
  })

  it('on calls that forget far faster than the defaults assume, the fit wins on held-out calls and is adopted', async () => {
    const logs = synthetic(150, 12)
    const out = await fitParameters(logs)
    if (out.status !== 'done') throw new Error('expected a fit')
    expect(out.weights).toHaveLength(default_w.length)
    expect(out.fitted.logLoss).toBeLessThan(out.defaults.logLoss)
    expect(out.adopted).toBe(true)
    // steeper forgetting: the first stability after Good (w[2]) below the default 2.3065 days
    expect(out.weights[2]!).toBeLessThan(default_w[2]!)
    // calibration of the defaults: they predict far more recall than the 0.5^(gap/1.5) observed
    const bins = calibration(byTrack(logs), undefined)
    const predicted = bins.reduce((s, b) => s + b.predicted * b.count, 0) / bins.reduce((s, b) => s + b.count, 0)
    const observed = bins.reduce((s, b) => s + b.observed * b.count, 0) / bins.reduce((s, b) => s + b.count, 0)
    expect(predicted).toBeGreaterThan(observed + 0.1)
  }, 120_000)

  it('a person\'s forgetting by days since the previous call follows the curve their calls were drawn from', () => {
    const logs = synthetic(150, 12, 11)
    const bins = forgettingByGap(byTrack(logs), undefined)
    // every call after a track's first is in one bin
    expect(bins.reduce((s, b) => s + b.count, 0)).toBe(150 * 11)
    // gaps drawn from 1..6 whole days fall in the bins 1, 2, 3-4 and 5-7
    expect(bins.map(b => [b.fromDays, b.toDays])).toEqual([[1, 1], [2, 2], [3, 4], [5, 7]])
    for (const b of bins.slice(0, 2)) {
      // R = 0.5^(gap / 1.5 days), the generating curve (design value); within four binomial
      // standard errors sqrt(p(1 − p)/n) of it (common practice, no source)
      const p = 0.5 ** (b.fromDays / 1.5)
      expect(b.meanDays).toBe(b.fromDays)
      expect(Math.abs(b.observed - p)).toBeLessThan(4 * Math.sqrt(p * (1 - p) / b.count))
      // FSRS-6's defaults forget far slower: their predicted recall lies above what was observed
      expect(b.predicted).toBeGreaterThan(b.observed + 0.1)
    }
  })
})
