// The watch queue: which tracks a day's watch shows, in which order.
import { State } from 'ts-fsrs'
import { retrievability } from '../scheduling/fsrs'
import type { TrackState } from '../scheduling/fsrs'
import { RESHOW_GAP } from '../../../shared/utils/call'

export interface QueueTrack {
  id: string
  targetTypeId: string
  aspect: string
  state: TrackState
}

export interface WatchQueueInput {
  tracks: readonly QueueTrack[]
  nowMs: number
  // the deck's desired retention; accepted for symmetry with the scheduler, the order does not depend on it
  retention?: number
  // the deck's new tracks per day, and how many were already introduced today
  newPerDay: number
  newIntroducedToday: number
  // cap on the watch's length (due tracks are kept before new ones)
  maxSightings?: number
}

/**
 * Builds a watch's queue of track ids:
 * 1. due tracks (called before and due <= nowMs), lowest retrievability first
 *    (ties: earlier due, then id);
 * 2. then new tracks (never called), in the order given, up to newPerDay - newIntroducedToday;
 * 3. cut to maxSightings;
 * 4. reordered so that no target type comes twice in a row (see spreadByType).
 * Tracks called before but not yet due are left out.
 */
export function buildWatchQueue(input: WatchQueueInput): string[] {
  const { tracks, nowMs, newPerDay, newIntroducedToday, maxSightings } = input
  if (!Number.isFinite(nowMs)) throw new RangeError(`nowMs must be finite, got ${nowMs}`)
  if (!Number.isInteger(newPerDay) || newPerDay < 0) throw new RangeError(`newPerDay must be a whole number >= 0, got ${newPerDay}`)
  if (!Number.isInteger(newIntroducedToday) || newIntroducedToday < 0) {
    throw new RangeError(`newIntroducedToday must be a whole number >= 0, got ${newIntroducedToday}`)
  }
  if (maxSightings !== undefined && (!Number.isInteger(maxSightings) || maxSightings < 0)) {
    throw new RangeError(`maxSightings must be a whole number >= 0, got ${maxSightings}`)
  }
  if (input.retention !== undefined && !(input.retention > 0 && input.retention < 1)) {
    throw new RangeError(`retention must be in (0, 1), got ${input.retention}`)
  }

  const seen = new Set<string>()
  const due: { track: QueueTrack, r: number }[] = []
  const fresh: QueueTrack[] = []
  for (const track of tracks) {
    if (seen.has(track.id)) continue
    seen.add(track.id)
    if (track.state.state === State.New || track.state.reps === 0) fresh.push(track)
    else if (track.state.due <= nowMs) due.push({ track, r: retrievability(track.state, nowMs) })
  }
  due.sort((a, b) => a.r - b.r || a.track.state.due - b.track.state.due || (a.track.id < b.track.id ? -1 : a.track.id > b.track.id ? 1 : 0))

  const newAllowed = Math.max(0, newPerDay - newIntroducedToday)
  let ordered = [...due.map(d => d.track), ...fresh.slice(0, newAllowed)]
  if (maxSightings !== undefined) ordered = ordered.slice(0, maxSightings)
  return spreadByType(ordered, t => t.targetTypeId).map(t => t.id)
}

// Can `counts` (n items in all) be laid out with no type twice in a row and not starting with `last`?
// Yes iff every other type has at most ceil(n/2) items and `last` at most floor(n/2).
function arrangeable(counts: Map<string, number>, n: number, last: string | undefined): boolean {
  for (const [type, c] of counts) {
    if (c > (type === last ? Math.floor(n / 2) : Math.ceil(n / 2))) return false
  }
  return true
}

/**
 * Reorders items so that no two neighbours share a type, keeping the given priority order
 * as far as possible: at each place it takes the earliest remaining item of another type
 * after which the rest can still be laid out. When no such order exists (one type has
 * more than half the items, e.g. a deck with a single target type), neighbours of the same
 * type are unavoidable: it then still takes the earliest item of another type when there is one.
 */
export function spreadByType<T>(items: readonly T[], typeOf: (item: T) => string): T[] {
  const rest = items.slice()
  const counts = new Map<string, number>()
  for (const item of rest) counts.set(typeOf(item), (counts.get(typeOf(item)) ?? 0) + 1)
  const out: T[] = []
  let last: string | undefined
  while (rest.length > 0) {
    let pick = -1
    let fallback = -1
    for (let i = 0; i < rest.length; i++) {
      const type = typeOf(rest[i]!)
      if (type === last) continue
      if (fallback < 0) fallback = i
      counts.set(type, counts.get(type)! - 1)
      const ok = arrangeable(counts, rest.length - 1, type)
      counts.set(type, counts.get(type)! + 1)
      if (ok) {
        pick = i
        break
      }
    }
    if (pick < 0) pick = fallback >= 0 ? fallback : 0
    const [item] = rest.splice(pick, 1)
    const type = typeOf(item!)
    counts.set(type, counts.get(type)! - 1)
    if (counts.get(type) === 0) counts.delete(type)
    out.push(item!)
    last = type
  }
  return out
}

