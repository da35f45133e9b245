// Plans a watch from a deck's content and a trainee's tracks: the one code that decides what a
// watch or a check shows (queue, view, condition, range, exposure, choices, ids). Pure apart from
// the random sources it is given, so the server and the demo history seed run the same code.
import { buildPracticeQueue, buildWatchQueue, insertReshow, placeIntroductions, PRACTICE_SIZE } from './queue'
import type { QueueTrack } from './queue'
import { planSighting } from './sighting-plan'
import type { SightingOverrides, SightingPlan } from './sighting-plan'
import { makeChoiceIds, pickChoices, sharedFeatureCount } from './choices'
import { seedFromString } from './rng'
import type { Rng } from './rng'
import type { TrackState } from '../scheduling/fsrs'
import { CONDITION_DIFFICULTY, isCondition } from '../../../shared/utils/conditions'
import { NEW_TRACK_MAX_EXPOSURE_MS } from '../../../shared/utils/exposure'

// Longest watch: a few minutes on a phone (common practice for short daily sessions, no source).
export const WATCH_MAX_SIGHTINGS = 30
// A track comes back at most this many times in one watch after misses.
export const MAX_RESHOWS_PER_TRACK = 2
// Noise masks shipped under public/masks/ (scripts/make-masks.ts).
export const MASK_COUNT = 8

/**
 * A sighting's picture at its own address, resolved on the server for the trainee it was issued to
 * (server/routes/images/s/[file].get.ts). Never the rendering's content hash: the same rendering in two
 * sightings has two addresses, so no list of renderings maps a sighting to its target type. Under
 * /images/ so the service worker keeps it for the offline watch (nuxt.config.ts, pwa).
 */
export function sightingImageUrl(sightingId: string) {
  return `/images/s/${sightingId}.webp`
}

/** The noise mask of a sighting: picked from its (random) id, so it says nothing about the answer. */
export function maskUrlFor(sightingId: string) {
  return `/masks/noise-${seedFromString(sightingId) % MASK_COUNT}.webp`
}

// New tracks are introduced broadside first, the head-on and tail-on aspects last (common practice, no source).
const ASPECT_ORDER = ['beam', 'plan', 'belly', 'bow-quarter', 'stern-quarter', 'head-on', 'tail-on']

export interface ContentDeck {
  id: string
  title: string
  category: string
  hesitationMs: number
  windowMs: number
  newPerDay: number
  retention: number
  choiceCount: number
  answerMode: string
  minExposureMs: number
}

export interface ContentType {
  id: string
  name: string
  category: string
  sizeM: number
  features: Record<string, string>
}

export interface ContentVariant { id: string, condition: string, file: string, width: number, height: number }
export interface ContentView { id: string, targetTypeId: string, aspect: string, variants: ContentVariant[] }

export interface DeckContent {
  deck: ContentDeck
  types: ContentType[]
  views: ContentView[]
  lookAlikes: Map<string, Set<string>>
}

export interface PlannedChoice { id: string, label: string, typeId: string }

/** A sighting as planned: the sighting plan's condition, range, size and exposure, on one rendering. */
export interface PlannedSighting extends Omit<SightingPlan, 'viewId' | 'condition'> {
  // null for a check's sighting, which belongs to no track
  trackId: string | null
  targetTypeId: string
  aspect: string
  variantId: string
  file: string
  width: number
  height: number
  condition: string
  choices: PlannedChoice[]
  answerChoiceId: string
}

export interface PlanTrack extends QueueTrack { state: TrackState }

export interface PlanContext {
  content: DeckContent
  // this crew's calls: shown type -> called type -> count
  confusions: ReadonlyMap<string, ReadonlyMap<string, number>>
  rng: Rng
  randomBytes: (size: number) => Uint8Array
}

export function viewsWithRenderings(content: DeckContent): ContentView[] {
  return content.views.filter(v => v.variants.some(x => isCondition(x.condition)))
}

/** The (target type, aspect) pairs a trainee holds tracks of: those with a rendered view, in introduction order. */
export function trackKeys(content: DeckContent): { targetTypeId: string, aspect: string }[] {
  const typeOrder = new Map(content.types.map((t, i) => [t.id, i]))
  const seen = new Set<string>()
  const out: { targetTypeId: string, aspect: string }[] = []
  for (const v of viewsWithRenderings(content)) {
    const key = `${v.targetTypeId}|${v.aspect}`
    if (seen.has(key) || !typeOrder.has(v.targetTypeId)) continue
    seen.add(key)
    out.push({ targetTypeId: v.targetTypeId, aspect: v.aspect })
  }
  const rank = (a: string) => (ASPECT_ORDER.indexOf(a) + ASPECT_ORDER.length + 1) % (ASPECT_ORDER.length + 1)
  return out.sort((a, b) => rank(a.aspect) - rank(b.aspect) || typeOrder.get(a.targetTypeId)! - typeOrder.get(b.targetTypeId)!)
}

