import { describe, expect, it } from 'vitest'
import { LOOKOUT_EYE_HEIGHT_M, placeRange, planSighting, PX_BY_RUNG } from '../../../server/core/watch/sighting-plan'
import { horizonDistanceM, horizonDistanceNm } from '../../../shared/utils/apparent-size'
import type { PlanInput } from '../../../server/core/watch/sighting-plan'
import { seededRng } from '../../../server/core/watch/rng'

const ALL = ['backlit', 'sunlit', 'dark-cloud', 'white-cloud', 'haze', 'goggles']
const views = [{ id: 'v1', conditions: ALL }, { id: 'v2', conditions: ALL }]
const deck = { windowMs: 5000, minExposureMs: 200 }

// Plane geometry and the CSS reference pixel, written out here (check-values.md).
const pxAt = (size: number, range: number, mag: number) => (2 * Math.atan(size / (2 * range)) * 180 / Math.PI) * mag / 0.0213

function plans(track: PlanInput['track'], targetType: PlanInput['targetType'], n = 200) {
  return Array.from({ length: n }, (_, seed) => planSighting({ track, targetType, views, deck, rng: seededRng(seed) }))
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

  // Bowditch, The American Practical Navigator (1995 and 2002 editions, chapter 22, distance to the
  // visible horizon): D = 1.17·√h nautical miles with the height of eye h in feet, as printed there
  // (quoted from both editions in NavList, "Bowditch: Distance to visible horizon", R. Stuart, 2012).
  it('a vessel stays inside the horizon of a 15 m bridge wing (Bowditch: D = 1.17·√h nm, h in feet)', () => {
    const horizonM = 1.17 * Math.sqrt(15 / 0.3048) * 1852
    for (const p of plans({ reps: 9, stability: 60 }, { sizeM: 250, category: 'vessel' }, 50)) {
      expect(p.rangeM).toBeLessThanOrEqual(horizonM + 1e-6)
      expect(p.apparentPx).toBeLessThanOrEqual(320)
    }
  })

  it('a near target is seen with the naked eye', () => {
    const p = planSighting({ track: { reps: 0, stability: 0 }, targetType: { sizeM: 8, category: 'aircraft' }, views, deck, rng: seededRng(1) })
    expect(p.binoculars).toBe(false)
    expect(pxAt(8, p.rangeM, 1)).toBeCloseTo(p.apparentPx, 6)
  })

  it('is deterministic with a seed, and falls back to the easiest rendering a view has', () => {
    const input = { track: { reps: 2, stability: 3 }, targetType: { sizeM: 30, category: 'aircraft' }, views, deck }
    expect(planSighting({ ...input, rng: seededRng(7) })).toEqual(planSighting({ ...input, rng: seededRng(7) }))
    const hardOnly = [{ id: 'h', conditions: ['goggles', 'haze', 'dark-cloud'] }]
    const p = planSighting({ ...input, views: hardOnly, track: { reps: 0, stability: 0 }, rng: seededRng(3) })
    expect(p).toMatchObject({ viewId: 'h', condition: 'haze' })
    expect(() => planSighting({ ...input, views: [], rng: seededRng(3) })).toThrow(RangeError)
  })
})

// Issue 15, item 5: large targets get small. The stage bands are the product's (PX_BY_RUNG), the
// checks are plane geometry θ = 2·atan(s/2d), the CSS reference pixel 0.0213° (W3C CSS Values 3)
// and Bowditch's distance to the horizon d(nmi) = 1.17·√h(ft) (The American Practical Navigator,
// table of distance to the horizon), all written out here.
describe('placeRange: every stage band for every size from 10 to 300 m', () => {
  const lookoutHorizonM = 1.17 * Math.sqrt(15 / 0.3048) * 1852

  // Bowditch (1995 and 2002 editions, chapter 22): D = 1.17·√h, h in feet, D in nautical miles, with
  // refraction; the table of distance to the horizon lists it to 0.1 nm. (The metre form printed
  // beside it, 2.07·√h, does not agree with the feet form; the feet form is the one used.)
  it('matches the distance to the horizon at the table\'s heights, to its 0.1 nm (Bowditch)', () => {
    const table: [number, number][] = [[1, 1.2], [10, 3.7], [50, 8.3], [100, 11.7], [1000, 37.0]]
    for (const [feet, nm] of table) expect(Math.round(horizonDistanceNm(feet) * 10) / 10, `${feet} ft`).toBe(nm)
  })

  it('the lookout horizon of a 15 m (49.2 ft) eye is about 8.2 nm, 15.2 km (Bowditch)', () => {
    expect(lookoutHorizonM / 1852).toBeCloseTo(8.21, 2)
    expect(horizonDistanceM(LOOKOUT_EYE_HEIGHT_M)).toBeCloseTo(lookoutHorizonM, 6)
  })

  for (const category of ['vessel', 'aircraft']) {
    it(`${category}: the apparent size falls inside the band of each stage, by plane geometry`, () => {
      const out: string[] = []
      PX_BY_RUNG.forEach(([lo, hi], rung) => {
        for (let size = 10; size <= 300; size++) {
          for (const want of [lo, (lo + hi) / 2, hi]) {
            const p = placeRange(size, category, want)
            const px = pxAt(size, p.rangeM, p.binoculars ? 7 : 1)
            if (Math.abs(px - p.apparentPx) > 1e-6) out.push(`${size} m rung ${rung}: ${px} vs ${p.apparentPx}`)
            if (px < lo - 1e-9 || px > hi + 1e-9) out.push(`${size} m rung ${rung} want ${want}: ${px.toFixed(1)} px`)
            if (category === 'vessel' && p.rangeM > lookoutHorizonM + 1e-6) out.push(`${size} m beyond the horizon: ${p.rangeM}`)
            if (category === 'aircraft' && p.rangeM > 40_000 + 1e-6) out.push(`${size} m beyond 40 km: ${p.rangeM}`)
          }
        }
      })
      expect(out).toEqual([])
    })
  }

  it('a 168 m vessel held for weeks shows in 40-80 px (was 208 px: the range cut at the horizon)', () => {
    const p = placeRange(168, 'vessel', 60)
    // By eye at 168 / tan(60 × 0.0213°) ≈ 7.5 km, inside the 15.2 km horizon.
    expect(p.binoculars).toBe(false)
    expect(p.rangeM).toBeCloseTo(168 / (2 * Math.tan((60 * 0.0213 / 2) * Math.PI / 180)), 3)
    expect(p.apparentPx).toBeCloseTo(60, 6)
  })
})
