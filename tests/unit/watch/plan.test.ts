// The one plan of a watch and of a check's sightings (server/core/watch/plan.ts), on an invented
// deck. Expected values are outside ones (plane geometry and the CSS reference pixel of
// check-values.md, 7x binoculars) or the product's design values, named as such where used.
import { describe, expect, it } from 'vitest'
import { newTrackState } from '../../../server/core/scheduling/fsrs'
import type { TrackState } from '../../../server/core/scheduling/fsrs'
import { planCheckSighting, planTrackSighting, planWatch, trackKeys } from '../../../server/core/watch/plan'
import type { DeckContent, PlanContext, PlanTrack } from '../../../server/core/watch/plan'
import { seededRng } from '../../../server/core/watch/rng'

const DAY = 86_400_000
const NOW = Date.UTC(2026, 2, 3, 8)

// Plane geometry and the CSS reference pixel (1 px = 0.0213°, W3C CSS Values 3; check-values.md).
const pxAt = (sizeM: number, rangeM: number, magnification: number) => (2 * Math.atan(sizeM / (2 * rangeM)) * 180 / Math.PI) * magnification / 0.0213
// 7x binoculars (7x50, the lookout's common glass: common practice, no source).
const BINOCULARS = 7

const CONDITIONS = ['sunlit', 'white-cloud', 'backlit', 'haze', 'dark-cloud', 'goggles']
// Each view rendered at a phone width (360) and a desktop width (960), under every condition, plus a
// too-narrow 200 px one under sunlit only: the phone shows the narrowest rendering at least 320 px wide.
function view(typeId: string, aspect: string, n: number) {
  const id = `${typeId}-${aspect}-${n}`
  return {
    id, targetTypeId: typeId, aspect,
    variants: [
      { id: `${id}-sunlit-200`, condition: 'sunlit', file: `${id}-s200.webp`, width: 200, height: 134 },
      ...CONDITIONS.flatMap(c => [960, 360].map(w => ({ id: `${id}-${c}-${w}`, condition: c, file: `${id}-${c}-${w}.webp`, width: w, height: Math.round(w * 0.67) }))),
    ],
  }
}

function deck(overrides: Partial<DeckContent['deck']> = {}): DeckContent {
  const types = ['fighter', 'trainer', 'airliner', 'helicopter', 'transport'].map((name, i) => ({
    id: `t${i}`, name: `Type ${name}`, category: 'aircraft', sizeM: 12 + 6 * i, features: { wings: i % 2 ? 'swept' : 'straight', engines: `${1 + i % 3}` },
  }))
  return {
    deck: {
      id: 'd1', title: 'Invented aircraft', category: 'aircraft', hesitationMs: 1500, windowMs: 5000, newPerDay: 3, retention: 0.9,
      choiceCount: 4, answerMode: 'choices', minExposureMs: 200, ...overrides,
    },
    types,
    views: types.flatMap(t => [view(t.id, 'head-on', 1), view(t.id, 'beam', 1), view(t.id, 'beam', 2)]),
    lookAlikes: new Map([['t0', new Set(['t1'])], ['t1', new Set(['t0'])]]),
  }
}

function ctx(content: DeckContent, seed: number): PlanContext {
  const rng = seededRng(seed)
  let n = 0
  return { content, confusions: new Map(), rng, randomBytes: size => Uint8Array.from({ length: size }, () => (n++ * 37 + seed) & 255) }
}

function held(stability: number, dueInDays: number, reps = 4): TrackState {
  return { ...newTrackState(NOW), stability, difficulty: 5, reps, state: 2, due: NOW + dueInDays * DAY, lastReview: NOW - 5 * DAY, scheduledDays: 5 }
}

const CHECK = { exposureMs: 500, pxBand: [100, 160] as const }