/** Plans one sighting of a track (also used for a re-show after a miss). */
export function planTrackSighting(track: PlanTrack, ctx: PlanContext): PlannedSighting {
  return planTarget(track.id, track.targetTypeId, track.aspect, track.state, ctx)
}

/**
 * Plans one sighting of a check: the same choice of view, rendering, range, choices and ids as a
 * watch's, with the check's overrides (its condition, exposure and size band) in place of what the
 * track's ladder would give. A check's sighting belongs to no track.
 */
export function planCheckSighting(target: { targetTypeId: string, aspect: string }, fixed: SightingOverrides, ctx: PlanContext): PlannedSighting {
  return planTarget(null, target.targetTypeId, target.aspect, { reps: 0, stability: 0 }, ctx, fixed)
}

function planTarget(trackId: string | null, targetTypeId: string, aspect: string, state: { reps: number, stability: number }, ctx: PlanContext, fixed?: SightingOverrides): PlannedSighting {
  const { content, rng } = ctx
  const type = content.types.find(t => t.id === targetTypeId)
  if (!type) throw new RangeError(`track ${trackId ?? '(check)'} names a type outside the deck`)
  const views = viewsWithRenderings(content).filter(v => v.targetTypeId === targetTypeId && v.aspect === aspect)
  const plan = planSighting({
    track: { reps: state.reps, stability: state.stability },
    targetType: { sizeM: type.sizeM, category: type.category },
    views: views.map(v => ({ id: v.id, conditions: v.variants.map(x => x.condition) })),
    deck: { windowMs: content.deck.windowMs, minExposureMs: content.deck.minExposureMs },
    rng,
    fixed,
  })
  const view = views.find(v => v.id === plan.viewId)!
  // The phone-sized rendering of the planned condition (the narrowest at least 320 px wide).
  const variant = view.variants.filter(x => x.condition === plan.condition).sort((a, b) => a.width - b.width)
    .find(x => x.width >= 320) ?? view.variants.filter(x => x.condition === plan.condition)[0]!
  let choices: PlannedChoice[] = []
  let answerChoiceId: string
  if (content.deck.answerMode === 'typed') {
    answerChoiceId = makeChoiceIds(1, ctx.randomBytes)[0]!
  }
  else {
    const picked = pickChoices({
      correct: type,
      candidates: content.types,
      lookAlikeIds: content.lookAlikes.get(type.id),
      crewConfusions: ctx.confusions.get(type.id),
      count: content.deck.choiceCount,
      rng,
    })
    const ids = makeChoiceIds(picked.length, ctx.randomBytes)
    choices = picked.map((c, i) => ({ id: ids[i]!, label: c.label, typeId: c.typeId }))
    answerChoiceId = choices.find(c => c.typeId === type.id)!.id
  }
  return {
    trackId,
    targetTypeId: type.id,
    aspect,
    variantId: variant.id,
    file: variant.file,
    width: variant.width,
    height: variant.height,
    condition: plan.condition,
    rangeM: plan.rangeM,
    binoculars: plan.binoculars,
    apparentPx: plan.apparentPx,
    exposureMs: plan.exposureMs,
    untilCall: plan.untilCall,
    windowMs: plan.windowMs,
    choices,
    answerChoiceId,
  }
}

export interface PlanWatchInput extends PlanContext {
  tracks: readonly PlanTrack[]
  nowMs: number
  newIntroducedToday: number
  maxSightings?: number
}

export interface PlannedIntroduction {
  trackId: string
  targetTypeId: string
  aspect: string
  // index in the planned sightings of the sighting it is shown just before
  beforeIndex: number
  lookAlikeTypeId: string | null
}

export interface PlannedWatch { sightings: PlannedSighting[], introductions: PlannedIntroduction[] }

/**
 * The day's watch: the queue of buildWatchQueue (due first by retrievability, new up to the deck's
 * limit less those introduced today, no type twice in a row), each sighting planned, with its
 * introductions: each new track is introduced (placeIntroductions) before its first timed sighting,
 * beside its nearest look-alike. A practice watch (asked for when nothing is due) takes
 * buildPracticeQueue's tracks instead and introduces nothing.
 */
export function planWatch(input: PlanWatchInput & { practice?: boolean }): PlannedWatch {
  const { content, tracks, nowMs } = input
  const keyed = new Set(trackKeys(content).map(k => `${k.targetTypeId}|${k.aspect}`))
  const usable = tracks.filter(t => keyed.has(`${t.targetTypeId}|${t.aspect}`))
  const byId = new Map(usable.map(t => [t.id, t]))
  if (input.practice) {
    const queue = buildPracticeQueue({ tracks: usable, nowMs, confusedTypeIds: worstConfusedTypes(input.confusions), size: PRACTICE_SIZE })
    return { sightings: queue.map(id => planTrackSighting(byId.get(id)!, input)), introductions: [] }
  }
  const queue = buildWatchQueue({
    tracks: usable,
    nowMs,
    retention: content.deck.retention,
    newPerDay: content.deck.newPerDay,
    newIntroducedToday: input.newIntroducedToday,
    maxSightings: input.maxSightings ?? WATCH_MAX_SIGHTINGS,
  })
  const sightings = queue.map(id => planTrackSighting(byId.get(id)!, input))
  const fresh = new Set(queue.filter(id => byId.get(id)!.state.reps === 0))
  const introductions: PlannedIntroduction[] = []
  let k = 0
  for (const item of placeIntroductions(queue, fresh)) {
    if (item.kind === 'sighting') {
      k++
      continue
    }
    const t = byId.get(item.trackId)!
    introductions.push({
      trackId: t.id, targetTypeId: t.targetTypeId, aspect: t.aspect, beforeIndex: k,
      lookAlikeTypeId: nearestLookAlike(content, t.targetTypeId, input.confusions),
    })
  }
  return { sightings, introductions }
}

