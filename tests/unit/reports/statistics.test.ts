import { describe, expect, it } from 'vitest'
import * as ss from 'simple-statistics'
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64'
import { mersenne } from 'pure-rand/generator/mersenne'
import { mean, median, p90, quantile, quantiles, rollingMedian } from '../../../shared/utils/statistics'

// Reference: simple-statistics (a general-purpose statistics library; check-values.md "quantiles").
// Inputs are pseudo-random from a fixed seed so a failure can be replayed.
// pure-rand's Mersenne Twister read as floats (a registry generator, not the product's wrapper).
function seededRng(seed: number): () => number {
  const g = mersenne(seed)
  return () => uniformFloat64(g)
}

const rand = seededRng(20240611)
const PS = [0, 0.01, 0.1, 0.25, 0.5, 0.75, 0.9, 0.95, 0.99, 1]

function randomArrays(): number[][] {
  const arrays: number[][] = []
  for (let n = 1; n <= 41; n++) {
    // latencies in ms with fractions
    arrays.push(Array.from({ length: n }, () => 150 + rand() * 3000))
    // few distinct values: many duplicates
    arrays.push(Array.from({ length: n }, () => 200 * Math.floor(rand() * 5)))
  }
  arrays.push(Array.from({ length: 1000 }, () => rand() * 1e4))
  arrays.push(Array.from({ length: 1001 }, () => Math.round(rand() * 20)))
  return arrays
}

describe('quantiles agree with simple-statistics (source: the library)', () => {
  const arrays = randomArrays()

  it('covers odd and even lengths and duplicates', () => {
    expect(arrays.some(a => a.length % 2 === 0)).toBe(true)
    expect(arrays.some(a => a.length % 2 === 1)).toBe(true)
    expect(arrays.some(a => new Set(a).size < a.length)).toBe(true)
  })

  it('quantile(values, p) equals simple-statistics quantile for every p', () => {
    for (const a of arrays) {
      for (const p of PS) expect(quantile(a, p)).toBe(ss.quantile(a, p))
    }
  })

  it('median and p90 equal simple-statistics median and quantile(…, 0.9)', () => {
    for (const a of arrays) {
      expect(median(a)).toBe(ss.median(a))
      expect(p90(a)).toBe(ss.quantile(a, 0.9))
    }
  })

  it('quantiles(values, ps) equals simple-statistics quantile with an array of p', () => {
    for (const a of arrays.slice(0, 20)) expect(quantiles(a, PS)).toEqual(ss.quantile(a, PS))
  })

  it('the library\'s documented example: quantile([3, 6, 7, 8, 8, 9, 10, 13, 15, 16, 20], 0.5) = 9', () => {
    expect(quantile([3, 6, 7, 8, 8, 9, 10, 13, 15, 16, 20], 0.5)).toBe(9)
  })

  it('mean agrees with simple-statistics mean', () => {
    for (const a of arrays) expect(mean(a)).toBeCloseTo(ss.mean(a), 9)
  })

  it('does not reorder its input', () => {
    const a = [5, 1, 4, 2, 3]
    quantile(a, 0.9)
    expect(a).toEqual([5, 1, 4, 2, 3])
  })

  it('throws for no values or p outside [0, 1], as the library does', () => {
    expect(() => quantile([], 0.5)).toThrow()
    expect(() => ss.quantile([], 0.5)).toThrow()
    expect(() => quantile([1, 2], 1.5)).toThrow(RangeError)
  })
})

describe('rollingMedian (trailing window; each point checked with simple-statistics median)', () => {
  it('equals the median of the trailing window at every point', () => {
    const values = Array.from({ length: 200 }, () => Math.round(rand() * 50) * 10)
    for (const window of [1, 2, 5, 8, 30]) {
      const out = rollingMedian(values, window)
      expect(out).toHaveLength(values.length)
      out.forEach((m, i) => expect(m).toBe(ss.median(values.slice(Math.max(0, i - window + 1), i + 1))))
    }
  })

  it('rejects a window below 1', () => {
    expect(() => rollingMedian([1, 2, 3], 0)).toThrow(RangeError)
  })
})