describe('planCheckSighting: a check\'s sighting planned by the watch\'s code with the check\'s overrides', () => {
  const content = deck()
  it('shows the asked type, aspect and condition, at the check\'s exposure, in its size band, on a phone-sized rendering', () => {
    for (let seed = 1; seed <= 60; seed++) {
      const condition = CONDITIONS[seed % CONDITIONS.length]!
      const p = planCheckSighting({ targetTypeId: 't2', aspect: 'beam' }, { ...CHECK, condition }, ctx(content, seed))
      expect(p).toMatchObject({ trackId: null, targetTypeId: 't2', aspect: 'beam', condition, exposureMs: 500, untilCall: false, windowMs: 5000 })
      // the narrowest rendering at least 320 px wide: the 360 px one of that condition (design value)
      expect(p.width).toBe(360)
      expect(p.variantId).toMatch(new RegExp(`^t2-beam-[12]-${condition}-360$`))
      expect(p.apparentPx).toBeGreaterThanOrEqual(100)
      expect(p.apparentPx).toBeLessThanOrEqual(160)
      expect(pxAt(24, p.rangeM, p.binoculars ? BINOCULARS : 1)).toBeCloseTo(p.apparentPx, 6)
    }
  })

  it('draws among every view rendered under the condition, as a watch does', () => {
    const views = new Set(Array.from({ length: 40 }, (_, seed) =>
      planCheckSighting({ targetTypeId: 't2', aspect: 'beam' }, { ...CHECK, condition: 'goggles' }, ctx(content, seed)).variantId.split('-goggles')[0]))
    expect(views).toEqual(new Set(['t2-beam-1', 't2-beam-2']))
  })

  it('a long exposure stays until the call (4 s and more, the ladder\'s first rung: design value); the window never shorter than it', () => {
    const p = planCheckSighting({ targetTypeId: 't0', aspect: 'head-on' }, { ...CHECK, exposureMs: 6000, condition: 'haze' }, ctx(content, 3))
    expect(p).toMatchObject({ exposureMs: 6000, untilCall: true, windowMs: 6000 })
  })

  it('offers the deck\'s number of names, the right one among them, under unique ids; a typed deck offers none', () => {
    const p = planCheckSighting({ targetTypeId: 't1', aspect: 'beam' }, { ...CHECK, condition: 'sunlit' }, ctx(content, 9))
    expect(p.choices).toHaveLength(4)
    expect(new Set(p.choices.map(c => c.id)).size).toBe(4)
    expect(p.choices.find(c => c.id === p.answerChoiceId)?.typeId).toBe('t1')
    expect(p.choices.find(c => c.id === p.answerChoiceId)?.label).toBe('Type trainer')
    // the instructor's look-alike of t1 is always offered beside it (product.md: choices from look-alikes)
    expect(p.choices.map(c => c.typeId)).toContain('t0')
    const typed = planCheckSighting({ targetTypeId: 't1', aspect: 'beam' }, { ...CHECK, condition: 'sunlit' }, ctx(deck({ answerMode: 'typed' }), 9))
    expect(typed.choices).toEqual([])
    expect(typed.answerChoiceId).toMatch(/\S/)
  })

  it('refuses a condition the aspect has no rendering under, and an unknown one', () => {
    const bare = deck()
    bare.views = bare.views.map(v => ({ ...v, variants: v.variants.filter(x => x.condition !== 'goggles') }))
    expect(() => planCheckSighting({ targetTypeId: 't1', aspect: 'beam' }, { ...CHECK, condition: 'goggles' }, ctx(bare, 1))).toThrow(RangeError)
    expect(() => planCheckSighting({ targetTypeId: 't1', aspect: 'beam' }, { ...CHECK, condition: 'fog' }, ctx(content, 1))).toThrow(RangeError)
  })
})

describe('planTrackSighting: the ladder decides when no override is given', () => {
  it('a new track: large (220-260 px), until the call at most 4 s, in easy light (product rule: design values)', () => {
    const content = deck()
    for (let seed = 0; seed < 40; seed++) {
      const p = planTrackSighting({ id: 'k', targetTypeId: 't3', aspect: 'beam', state: newTrackState(NOW) }, ctx(content, seed))
      expect(p).toMatchObject({ trackId: 'k', exposureMs: 4000, untilCall: true })
      expect(['sunlit', 'white-cloud', 'backlit']).toContain(p.condition)
      expect(p.apparentPx).toBeGreaterThanOrEqual(220)
      expect(p.apparentPx).toBeLessThanOrEqual(260)
      expect(pxAt(30, p.rangeM, p.binoculars ? BINOCULARS : 1)).toBeCloseTo(p.apparentPx, 6)
      expect(p.width).toBe(360)
    }
  })
})

describe('trackKeys and planWatch', () => {
  it('keys every (type, aspect) with a rendering, broadside before head-on (introduction order: common practice)', () => {
    const keys = trackKeys(deck())
    expect(keys).toHaveLength(10)
    expect(keys.slice(0, 5).every(k => k.aspect === 'beam')).toBe(true)
    expect(keys.slice(5).every(k => k.aspect === 'head-on')).toBe(true)
    expect(keys.map(k => k.targetTypeId).slice(0, 5)).toEqual(['t0', 't1', 't2', 't3', 't4'])
  })

  it('a day\'s watch: the due tracks, new ones up to the deck\'s limit less those introduced today, no type twice in a row, each new one introduced first', () => {
    const content = deck({ newPerDay: 3 })
    const keys = trackKeys(content)
    const tracks: PlanTrack[] = keys.map((k, i) => ({
      id: `k${i}`, ...k,
      // four held and due, two held and not due for a week, the rest new
      state: i < 4 ? held(10, -1) : i < 6 ? held(20, 7) : newTrackState(NOW),
    }))
    const plan = planWatch({ ...ctx(content, 5), tracks, nowMs: NOW, newIntroducedToday: 1 })
    const ids = plan.sightings.map(s => s.trackId)
    expect(new Set(ids)).toEqual(new Set(['k0', 'k1', 'k2', 'k3', ...ids.filter(id => Number(id!.slice(1)) >= 6)]))
    expect(ids.filter(id => Number(id!.slice(1)) >= 6)).toHaveLength(2)
    expect(ids).not.toContain('k4')
    expect(ids).not.toContain('k5')
    const types = plan.sightings.map(s => s.targetTypeId)
    expect(types.every((t, i) => i === 0 || t !== types[i - 1])).toBe(true)
    // each new track is introduced, once, no later than its first sighting
    const fresh = plan.sightings.map((s, i) => ({ s, i })).filter(x => Number(x.s.trackId!.slice(1)) >= 6)
    expect(plan.introductions.map(x => x.trackId).sort()).toEqual(fresh.map(x => x.s.trackId).sort())
    for (const intro of plan.introductions) {
      expect(intro.beforeIndex).toBeLessThanOrEqual(fresh.find(x => x.s.trackId === intro.trackId)!.i)
      // beside a type of its own category: here every type is an aircraft, never itself
      expect(intro.lookAlikeTypeId).not.toBe(intro.targetTypeId)
    }
  })
})
