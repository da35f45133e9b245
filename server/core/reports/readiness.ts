// Readiness: whether a trainee meets the crew's standard on a deck, and what is missing if not.
// All three parts of the standard are measured on the calls of the standard's window.
import { callsSince, isRightCall, rightLatencies } from './crew-stats'
import type { CallRecord } from './crew-stats'
import { quantileSorted } from '../../../shared/utils/statistics'

export interface ReadinessStandard {
  // share of right calls needed, 0..1
  minAccuracy: number
  // calls needed on every (target type, aspect) pair of the deck
  minCallsPerTrack: number
  windowDays: number
  // whether calls graded offline (the phone held the answers in the pack) count (product.md, "Offline")
  offlineCounts: boolean
}

export const DEFAULT_STANDARD: Readonly<ReadinessStandard> = Object.freeze({ minAccuracy: 0.9, minCallsPerTrack: 2, windowDays: 14, offlineCounts: false })

export interface TrackKey {
  targetTypeId: string
  aspect: string
}

export interface ReadinessInput {
  calls: readonly CallRecord[]
  // every (target type, aspect) pair of the deck
  trackKeys: readonly TrackKey[]
  standard?: Partial<ReadinessStandard>
  // the deck's hesitation limit
  hesitationMs: number
  nowMs: number
}

export interface UncoveredTrack extends TrackKey {
  count: number
}

export interface Readiness {
  ready: boolean
  // one plain sentence per unmet part of the standard
  missing: string[]
  // over the window; null with no calls in it
  accuracy: number | null
  // of right calls in the window; null with none
  medianMs: number | null
  calls: number
  uncovered: UncoveredTrack[]
}

// Ratios of whole counts land on the nearest double, so exact boundaries compare equal; this
// only absorbs a standard typed with a stray last digit.
const EPS = 1e-12

/** 0.86 → "86%", 0.899 → "89.9%": rounded down to a tenth, so a shortfall never reads as the mark. */
function percentDown(x: number): string {
  return `${Math.floor(x * 1000 + 1e-9) / 10}%`
}

function percent(x: number): string {
  return `${Math.round(x * 1000) / 10}%`
}

/** 1620 → "1.62 s"; rounded up to a hundredth, so a median over the limit never reads as the limit. */
function secondsUp(ms: number): string {
  return `${(Math.ceil(ms / 10 - 1e-9) / 100).toFixed(2)} s`
}

function seconds(ms: number): string {
  return `${(Math.round(ms / 10) / 100).toFixed(2)} s`
}

/** The key of a (target type, aspect) pair in a tally's counts. */
export function trackKeyOf(targetTypeId: string, aspect: string): string {
  return `${targetTypeId}\u0000${aspect}`
}

/** What readiness reads of a window's calls: counts, right calls, their latencies, calls per pair. */
export interface ReadinessTally {
  calls: number
  right: number
  // latencies of the right calls, sorted ascending
  latencies: ArrayLike<number>
  // calls per (target type, aspect), keyed by trackKeyOf
  counts: ReadonlyMap<string, number>
}

/** The tally of the calls in the last `days` days up to nowMs on the deck's target types (offline ones only if they count). */
function tallyCalls(calls: readonly CallRecord[], trackKeys: readonly TrackKey[], nowMs: number, days: number, offlineCounts: boolean): ReadinessTally {
  const deckTypes = new Set(trackKeys.map(k => k.targetTypeId))
  const inWindow = callsSince(calls, nowMs, days).filter(c => deckTypes.has(c.targetTypeId) && (offlineCounts || !c.offline))
  const counts = new Map<string, number>()
  let right = 0
  for (const c of inWindow) {
    if (isRightCall(c)) right++
    const k = trackKeyOf(c.targetTypeId, c.aspect)
    counts.set(k, (counts.get(k) ?? 0) + 1)
  }
  return { calls: inWindow.length, right, latencies: rightLatencies(inWindow), counts }
}

/**
 * Ready when, over the last windowDays days (calledAt >= nowMs - windowDays·86 400 000):
 * accuracy >= minAccuracy (exactly the mark is ready), the median latency of right calls
 * <= hesitationMs (exactly the limit is ready), and every (target type, aspect) pair of the
 * deck called at least minCallsPerTrack times. Calls of target types outside the deck are ignored,
 * and so are calls graded offline unless the standard counts them.
 */
export function readiness(input: ReadinessInput): Readiness {
  const standard: ReadinessStandard = { ...DEFAULT_STANDARD, ...input.standard }
  const tally = tallyCalls(input.calls, input.trackKeys, input.nowMs, standard.windowDays, standard.offlineCounts)
  return readinessOfTally(tally, input.trackKeys, standard, input.hesitationMs)
}

/** Readiness from a window's tally (see readiness()); the crew table counts the tally in SQL. */
export function readinessOfTally(
  tally: ReadinessTally,
  trackKeys: readonly TrackKey[],
  partialStandard: Partial<ReadinessStandard> | undefined,
  hesitationMs: number,
): Readiness {
  const standard: ReadinessStandard = { ...DEFAULT_STANDARD, ...partialStandard }
  const days = standard.windowDays
  const period = `in the last ${days} day${days === 1 ? '' : 's'}`

  const keys = new Map<string, TrackKey>()
  for (const k of trackKeys) keys.set(trackKeyOf(k.targetTypeId, k.aspect), { targetTypeId: k.targetTypeId, aspect: k.aspect })
  const { counts, latencies } = tally
  const accuracy = tally.calls ? tally.right / tally.calls : null
  const medianMs = latencies.length ? quantileSorted(latencies, 0.5) : null

  const missing: string[] = []
  if (accuracy === null) {
    missing.push(`no calls ${period}`)
  }
  else if (accuracy < standard.minAccuracy - EPS) {
    missing.push(`accuracy ${percentDown(accuracy)} is below ${percent(standard.minAccuracy)}`)
  }
  if (accuracy !== null && medianMs === null) {
    missing.push(`no right calls ${period} to measure recognition speed on`)
  }
  else if (medianMs !== null && medianMs > hesitationMs) {
    missing.push(`median ${secondsUp(medianMs)} is over the ${seconds(hesitationMs)} hesitation limit`)
  }

  const uncovered: UncoveredTrack[] = []
  for (const [k, key] of keys) {
    const count = counts.get(k) ?? 0
    if (count < standard.minCallsPerTrack) uncovered.push({ ...key, count })
  }
  uncovered.sort((a, b) => a.count - b.count || a.targetTypeId.localeCompare(b.targetTypeId) || a.aspect.localeCompare(b.aspect))
  if (uncovered.length) {
    const pairs = uncovered.length === 1 ? '1 target type/aspect pair' : `${uncovered.length} target type/aspect pairs`
    const how = standard.minCallsPerTrack <= 1 ? 'not called' : `called fewer than ${standard.minCallsPerTrack} times`
    missing.push(`${pairs} ${how} in ${days} day${days === 1 ? '' : 's'}`)
  }

  return { ready: missing.length === 0, missing, accuracy, medianMs, calls: tally.calls, uncovered }
}
