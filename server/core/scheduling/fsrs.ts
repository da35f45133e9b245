// FSRS scheduling of tracks through ts-fsrs. A track's state is kept in plain columns
// (see `tracks` in server/database/schema.ts); this module converts to and from ts-fsrs
// cards and keeps the library's settings in one place: fuzz off (deterministic), the
// library's default short-term learning steps, the deck's desired retention.
import {
  createEmptyCard,
  default_maximum_interval,
  default_w,
  forgetting_curve,
  fsrs,
  FSRSVersion,
  generatorParameters,
  Rating,
  State,
} from 'ts-fsrs'
import type { Card, FSRS, Grade as FsrsGrade } from 'ts-fsrs'
import { gradeToRatingName, trackStage } from '../../../shared/utils/grade'
import type { CallGrade, TrackStage } from '../../../shared/utils/grade'

export { FSRSVersion }

const DAY_MS = 86_400_000

/** A track's FSRS state, field for field the `tracks` columns; times are epoch milliseconds. */
export interface TrackState {
  due: number
  stability: number
  difficulty: number
  elapsedDays: number
  scheduledDays: number
  learningSteps: number
  reps: number
  lapses: number
  // ts-fsrs State: 0 New, 1 Learning, 2 Review, 3 Relearning
  state: number
  lastReview: number | null
}

export interface SchedulerOptions {
  // desired retention, 0 < r < 1 (deck setting, default 0.9)
  retention: number
  // longest interval in days (default: ts-fsrs's 36500)
  maximumInterval?: number
  // the crew's adopted FSRS parameters (21 weights, fitted by fit.ts); absent: the library's defaults
  weights?: readonly number[]
}

export interface TrackReview {
  before: TrackState
  after: TrackState
  rating: FsrsGrade
}

const schedulers = new Map<string, FSRS>()

/** The ts-fsrs scheduler for these options (cached: decks share a handful of settings). */
export function schedulerFor(options: SchedulerOptions): FSRS {
  const { retention } = options
  const maximumInterval = options.maximumInterval ?? default_maximum_interval
  if (!Number.isFinite(retention) || retention <= 0 || retention >= 1) {
    throw new RangeError(`retention must be in (0, 1), got ${retention}`)
  }
  if (!Number.isInteger(maximumInterval) || maximumInterval < 1) {
    throw new RangeError(`maximumInterval must be a whole number of days >= 1, got ${maximumInterval}`)
  }
  const weights = options.weights
  if (weights !== undefined && (weights.length !== default_w.length || !weights.every(Number.isFinite))) {
    throw new RangeError(`weights must be ${default_w.length} finite numbers, got ${weights.length}`)
  }
  const key = `${retention}|${maximumInterval}|${weights ? weights.join(',') : ''}`
  let scheduler = schedulers.get(key)
  if (!scheduler) {
    // a fitted set is one per crew and changes at most weekly: the cache stays small
    if (schedulers.size > 256) schedulers.clear()
    scheduler = fsrs(generatorParameters({
      request_retention: retention,
      maximum_interval: maximumInterval,
      enable_fuzz: false,
      enable_short_term: true,
      ...(weights ? { w: [...weights] } : {}),
    }))
    schedulers.set(key, scheduler)
  }
  return scheduler
}

/** The ts-fsrs rating for a grade: missed→Again, hesitant→Hard, sure→Good, instant→Easy. */
export function gradeToRating(grade: CallGrade): FsrsGrade {
  return Rating[gradeToRatingName(grade)]
}

export function newTrackState(nowMs: number): TrackState {
  return fromCard(createEmptyCard(new Date(nowMs)))
}

export function toCard(state: TrackState): Card {
  if (!Number.isInteger(state.state) || state.state < State.New || state.state > State.Relearning) {
    throw new RangeError(`state must be a ts-fsrs State (0..3), got ${state.state}`)
  }
  const card: Card = {
    due: new Date(state.due),
    stability: state.stability,
    difficulty: state.difficulty,
    elapsed_days: state.elapsedDays,
    scheduled_days: state.scheduledDays,
    learning_steps: state.learningSteps,
    reps: state.reps,
    lapses: state.lapses,
    state: state.state as State,
  }
  if (state.lastReview !== null) card.last_review = new Date(state.lastReview)
  return card
}

export function fromCard(card: Card): TrackState {
  return {
    due: card.due.getTime(),
    stability: card.stability,
    difficulty: card.difficulty,
    elapsedDays: card.elapsed_days,
    scheduledDays: card.scheduled_days,
    learningSteps: card.learning_steps,
    reps: card.reps,
    lapses: card.lapses,
    state: card.state,
    lastReview: card.last_review ? card.last_review.getTime() : null,
  }
}

/** Applies one graded call to a track at nowMs; returns the state before and after. */
export function reviewTrack(state: TrackState, grade: CallGrade, nowMs: number, options: SchedulerOptions): TrackReview {
  if (!Number.isFinite(nowMs)) throw new RangeError(`nowMs must be finite, got ${nowMs}`)
  const rating = gradeToRating(grade)
  const scheduler = schedulerFor(options)
  const after = fromCard(scheduler.next(toCard(state), new Date(nowMs), rating).card)
  // ts-fsrs keeps good > hard and easy > good by one day even past maximum_interval; hold the deck's cap.
  const maximumInterval = scheduler.parameters.maximum_interval
  if (after.scheduledDays > maximumInterval) {
    after.scheduledDays = maximumInterval
    after.due = nowMs + maximumInterval * DAY_MS
  }
  return { before: { ...state }, after, rating }
}

/**
 * Probability of recall at nowMs by ts-fsrs's forgetting curve, with the elapsed time in
 * fractional days since the last call (ts-fsrs's own get_retrievability floors to whole
 * days; the two agree at whole days). A new track, or one with no last call, has 0,
 * as in ts-fsrs.
 */
export function retrievability(state: TrackState, nowMs: number, weights?: readonly number[]): number {
  if (state.state === State.New || state.lastReview === null || state.stability <= 0) return 0
  const elapsedDays = Math.max(0, nowMs - state.lastReview) / DAY_MS
  return forgetting_curve(schedulerFor({ retention: 0.9, weights }).parameters.w, elapsedDays, state.stability)
}

/** The stage shown to people for a track at nowMs (rules in shared/utils/grade.ts). */
export function stageOf(state: TrackState, nowMs: number, retention: number): TrackStage {
  return trackStage({
    reps: state.reps,
    state: state.state,
    stability: state.stability,
    retrievability: retrievability(state, nowMs),
    retention,
  })
}

/** The decay D and factor F of the forgetting curve R = (1 + F·t/S)^D in use. */
export function forgettingCurveConstants(): { decay: number, factor: number, version: string } {
  const w = schedulerFor({ retention: 0.9 }).parameters.w
  const decay = -w[20]!
  return { decay, factor: 0.9 ** (1 / decay) - 1, version: FSRSVersion }
}
