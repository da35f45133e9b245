import { describe, expect, it } from 'vitest'
import {
  apparentAngleDeg,
  apparentPx,
  CSS_REFERENCE_PIXEL_DEG,
  horizonDistanceM,
  horizonDistanceNm,
  magnifiedAngleDeg,
  rangeForPx,
} from '../../../shared/utils/apparent-size'

describe('apparent angle: plane geometry θ = 2·atan(s / 2d)', () => {
  it('a target as wide as twice its range fills a right angle (atan 1 = 45°)', () => {
    expect(apparentAngleDeg(200, 100)).toBeCloseTo(90, 10)
  })

  it('agrees with the small-angle approximation θ ≈ s/d rad for a far target', () => {
    // 20 m at 2000 m: 0.01 rad = 0.573°
    expect(apparentAngleDeg(20, 2000)).toBeCloseTo(0.573, 3)
  })

  it('7x binoculars multiply the angle (product.md, The drill 4): 0.573° → 4.01°', () => {
    expect(magnifiedAngleDeg(20, 2000)).toBeCloseTo(4.01, 2)
    expect(magnifiedAngleDeg(20, 2000, 1)).toBeCloseTo(0.573, 3)
  })
})

describe('CSS pixels via the reference pixel (W3C CSS Values and Units Level 3)', () => {
  it('the constant is the visual angle of a 1/96 in pixel seen from 28 in', () => {
    const inch = 0.0254
    expect(apparentAngleDeg(inch / 96, 28 * inch)).toBeCloseTo(CSS_REFERENCE_PIXEL_DEG, 4)
  })

  it('a 20 m target at 2000 m through 7x shows about 188 px', () => {
    expect(apparentPx(20, 2000)).toBeCloseTo(4.0107 / 0.0213, 0)
    expect(Math.round(apparentPx(20, 2000))).toBe(188)
    expect(apparentPx(20, 2000, 1)).toBeCloseTo(0.5730 / 0.0213, 1)
  })

  it('rangeForPx inverts apparentPx', () => {
    for (const [size, px, m] of [[20, 188, 7], [150, 40, 7], [12, 240, 1]] as const) {
      expect(apparentPx(size, rangeForPx(size, px, m), m)).toBeCloseTo(px, 8)
    }
    expect(rangeForPx(20, apparentPx(20, 2000))).toBeCloseTo(2000, 6)
  })

  it('rejects impossible input', () => {
    expect(() => apparentAngleDeg(0, 100)).toThrow(RangeError)
    expect(() => apparentPx(10, 100, 0.5)).toThrow(RangeError)
  })
})

// Bowditch, The American Practical Navigator (1995 and 2002 editions, chapter 22): D = 1.17·√h nautical
// miles, h the height of eye in feet, refraction included; quoted from both editions in NavList,
// "Bowditch: Distance to visible horizon" (R. Stuart, 2012), which also notes that the book's metric
// form, 2.07·√h(m), is not the same constant converted (1.17·√3.2808 = 2.119): the feet form is used.
describe('distance to the horizon (Bowditch, chapter 22: D = 1.17·√h nm, h in feet)', () => {
  it('100 ft of eye height sees about 11.7 nm', () => {
    expect(horizonDistanceNm(100)).toBeCloseTo(11.7, 6)
    expect(horizonDistanceNm(0)).toBe(0)
  })

  it('the metric form converts with 1 ft = 0.3048 m and 1 nm = 1852 m (international definitions)', () => {
    expect(horizonDistanceM(30.48)).toBeCloseTo(11.7 * 1852, 6)
    // the feet form converted, not the book's 2.07·√h(m): 10 m of eye height sees 1.17·√32.808 = 6.70 nm
    expect(horizonDistanceM(10) / 1852).toBeCloseTo(6.70, 2)
  })
})