/** Is there anything to practise: a track called before (practice takes nothing else)? */
export function canPractise(tracks: readonly PlanTrack[]) {
  return tracks.some(t => t.state.reps > 0)
}

// Type ids of the crew's confused pairs, the most frequent pair first, both sides of each pair.
function worstConfusedTypes(confusions: PlanContext['confusions']): string[] {
  const pairs: { a: string, b: string, n: number }[] = []
  for (const [shown, called] of confusions) for (const [other, n] of called) pairs.push({ a: shown, b: other, n })
  pairs.sort((x, y) => y.n - x.n || (x.a + x.b < y.a + y.b ? -1 : 1))
  return [...new Set(pairs.flatMap(p => [p.a, p.b]))]
}

/**
 * The type a trainee is most likely to take for `typeId`: of its category, ranked by the crew's
 * confusions (both ways), the instructor's look-alikes, shared feature words, then deck order.
 */
export function nearestLookAlike(content: DeckContent, typeId: string, confusions: PlanContext['confusions']): string | null {
  const type = content.types.find(t => t.id === typeId)
  if (!type) return null
  const marked = content.lookAlikes.get(typeId)
  const confused = (other: string) => (confusions.get(typeId)?.get(other) ?? 0) + (confusions.get(other)?.get(typeId) ?? 0)
  const hasView = new Set(viewsWithRenderings(content).map(v => v.targetTypeId))
  const ranked = content.types
    .map((t, i) => ({ t, i }))
    .filter(x => x.t.id !== typeId && x.t.category === type.category && hasView.has(x.t.id))
    .sort((x, y) => confused(y.t.id) - confused(x.t.id)
      || Number(!!marked?.has(y.t.id)) - Number(!!marked?.has(x.t.id))
      || sharedFeatureCount(y.t.features, type.features) - sharedFeatureCount(x.t.features, type.features)
      || x.i - y.i)
  return ranked[0]?.t.id ?? null
}

// A picture for teaching is in good light: sunlit first, then the easiest conditions (CONDITION_DIFFICULTY).
const TEACHING_CONDITIONS = ['sunlit', ...CONDITION_DIFFICULTY.filter(c => c !== 'sunlit')]

/**
 * The rendering a type is shown in when it is taught (introduction, reveal): at the aspect asked
 * if the type has a view there, else at its first aspect in introduction order; in good light;
 * the widest rendering. Null when the type has no rendered view.
 */
export function teachingVariant(content: DeckContent, typeId: string, aspect: string): { aspect: string, variant: ContentVariant } | null {
  const views = viewsWithRenderings(content).filter(v => v.targetTypeId === typeId)
  if (!views.length) return null
  const rank = (a: string) => (a === aspect ? -1 : ASPECT_ORDER.indexOf(a) + 1 || ASPECT_ORDER.length + 1)
  const view = views.slice().sort((a, b) => rank(a.aspect) - rank(b.aspect))[0]!
  const conditionRank = (c: string) => TEACHING_CONDITIONS.indexOf(c as typeof TEACHING_CONDITIONS[number]) + 1 || 99
  const variant = view.variants.filter(x => isCondition(x.condition))
    .sort((a, b) => conditionRank(a.condition) - conditionRank(b.condition) || b.width - a.width)[0]!
  return { aspect: view.aspect, variant }
}

/**
 * Where a re-show goes among the sightings still to come: `remaining` is the order after the
 * missed one (its type first), the re-show at least three others later (insertReshow).
 * Returns the new order of ids, the re-show's id included.
 */
export function reshowOrder(missedId: string, remaining: readonly { id: string, typeId: string }[], reshow: { id: string, typeId: string }): string[] {
  const types = new Map([[missedId, reshow.typeId], [reshow.id, reshow.typeId], ...remaining.map(r => [r.id, r.typeId] as [string, string])])
  const queue = [missedId, ...remaining.map(r => r.id)]
  return insertReshow(queue, reshow.id, 0, id => types.get(id)!).slice(1)
}

// A stored sighting keeps no flag: an image that may stay the longest rung stays until the call,
// which is the same thing on screen (the sighting ends at the call either way).
export function isUntilCall(exposureMs: number) {
  return exposureMs >= NEW_TRACK_MAX_EXPOSURE_MS
}
