// Fitting FSRS parameters to a crew's own calls with the FSRS optimizer (fsrs-rs through
// @open-spaced-repetition/binding), and the figures that decide whether the fitted set is used.
// Each track is one item and each call one review with its grade's rating (fsrs.ts).
import { computeParameters, evaluateWithTimeSeriesSplits, FSRSBinding, FSRSBindingItem, FSRSBindingReview } from '@open-spaced-repetition/binding'
import { default_w, forgetting_curve, Rating } from 'ts-fsrs'
import type { CallGrade } from '../../../shared/utils/grade'
import type { CalibrationBin } from '../../../shared/types/fit'
import { gradeToRating, newTrackState, reviewTrack, retrievability } from './fsrs'
import type { TrackState } from './fsrs'

const DAY_MS = 86_400_000

// Usable calls (after a track's first, with a review on a later day in its history) needed before a
// fit is tried: the optimizer's time-series split needs several splits of them (design value).
export const MIN_FIT_CALLS = 400

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

/**
 * The optimizer's items: for every review after a track's first, the track's history up to and
 * including it; delta_t is whole UTC days since the previous review (0 for the first), as fsrs-rs
 * expects. Only items whose last review is on a later day than the one before it.
 */
export function toItems(tracks: readonly ReviewLog[][]): FSRSBindingItem[] {
  const items: { at: number, item: FSRSBindingItem }[] = []
  for (const list of tracks) {
    const reviews: FSRSBindingReview[] = []
    let previousDay: number | null = null
    for (const log of list) {
      const day = Math.floor(log.calledAt / DAY_MS)
      reviews.push(new FSRSBindingReview(gradeToRating(log.grade), previousDay === null ? 0 : day - previousDay))
      previousDay = day
      // fsrs-rs predicts a review after a gap: an item ending on the previous review's day is refused
      // (and one with no later-day review at all aborts the process)
      if (reviews.length >= 2 && reviews[reviews.length - 1]!.deltaT > 0) items.push({ at: log.calledAt, item: new FSRSBindingItem(reviews.slice()) })
    }
  }
  // in the order of the calls: the time-series split trains on earlier items and scores later ones
  return items.sort((a, b) => a.at - b.at).map(x => x.item)
}

/** Adopt the fitted set only when it predicts unseen calls better: lower held-out log loss. */
export function shouldAdopt(defaults: Evaluation, fitted: Evaluation): boolean {
  return Number.isFinite(fitted.logLoss) && Number.isFinite(defaults.logLoss) && fitted.logLoss < defaults.logLoss
}

/**
 * Fits a crew's parameters. Too few calls: no fit, and how many more are needed. Otherwise the
 * fitted set and both figures: the fitted procedure by the package's time-series-split evaluation
 * (trained on earlier splits, scored on the later one), the defaults on the same later calls.
 */
export async function fitParameters(logs: readonly ReviewLog[], onProgress?: (share: number) => void): Promise<FitOutcome> {
  const tracks = byTrack(logs)
  const calls = logs.length
  const items = toItems(tracks)
  // each item is one usable call (a later-day review with its history); the threshold counts those
  if (items.length < MIN_FIT_CALLS) return { status: 'too-few', calls, tracks: tracks.length, needed: MIN_FIT_CALLS - items.length }
  const options = { enableShortTerm: true, numRelearningSteps: 1 }
  const weights = await computeParameters(items, {
    ...options,
    progress: (current, total) => {
      if (onProgress && total > 0) onProgress(Math.min(0.9, 0.9 * current / total))
    },
  })
  const held = await evaluateWithTimeSeriesSplits(items, options)
  onProgress?.(0.95)
  // The defaults scored on the calls the splits score: all but the first sixth, if fsrs-rs splits
  // as scikit-learn's TimeSeriesSplit(5) does (from memory); they were fitted on none of them.
  const base = new FSRSBinding([...default_w]).evaluate(items.slice(Math.floor(items.length / 6)))
  const fitted = { logLoss: held.logLoss, rmse: held.rmseBins }
  const defaults = { logLoss: base.logLoss, rmse: base.rmseBins }
  return { status: 'done', calls, tracks: tracks.length, weights, fitted, defaults, adopted: shouldAdopt(defaults, fitted) }
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
