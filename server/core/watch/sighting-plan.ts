// Plans one sighting: which view, under which condition, at what range, for how long.
// Harder conditions and longer ranges come as the track's stability grows, on the same
// rungs as the exposure ladder.
import { apparentPx, BINOCULAR_MAGNIFICATION, horizonDistanceM, rangeForPx } from '../../../shared/utils/apparent-size'
import { exposureFor, exposureLimitMs, ladderRung, NEW_TRACK_MAX_EXPOSURE_MS } from '../../../shared/utils/exposure'
import type { LadderRung } from '../../../shared/utils/exposure'
import { conditionDifficulty, isCondition } from '../../../shared/utils/conditions'
import type { Condition } from '../../../shared/utils/conditions'
import { randomIndex } from './rng'
import type { Rng } from './rng'

// Hardest condition allowed on each ladder rung (new, < 1 d, 1–7 d, 7–30 d, > 30 d), as an index
// into CONDITION_DIFFICULTY (easiest first): the three easy high-contrast scenes while a track
// forms, haze from a day on, the hard low-contrast ones from a week on.
export const MAX_DIFFICULTY_BY_RUNG: readonly number[] = [2, 2, 3, 5, 5]

// Wanted apparent size in CSS px on each rung, [smallest, largest]: large while a track is
// new (about 240 px), down to about 40 px once it holds past a month (product rule).
export const PX_BY_RUNG: readonly (readonly [number, number])[] = [
  [220, 260],
  [160, 220],
  [100, 160],
  [60, 110],
  [40, 80],
]

// What a phone in portrait can show of a silhouette, in CSS px (a 360 px wide screen less margins).
export const MIN_PX = 24
export const MAX_PX = 320

// Closer than this a lookout names the target without raising binoculars (common practice, no source).
export const NEAR_RANGE_M = 1000

// Lookout eye height on a bridge wing, about 15 m (assumption): a vessel is placed no farther than
// this eye's horizon (8.2 nm, Bowditch), so its whole hull stays above the horizon.
export const LOOKOUT_EYE_HEIGHT_M = 15

// Farthest an aircraft sighting is placed (product limit).
export const MAX_AIR_RANGE_M = 40_000

export interface PlanView {
  id: string
  // the conditions this view has been rendered under
  conditions: readonly string[]
}

export interface PlanDeckSettings {
  windowMs: number
  minExposureMs: number
}

export interface PlanInput {
  track: { reps: number, stability: number }
  targetType: { sizeM: number, category: string }
  // views of the track's aspect
  views: readonly PlanView[]
  deck: PlanDeckSettings
  rng: Rng
  // A check's overrides: one condition, one exposure and one size band for every trainee, whatever the track.
  fixed?: SightingOverrides
}

export interface SightingOverrides {
  condition: string
  exposureMs: number
  pxBand: readonly [number, number]
}

export interface SightingPlan {
  viewId: string
  condition: Condition
  rangeM: number
  binoculars: boolean
  apparentPx: number
  // for a new track: the longest the image may stay (until the call)
  exposureMs: number
  untilCall: boolean
  windowMs: number
}

function pickCondition(view: PlanView, maxDifficulty: number, rng: Rng): Condition {
  const known = view.conditions.filter(isCondition)
  const allowed = known.filter(c => conditionDifficulty(c) <= maxDifficulty)
  if (allowed.length > 0) return allowed[randomIndex(rng, allowed.length)]!
  // Only harder renderings exist: take the easiest of them.
  return known.reduce((a, b) => (conditionDifficulty(b) < conditionDifficulty(a) ? b : a))
}

/**
 * The range placement for a wanted apparent size. Binoculars unless the target would be near,
 * or unless they would put it beyond the farthest range (a vessel's hull below the lookout's
 * horizon, an aircraft past MAX_AIR_RANGE_M): then the naked eye, which needs a range 7x shorter
 * for the same size. Only then is the range cut at the farthest, which can make a very large
 * target larger than wanted (300 m at 15.2 km by eye: 53 px).
 */
export function placeRange(sizeM: number, category: string, wantPx: number): { rangeM: number, binoculars: boolean, apparentPx: number } {
  const px = Math.min(MAX_PX, Math.max(MIN_PX, wantPx))
  const farthest = category === 'vessel' ? horizonDistanceM(LOOKOUT_EYE_HEIGHT_M) : MAX_AIR_RANGE_M
  let binoculars = true
  let rangeM = rangeForPx(sizeM, px, BINOCULAR_MAGNIFICATION)
  if (rangeM < NEAR_RANGE_M || rangeM > farthest) {
    binoculars = false
    rangeM = rangeForPx(sizeM, px, 1)
  }
  rangeM = Math.min(rangeM, farthest)
  const magnification = binoculars ? BINOCULAR_MAGNIFICATION : 1
  // A range cut at the farthest makes the target larger; the phone still shows at most MAX_PX.
  let shown = apparentPx(sizeM, rangeM, magnification)
  if (shown > MAX_PX) {
    rangeM = rangeForPx(sizeM, MAX_PX, magnification)
    shown = MAX_PX
  }
  return { rangeM, binoculars, apparentPx: shown }
}

/**
 * Plans a sighting for a track. Views with a rendering allowed on the track's rung are
 * preferred; the condition is drawn among the allowed ones; the apparent size is drawn in
 * the rung's px band and turned into a range (placeRange). The window is the deck's, but
 * never shorter than the exposure. A check's sighting gives `fixed`: its condition (the view drawn
 * among those rendered under it), its exposure and its size band replace the track's.
 */
export function planSighting(input: PlanInput): SightingPlan {
  const { track, targetType, views, deck, rng, fixed } = input
  if (!Number.isFinite(targetType.sizeM) || targetType.sizeM <= 0) {
    throw new RangeError(`sizeM must be > 0, got ${targetType.sizeM}`)
  }
  const usable = views.filter(v => v.conditions.some(isCondition))
  if (usable.length === 0) throw new RangeError('no rendered view of this aspect')

  const rung: LadderRung = ladderRung(track)
  let view: PlanView
  let condition: Condition
  if (fixed) {
    if (!isCondition(fixed.condition)) throw new RangeError(`unknown condition ${fixed.condition}`)
    const pool = usable.filter(v => v.conditions.includes(fixed.condition))
    if (pool.length === 0) throw new RangeError(`no view of this aspect rendered under ${fixed.condition}`)
    view = pool[randomIndex(rng, pool.length)]!
    condition = fixed.condition
  }
  else {
    const maxDifficulty = MAX_DIFFICULTY_BY_RUNG[rung]!
    const fitting = usable.filter(v => v.conditions.some(c => isCondition(c) && conditionDifficulty(c) <= maxDifficulty))
    const pool = fitting.length > 0 ? fitting : usable
    view = pool[randomIndex(rng, pool.length)]!
    condition = pickCondition(view, maxDifficulty, rng)
  }

  const [lo, hi] = fixed?.pxBand ?? PX_BY_RUNG[rung]!
  const placed = placeRange(targetType.sizeM, targetType.category, lo + rng() * (hi - lo))

  const exposure = fixed ? null : exposureFor(track, deck.minExposureMs)
  const exposureMs = exposure ? exposureLimitMs(exposure) : fixed!.exposureMs
  return {
    viewId: view.id,
    condition,
    rangeM: placed.rangeM,
    binoculars: placed.binoculars,
    apparentPx: placed.apparentPx,
    exposureMs,
    untilCall: exposure ? exposure.untilCall : exposureMs >= NEW_TRACK_MAX_EXPOSURE_MS,
    windowMs: Math.max(deck.windowMs, exposureMs),
  }
}
