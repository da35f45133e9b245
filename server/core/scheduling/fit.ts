// The figures and pictures of a crew's FSRS parameters, and the rule that decides whether a fitted
// set is used. The optimizer itself (optimize.ts) runs only in a child process (fit-child.ts):
// a panic in its native code aborts the process it runs in.
import { forgetting_curve, Rating } from 'ts-fsrs'
import type { CallGrade } from '../../../shared/utils/grade'
import type { CalibrationBin, ForgettingBin } from '../../../shared/types/fit'
import { newTrackState, reviewTrack, retrievability } from './fsrs'
import type { TrackState } from './fsrs'

// Usable calls (after a track's first, with a review on a later day in its history) needed before a
// fit is tried: the optimizer's time-series split needs several splits of them (design value).
export const MIN_FIT_CALLS = 400
// Calls after a track's first a person needs before their own pictures are drawn (design value:
// about ten calls in each of the busier gap bins).
export const MIN_PERSON_CALLS = 100

export interface ReviewLog {
  trackId: string
  calledAt: number
  grade: CallGrade
}

export interface Evaluation {
  logLoss: number
  rmse: number
}

export type FitOutcome
  = | { status: 'too-few', calls: number, tracks: number, needed: number }
    | { status: 'done', calls: number, tracks: number, weights: number[], fitted: Evaluation, defaults: Evaluation, adopted: boolean }

/** Reviews grouped by track, each track's in time order. */
export function byTrack(logs: readonly ReviewLog[]): ReviewLog[][] {
  const groups = new Map<string, ReviewLog[]>()
  for (const log of logs) {
    const list = groups.get(log.trackId)
    if (list) list.push(log)
    else groups.set(log.trackId, [log])
  }
  return [...groups.values()].map(list => list.sort((a, b) => a.calledAt - b.calledAt))
}

/** Adopt the fitted set only when it predicts unseen calls better: lower held-out log loss. */
export function shouldAdopt(defaults: Evaluation, fitted: Evaluation): boolean {
  return Number.isFinite(fitted.logLoss) && Number.isFinite(defaults.logLoss) && fitted.logLoss < defaults.logLoss
}

/** Probability of recall t days after a first call rated Good, by a parameter set (FSRS: S0 = w[2]). */
export function firstCurve(weights: readonly number[], days: readonly number[]): number[] {
  const s0 = weights[Rating.Good - 1]!
  return days.map(t => forgetting_curve([...weights], t, s0))
}

export type { CalibrationBin }

/**
 * Calibration: every call after a track's first, replayed through the scheduler with a parameter
 * set, binned by the recall the set predicted before it (tenths) against the share right.
 */
export function calibration(tracks: readonly ReviewLog[][], weights: readonly number[] | undefined, retention = 0.9): CalibrationBin[] {
  const sums = Array.from({ length: 10 }, () => ({ p: 0, right: 0, n: 0 }))
  for (const list of tracks) {
    let state: TrackState | null = null
    for (const log of list) {
      if (state && state.lastReview !== null) {
        const p = retrievability(state, log.calledAt, weights)
        const bin = sums[Math.min(9, Math.floor(p * 10))]!
        bin.p += p
        bin.right += log.grade === 'missed' ? 0 : 1
        bin.n++
      }
      const at = Math.max(log.calledAt, state?.lastReview ?? 0)
      state = reviewTrack(state ?? newTrackState(at), log.grade, at, { retention, weights }).after
    }
  }
  return sums.filter(b => b.n > 0).map(b => ({ predicted: b.p / b.n, observed: b.right / b.n, count: b.n }))
}

export type { ForgettingBin }

// Gap bins in whole days: same day, 1, 2, 3-4, 5-7, 8-14, 15-30, over 30 (design value: finer
// where most calls fall, wider where a person has few).
const GAP_EDGES = [0, 1, 2, 3, 5, 8, 15, 31] as const

/**
 * A person's forgetting as observed: the share of right calls by the time since the track's
 * previous call, beside the recall a parameter set predicted for the same calls (each track
 * replayed through the scheduler with that set).
 */
export function forgettingByGap(tracks: readonly ReviewLog[][], weights: readonly number[] | undefined, retention = 0.9): ForgettingBin[] {
  const sums = GAP_EDGES.map(() => ({ days: 0, p: 0, right: 0, n: 0 }))
  for (const list of tracks) {
    let state: TrackState | null = null
    for (const log of list) {
      if (state && state.lastReview !== null) {
        const gap = Math.max(0, log.calledAt - state.lastReview) / 86_400_000
        let bin = GAP_EDGES.length - 1
        while (bin > 0 && Math.floor(gap) < GAP_EDGES[bin]!) bin--
        const s = sums[bin]!
        s.days += gap
        s.p += retrievability(state, log.calledAt, weights)
        s.right += log.grade === 'missed' ? 0 : 1
        s.n++
      }
      const at = Math.max(log.calledAt, state?.lastReview ?? 0)
      state = reviewTrack(state ?? newTrackState(at), log.grade, at, { retention, weights }).after
    }
  }
  return sums.flatMap((s, i) => s.n === 0
    ? []
    : [{ fromDays: GAP_EDGES[i]!, toDays: i + 1 < GAP_EDGES.length ? GAP_EDGES[i + 1]! - 1 : null, meanDays: s.days / s.n, predicted: s.p / s.n, observed: s.right / s.n, count: s.n }])
}
