import { describe, expect, it } from 'vitest'
import { linearChannelToSrgb, relativeLuminance, srgbChannelToLinear, wcagContrastRatio, weberContrast } from '../../../shared/utils/contrast'

describe('relative luminance (W3C WCAG 2.2, "relative luminance")', () => {
  it('is 1 for white and 0 for black', () => {
    expect(relativeLuminance(255, 255, 255)).toBeCloseTo(1, 12)
    expect(relativeLuminance(0, 0, 0)).toBe(0)
  })

  it('weighs the primaries 0.2126, 0.7152, 0.0722 (WCAG 2.2)', () => {
    expect(relativeLuminance(255, 0, 0)).toBeCloseTo(0.2126, 12)
    expect(relativeLuminance(0, 255, 0)).toBeCloseTo(0.7152, 12)
    expect(relativeLuminance(0, 0, 255)).toBeCloseTo(0.0722, 12)
  })

  it('linearises below 0.04045 by division by 12.92 and above by ((c + 0.055) / 1.055)^2.4 (WCAG 2.2)', () => {
    expect(srgbChannelToLinear(0.04)).toBeCloseTo(0.04 / 12.92, 12)
    expect(srgbChannelToLinear(0.5)).toBeCloseTo(((0.5 + 0.055) / 1.055) ** 2.4, 12)
    // sRGB mid-grey 128 is about 21.6 % linear light (from memory: 0.2158).
    expect(srgbChannelToLinear(128 / 255)).toBeCloseTo(0.2158, 3)
  })

  it('round-trips through the inverse transfer', () => {
    for (const c of [0, 0.01, 0.04045, 0.2, 0.5, 0.9, 1]) expect(linearChannelToSrgb(srgbChannelToLinear(c))).toBeCloseTo(c, 6)
  })
})

describe('WCAG 2.2 contrast ratio (L1 + 0.05) / (L2 + 0.05)', () => {
  it('is 21:1 for black on white, in either order', () => {
    expect(wcagContrastRatio(1, 0)).toBeCloseTo(21, 12)
    expect(wcagContrastRatio(0, 1)).toBeCloseTo(21, 12)
  })

  it('gives about 4.48:1 for #777777 on white (from memory: the usual worked example just under AA 4.5:1)', () => {
    const grey = relativeLuminance(0x77, 0x77, 0x77)
    expect(wcagContrastRatio(grey, relativeLuminance(255, 255, 255))).toBeCloseTo(4.48, 2)
  })

  it('is 1 for equal luminances', () => {
    expect(wcagContrastRatio(0.3, 0.3)).toBe(1)
  })
})

describe('Weber contrast (Lt - Lb) / Lb (vision science)', () => {
  it('is -1 for a black target, 0 for an invisible one, positive for a brighter one', () => {
    expect(weberContrast(0, 0.5)).toBe(-1)
    expect(weberContrast(0.5, 0.5)).toBe(0)
    expect(weberContrast(0.75, 0.25)).toBeCloseTo(2, 12)
  })

  it('is unchanged when the whole scene is dimmed by one factor', () => {
    expect(weberContrast(0.06 * 0.1, 0.3 * 0.1)).toBeCloseTo(weberContrast(0.06, 0.3), 12)
  })

  it('refuses a black background', () => {
    expect(() => weberContrast(0.1, 0)).toThrow(RangeError)
  })
})
