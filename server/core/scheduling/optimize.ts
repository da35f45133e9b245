// Fitting FSRS parameters to a crew's own calls with the FSRS optimizer (fsrs-rs through
// @open-spaced-repetition/binding). Each track is one item and each call one review with its
// grade's rating (fsrs.ts). A panic in the optimizer's native code aborts the whole process, so
// the server runs this only in a child process (server/workers/fit-child.ts).
import { computeParameters, evaluateWithTimeSeriesSplits, FSRSBinding, FSRSBindingItem, FSRSBindingReview } from '@open-spaced-repetition/binding'
import { default_w } from 'ts-fsrs'
import { gradeToRating } from './fsrs'
import { byTrack, MIN_FIT_CALLS, shouldAdopt } from './fit'
import type { FitOutcome, ReviewLog } from './fit'

const DAY_MS = 86_400_000

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
