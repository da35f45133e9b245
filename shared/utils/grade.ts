// Grading of a call and the track stage shown to people. Pure: the server and the phone
// (offline watch) run this same code, and the server's grade stands.

export const GRADES = ['missed', 'hesitant', 'sure', 'instant'] as const
export type CallGrade = typeof GRADES[number]

// Below this latency nobody has seen and named the target. Design value: Thorpe, Fize &
// Marlot (Nature 381, 1996) measured visual categorisation in the brain (EEG) at about 150 ms
// after a 20 ms flash, before any motor response; a tap adds the motor time on top, so a right
// call under 150 ms was made before the image could have been categorised. The floor is
// deliberately lenient (it leaves out the motor time) so that no real call is thrown away.
export const ANTICIPATION_FLOOR_MS = 150

// The longest latency the server accepts at all; anything longer is a broken client clock.
export const MAX_LATENCY_MS = 60_000

export interface CallTiming {
  correct: boolean
  // null: no call before the window closed
  latencyMs: number | null
  // the deck's hesitation limit
  hesitationMs: number
  // the deck's window for a call
  windowMs: number
}

export interface GradeResult {
  grade: CallGrade
  // true when the call came faster than a person can categorise an image
  anticipation: boolean
}

function assertMs(name: string, value: number, min: number, max: number): void {
  if (!Number.isFinite(value) || value < min || value > max) {
    throw new RangeError(`${name} must be a number of milliseconds in [${min}, ${max}], got ${value}`)
  }
}

/**
 * Grades one call. All boundaries are inclusive on the faster side:
 * - latency null, or latency > windowMs, or a wrong call → `missed`;
 * - latency < ANTICIPATION_FLOOR_MS (so 149 ms, not 150 ms) → `missed` with `anticipation: true`,
 *   whether the call was right or wrong;
 * - right and latency <= hesitationMs / 2 → `instant`;
 * - right and latency <= hesitationMs → `sure`;
 * - right and latency <= windowMs → `hesitant`.
 * Throws RangeError for impossible input: hesitationMs or windowMs outside (0, MAX_LATENCY_MS],
 * hesitationMs > windowMs, or a latency that is negative, not finite or above MAX_LATENCY_MS.
 */
export function gradeCall(timing: CallTiming): GradeResult {
  const { correct, latencyMs, hesitationMs, windowMs } = timing
  assertMs('hesitationMs', hesitationMs, 1, MAX_LATENCY_MS)
  assertMs('windowMs', windowMs, 1, MAX_LATENCY_MS)
  if (hesitationMs > windowMs) {
    throw new RangeError(`hesitationMs (${hesitationMs}) must not exceed windowMs (${windowMs})`)
  }
  if (latencyMs === null) return { grade: 'missed', anticipation: false }
  assertMs('latencyMs', latencyMs, 0, MAX_LATENCY_MS)

  if (latencyMs < ANTICIPATION_FLOOR_MS) return { grade: 'missed', anticipation: true }
  if (!correct || latencyMs > windowMs) return { grade: 'missed', anticipation: false }
  if (latencyMs <= hesitationMs / 2) return { grade: 'instant', anticipation: false }
  if (latencyMs <= hesitationMs) return { grade: 'sure', anticipation: false }
  return { grade: 'hesitant', anticipation: false }
}

/** The ts-fsrs Rating enum member names each grade maps to (code only, never shown in the UI). */
export type RatingName = 'Again' | 'Hard' | 'Good' | 'Easy'

export const GRADE_RATING_NAMES: Readonly<Record<CallGrade, RatingName>> = Object.freeze({
  missed: 'Again',
  hesitant: 'Hard',
  sure: 'Good',
  instant: 'Easy',
})

export function gradeToRatingName(grade: CallGrade): RatingName {
  const name = GRADE_RATING_NAMES[grade]
  if (!name) throw new RangeError(`unknown grade: ${String(grade)}`)
  return name
}

export function isGrade(value: unknown): value is CallGrade {
  return typeof value === 'string' && (GRADES as readonly string[]).includes(value)
}

// ---------------------------------------------------------------- track stages

export const TRACK_STAGES = ['new', 'forming', 'holding', 'slipping'] as const
export type TrackStage = typeof TRACK_STAGES[number]

// The numbers ts-fsrs stores in a card's `state` (its State enum), kept here so that
// shared code needs no scheduling library.
export const FSRS_STATE = Object.freeze({ New: 0, Learning: 1, Review: 2, Relearning: 3 })

// A track holds once its memory lasts a week: the same rung where the exposure ladder
// drops to half a second (product rule).
export const HOLDING_STABILITY_DAYS = 7

export interface TrackStageInput {
  reps: number
  state: number
  // FSRS stability in days
  stability: number
  // probability of recall now, 0..1
  retrievability: number
  // the deck's desired retention; default 0.9
  retention?: number
}

/**
 * The stage shown to people, decided in this order:
 * 1. `new`: never called (reps 0 or state New);
 * 2. `slipping`: a recent lapse (state Relearning: the last call missed a reviewed track),
 *    or retrievability now below the desired retention (the track is overdue);
 * 3. `forming`: still in its first short steps (state Learning), or stability under 7 days;
 * 4. `holding`: otherwise (reviewed, retrievability >= retention, stability >= 7 days).
 */
export function trackStage(input: TrackStageInput): TrackStage {
  const { reps, state, stability, retrievability } = input
  const retention = input.retention ?? 0.9
  if (reps <= 0 || state === FSRS_STATE.New) return 'new'
  if (state === FSRS_STATE.Relearning) return 'slipping'
  if (retrievability < retention) return 'slipping'
  if (state === FSRS_STATE.Learning || stability < HOLDING_STABILITY_DAYS) return 'forming'
  return 'holding'
}
