// The exposure ladder: how long a sighting's image stays on screen, from the track's
// FSRS stability. Shortening the flash as recognition grows follows the brief-flash
// method of wartime recognition training (Time, "Fast Looks", 1945).

// A new track shows until the call, but never longer than this.
export const NEW_TRACK_MAX_EXPOSURE_MS = 4000

// The shortest exposure a deck may choose, and the deck default (the ladder's last rung).
export const EXPOSURE_FLOOR_MS = 100
export const DEFAULT_MIN_EXPOSURE_MS = 200

/**
 * Ladder rungs by stability S in days (half-open on the left, so each boundary belongs
 * to the longer-lasting rung, except 30 which is still "7 to 30"):
 * - rung 0: new track (never called) → until the call, at most 4000 ms
 * - rung 1: S < 1 → 2000 ms
 * - rung 2: 1 <= S < 7 → 1000 ms
 * - rung 3: 7 <= S <= 30 → 500 ms
 * - rung 4: S > 30 → the deck's shortest exposure (200 ms by default, down to 100 ms)
 */
export const LADDER_MS = Object.freeze([NEW_TRACK_MAX_EXPOSURE_MS, 2000, 1000, 500, DEFAULT_MIN_EXPOSURE_MS])

export type LadderRung = 0 | 1 | 2 | 3 | 4

export interface ExposureTrack {
  // calls so far; 0 means a new track
  reps: number
  // FSRS stability in days
  stability: number
}

export type Exposure
  = | { untilCall: true, maxMs: number }
    | { untilCall: false, ms: number }

export function ladderRung(track: ExposureTrack): LadderRung {
  const { reps, stability } = track
  if (!Number.isFinite(reps) || reps < 0) throw new RangeError(`reps must be >= 0, got ${reps}`)
  if (reps === 0) return 0
  if (!Number.isFinite(stability) || stability < 0) {
    throw new RangeError(`stability must be a finite number of days >= 0, got ${stability}`)
  }
  if (stability < 1) return 1
  if (stability < 7) return 2
  if (stability <= 30) return 3
  return 4
}

/**
 * The exposure for a track. `minExposureMs` is the deck's shortest exposure, in
 * [EXPOSURE_FLOOR_MS, NEW_TRACK_MAX_EXPOSURE_MS]: it replaces the last rung and no rung
 * goes below it.
 */
export function exposureFor(track: ExposureTrack, minExposureMs: number = DEFAULT_MIN_EXPOSURE_MS): Exposure {
  if (!Number.isFinite(minExposureMs) || minExposureMs < EXPOSURE_FLOOR_MS || minExposureMs > NEW_TRACK_MAX_EXPOSURE_MS) {
    throw new RangeError(`minExposureMs must be in [${EXPOSURE_FLOOR_MS}, ${NEW_TRACK_MAX_EXPOSURE_MS}], got ${minExposureMs}`)
  }
  const rung = ladderRung(track)
  if (rung === 0) return { untilCall: true, maxMs: NEW_TRACK_MAX_EXPOSURE_MS }
  const ms = rung === 4 ? minExposureMs : Math.max(LADDER_MS[rung]!, minExposureMs)
  return { untilCall: false, ms }
}

/** The longest time the image may stay on screen for an exposure. */
export function exposureLimitMs(exposure: Exposure): number {
  return exposure.untilCall ? exposure.maxMs : exposure.ms
}

/**
 * Whole display frames for an exposure: round(ms / frameIntervalMs), at least one frame.
 * frameIntervalMs is the measured refresh interval (16.67 ms at 60 Hz).
 */
export function framesForExposure(ms: number, frameIntervalMs: number): number {
  if (!Number.isFinite(ms) || ms <= 0) throw new RangeError(`ms must be > 0, got ${ms}`)
  if (!Number.isFinite(frameIntervalMs) || frameIntervalMs <= 0) {
    throw new RangeError(`frameIntervalMs must be > 0, got ${frameIntervalMs}`)
  }
  return Math.max(1, Math.round(ms / frameIntervalMs))
}