// At least RESHOW_GAP other sightings come between a missed sighting and its re-show.
export { RESHOW_GAP }

/**
 * Puts a missed track back into the queue after at least RESHOW_GAP other sightings
 * following the current one (queue[currentIndex] is the sighting just missed), or at
 * the end when fewer remain. With typeOf, the re-show moves further back until its
 * neighbours are of other types, if such a place exists. Returns a new queue.
 */
export function insertReshow(
  queue: readonly string[],
  missedTrackId: string,
  currentIndex: number,
  typeOf?: (trackId: string) => string,
): string[] {
  if (!Number.isInteger(currentIndex) || currentIndex < 0 || currentIndex >= queue.length) {
    throw new RangeError(`currentIndex must point into the queue, got ${currentIndex}`)
  }
  const out = queue.slice()
  const earliest = currentIndex + 1 + RESHOW_GAP
  if (earliest >= out.length) {
    out.push(missedTrackId)
    return out
  }
  let at = earliest
  if (typeOf) {
    const type = typeOf(missedTrackId)
    const clash = (i: number) => typeOf(out[i - 1]!) === type || (i < out.length && typeOf(out[i]!) === type)
    while (at <= out.length && clash(at)) at++
    if (at > out.length) at = earliest
  }
  out.splice(at, 0, missedTrackId)
  return out
}

/** At least this many other appearances come between a track's introduction and its first timed sighting. */
export const INTRO_GAP = 2

export type WatchItem = { kind: 'introduction' | 'sighting', trackId: string }

/**
 * Puts an introduction before the first timed sighting of each new track: as late as leaves
 * INTRO_GAP other sightings between them, or, near the start of the watch where fewer sightings
 * come before, at the start with the other introductions in between (so INTRO_GAP other
 * appearances still separate them whenever the watch holds INTRO_GAP + 1 tracks). Introductions
 * that share a place keep the order of their sightings. Only the first sighting of a track is
 * introduced; a track not in the queue is not introduced.
 */
export function placeIntroductions(queue: readonly string[], newTrackIds: ReadonlySet<string>, gap = INTRO_GAP): WatchItem[] {
  if (!Number.isInteger(gap) || gap < 0) throw new RangeError(`gap must be a whole number >= 0, got ${gap}`)
  const before = new Map<number, string[]>()
  const introduced = new Set<string>()
  queue.forEach((trackId, k) => {
    if (!newTrackIds.has(trackId) || introduced.has(trackId)) return
    introduced.add(trackId)
    const at = Math.max(0, k - gap)
    if (!before.has(at)) before.set(at, [])
    before.get(at)!.push(trackId)
  })
  const out: WatchItem[] = []
  queue.forEach((trackId, k) => {
    for (const t of before.get(k) ?? []) out.push({ kind: 'introduction', trackId: t })
    out.push({ kind: 'sighting', trackId })
  })
  return out
}

export interface PracticeInput {
  tracks: readonly QueueTrack[]
  nowMs: number
  // target type ids of the crew's worst confusions, worst first (either side of a confused pair)
  confusedTypeIds: readonly string[]
  size: number
}

/** Sightings in a practice watch when the deck sets none (product.md: a short practice). */
export const PRACTICE_SIZE = 10

/**
 * A practice queue when nothing is due: tracks called before, taken in turn from two lists, the
 * lowest retrievability first and the tracks of the crew's worst-confused types, each track once,
 * up to `size`, then spread so no type comes twice in a row. New tracks are not practised (they
 * come through introductions on their day).
 */
export function buildPracticeQueue(input: PracticeInput): string[] {
  const { tracks, nowMs, confusedTypeIds, size } = input
  if (!Number.isFinite(nowMs)) throw new RangeError(`nowMs must be finite, got ${nowMs}`)
  if (!Number.isInteger(size) || size < 0) throw new RangeError(`size must be a whole number >= 0, got ${size}`)
  const known = tracks.filter(t => t.state.state !== State.New && t.state.reps > 0)
  const byR = known.map(t => ({ t, r: retrievability(t.state, nowMs) }))
    .sort((a, b) => a.r - b.r || (a.t.id < b.t.id ? -1 : a.t.id > b.t.id ? 1 : 0)).map(x => x.t)
  const rank = new Map(confusedTypeIds.map((id, i) => [id, i]))
  const byConfusion = byR.filter(t => rank.has(t.targetTypeId))
    .sort((a, b) => rank.get(a.targetTypeId)! - rank.get(b.targetTypeId)!)
  const lists = [byR, byConfusion]
  const at = [0, 0]
  const picked: QueueTrack[] = []
  const taken = new Set<string>()
  while (picked.length < size) {
    let next: QueueTrack | undefined
    // The two lists take turns; when one runs out the other goes on.
    for (let tries = 0; tries < 2 && !next; tries++) {
      const l = (picked.length + tries) % 2
      const list = lists[l]!
      while (at[l]! < list.length && taken.has(list[at[l]!]!.id)) at[l]!++
      next = list[at[l]!]
    }
    if (!next) break
    taken.add(next.id)
    picked.push(next)
  }
  return spreadByType(picked, t => t.targetTypeId).map(t => t.id)
}
