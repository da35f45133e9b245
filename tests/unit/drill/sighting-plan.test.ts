import { describe, expect, it } from 'vitest'
import { planSighting } from '../../../server/core/watch/sighting-plan'
import type { PlanInput } from '../../../server/core/watch/sighting-plan'
import { mulberry32 } from '../../../server/core/watch/rng'

const ALL = ['backlit', 'sunlit', 'dark-cloud', 'white-cloud', 'haze', 'goggles']
const views = [{ id: 'v1', conditions: ALL }, { id: 'v2', conditions: ALL }]
const deck = { windowMs: 5000, minExposureMs: 200 }

// Plane geometry and the CSS reference pixel, written out here (check-values.md).
const pxAt = (size: number, range: number, mag: number) => (2 * Math.atan(size / (2 * range)) * 180 / Math.PI) * mag / 0.0213

function plans(track: PlanInput['track'], targetType: PlanInput['targetType'], n = 200) {
  return Array.from({ length: n }, (_, seed) => planSighting({ track, targetType, views, deck, rng: mulberry32(seed) }))
}

describe('planSighting', () => {
  // product.md, The trade: easy cases are a dark shape crossing white cloud and a sunlit target on blue
  // sky; a backlit dark shape on bright sky keeps the same high contrast (common practice, no source).
  it('a new track: easy conditions, large (about 240 px), until the call (at most 4 s)', () => {
    const seen = new Set<string>()
    for (const p of plans({ reps: 0, stability: 0 }, { sizeM: 18, category: 'aircraft' })) {
      seen.add(p.condition)
      expect(p.apparentPx).toBeGreaterThanOrEqual(220)
      expect(p.apparentPx).toBeLessThanOrEqual(260)
      expect(p).toMatchObject({ untilCall: true, exposureMs: 4000 })
      expect(p.windowMs).toBeGreaterThanOrEqual(p.exposureMs)
    }
    expect(seen).toEqual(new Set(['white-cloud', 'sunlit', 'backlit']))
  })

  it('a track holding past 30 days: any condition, small (down to about 40 px), 0.2 s', () => {
    const out = plans({ reps: 8, stability: 45 }, { sizeM: 18, category: 'aircraft' })
    expect(new Set(out.map(p => p.condition))).toEqual(new Set(ALL))
    for (const p of out) {
      expect(p.apparentPx).toBeGreaterThanOrEqual(40)
      expect(p.apparentPx).toBeLessThanOrEqual(80)
      expect(p).toMatchObject({ untilCall: false, exposureMs: 200, windowMs: 5000 })
    }
  })

  it('ranges grow with stability', () => {
    const median = (xs: number[]) => xs.sort((a, b) => a - b)[xs.length >> 1]!
    const ranges = [0.5, 3, 15, 45].map(s => median(plans({ reps: 3, stability: s }, { sizeM: 18, category: 'aircraft' }).map(p => p.rangeM)))
    expect(ranges).toEqual([...ranges].sort((a, b) => a - b))
    expect(ranges[3]!).toBeGreaterThan(ranges[0]! * 2)
  })

  it('range and apparent size agree by plane geometry and the CSS reference pixel', () => {
    for (const p of plans({ reps: 3, stability: 10 }, { sizeM: 120, category: 'vessel' }, 50)) {
      expect(pxAt(120, p.rangeM, p.binoculars ? 7 : 1)).toBeCloseTo(p.apparentPx, 6)
    }
  })

  it('a vessel stays inside the horizon of a 15 m bridge wing (Bowditch 1.17·√h nm, from memory)', () => {
    const horizonM = 1.17 * Math.sqrt(15 / 0.3048) * 1852
    for (const p of plans({ reps: 9, stability: 60 }, { sizeM: 250, category: 'vessel' }, 50)) {
      expect(p.rangeM).toBeLessThanOrEqual(horizonM + 1e-6)
      expect(p.apparentPx).toBeLessThanOrEqual(320)
    }
  })

  it('a near target is seen with the naked eye', () => {
    const p = planSighting({ track: { reps: 0, stability: 0 }, targetType: { sizeM: 8, category: 'aircraft' }, views, deck, rng: mulberry32(1) })
    expect(p.binoculars).toBe(false)
    expect(pxAt(8, p.rangeM, 1)).toBeCloseTo(p.apparentPx, 6)
  })

  it('is deterministic with a seed, and falls back to the easiest rendering a view has', () => {
    const input = { track: { reps: 2, stability: 3 }, targetType: { sizeM: 30, category: 'aircraft' }, views, deck }
    expect(planSighting({ ...input, rng: mulberry32(7) })).toEqual(planSighting({ ...input, rng: mulberry32(7) }))
    const hardOnly = [{ id: 'h', conditions: ['goggles', 'haze', 'dark-cloud'] }]
    const p = planSighting({ ...input, views: hardOnly, track: { reps: 0, stability: 0 }, rng: mulberry32(3) })
    expect(p).toMatchObject({ viewId: 'h', condition: 'haze' })
    expect(() => planSighting({ ...input, views: [], rng: mulberry32(3) })).toThrow(RangeError)
  })
})
