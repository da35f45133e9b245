import { ckmeans } from 'simple-statistics'
import { describe, expect, it } from 'vitest'
import { luminanceHistogram, luminanceLevels, otsuThreshold } from '../../../server/core/imaging/otsu'

// Otsu's criterion (N. Otsu, IEEE Trans. SMC 9(1), 1979): the threshold maximising between-class
// variance also minimises the within-class variance, i.e. it is the optimal two-cluster split of
// the grey levels, which simple-statistics' ckmeans computes exactly for 1-D data.

function gaussianHistogram(modes: { mean: number, sd: number, weight: number }[]): number[] {
  const h = Array.from({ length: 256 }, () => 0)
  for (let i = 0; i < 256; i++) {
    for (const m of modes) h[i]! += Math.round(m.weight * Math.exp(-((i - m.mean) ** 2) / (2 * m.sd ** 2)))
  }
  return h
}

function expand(histogram: number[]): number[] {
  const values: number[] = []
  histogram.forEach((n, level) => {
    for (let k = 0; k < n; k++) values.push(level)
  })
  return values
}

describe('otsuThreshold (Otsu 1979)', () => {
  it('falls between the modes of a bimodal histogram', () => {
    const t = otsuThreshold(gaussianHistogram([{ mean: 50, sd: 10, weight: 300 }, { mean: 190, sd: 15, weight: 200 }]))
    expect(t).toBeGreaterThan(80)
    expect(t).toBeLessThan(160)
  })

  it('puts an empty gap between two spikes in its middle', () => {
    const h = Array.from({ length: 256 }, () => 0)
    h[40] = 1000
    h[200] = 500
    const t = otsuThreshold(h)
    expect(t).toBeGreaterThanOrEqual(40)
    expect(t).toBeLessThan(200)
    expect(Math.abs(t - 120)).toBeLessThanOrEqual(1)
  })

  it('splits where an exact optimal two-cluster split (simple-statistics ckmeans) splits', () => {
    for (const modes of [
      [{ mean: 60, sd: 12, weight: 120 }, { mean: 170, sd: 20, weight: 60 }],
      [{ mean: 30, sd: 8, weight: 40 }, { mean: 120, sd: 25, weight: 90 }],
      [{ mean: 90, sd: 20, weight: 80 }, { mean: 220, sd: 10, weight: 80 }],
    ]) {
      const histogram = gaussianHistogram(modes)
      const t = otsuThreshold(histogram)
      const [low, high] = ckmeans(expand(histogram), 2) as [number[], number[]]
      expect(Math.max(...low)).toBeLessThanOrEqual(t)
      expect(Math.min(...high)).toBeGreaterThan(t)
    }
  })

  it('maximises w0 w1 (m0 - m1)^2 over every level (Otsu 1979, eq. 18, by brute force)', () => {
    const h = gaussianHistogram([{ mean: 70, sd: 18, weight: 90 }, { mean: 150, sd: 30, weight: 50 }])
    const total = h.reduce((a, b) => a + b, 0)
    const between = (t: number) => {
      const lo = h.slice(0, t + 1)
      const hi = h.slice(t + 1)
      const w0 = lo.reduce((a, b) => a + b, 0)
      const w1 = hi.reduce((a, b) => a + b, 0)
      if (!w0 || !w1) return 0
      const m0 = lo.reduce((a, n, i) => a + n * i, 0) / w0
      const m1 = hi.reduce((a, n, i) => a + n * (i + t + 1), 0) / w1
      return (w0 / total) * (w1 / total) * (m0 - m1) ** 2
    }
    const best = Math.max(...Array.from({ length: 255 }, (_, t) => between(t)))
    expect(between(otsuThreshold(h))).toBeCloseTo(best, 10)
  })

  it('refuses an empty histogram', () => {
    expect(() => otsuThreshold(Array.from({ length: 256 }, () => 0))).toThrow(RangeError)
  })
})

describe('luminance histogram of RGBA', () => {
  it('keeps a grey pixel at its own level (WCAG 2.2 luminance, re-encoded with the sRGB transfer)', () => {
    const rgba = new Uint8Array([0, 0, 0, 255, 119, 119, 119, 255, 255, 255, 255, 255, 200, 200, 200, 0])
    expect([...luminanceLevels(rgba, 4, 1)]).toEqual([0, 119, 255, 200])
    const h = luminanceHistogram(rgba, 4, 1)
    expect(h[0]).toBe(1)
    expect(h[119]).toBe(1)
    expect(h[255]).toBe(1)
    expect(h[200]).toBe(0)
  })

  it('ranks pure green far above pure blue, as relative luminance does (WCAG 2.2)', () => {
    const levels = luminanceLevels(new Uint8Array([0, 255, 0, 255, 0, 0, 255, 255]), 2, 1)
    expect(levels[0]!).toBeGreaterThan(levels[1]! + 100)
  })

  it('separates a synthetic dark-on-light image between its two grey levels', () => {
    const w = 64
    const rgba = new Uint8Array(w * w * 4)
    for (let i = 0; i < w * w; i++) {
      const x = i % w
      const y = Math.floor(i / w)
      const v = Math.hypot(x - 32, y - 32) < 14 ? 40 + (i % 7) : 210 - (i % 5)
      rgba.set([v, v, v, 255], i * 4)
    }
    const t = otsuThreshold(luminanceHistogram(rgba, w, w))
    expect(t).toBeGreaterThanOrEqual(46)
    expect(t).toBeLessThan(206)
  })
})
