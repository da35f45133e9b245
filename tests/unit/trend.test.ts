import { describe, expect, it } from 'vitest'
import { trendVerdict } from '../../shared/utils/trend'

const f = (previousMedianMs: number, previousAccuracy: number, medianMs: number, accuracy: number) =>
  ({ days: 7, calls: 40, medianMs, accuracy, previousMedianMs, previousAccuracy })

// Issue 17, item 10: "a faster median bought with lower accuracy is shown as worse, not in green".
// Inverse efficiency (Townsend & Ashby 1983): time / proportion right; the values below are worked
// by hand: 1000/0.90 = 1111 ms, 900/0.80 = 1125 ms, 800/0.88 = 909 ms, 1100/0.95 = 1158 ms.
describe('trend verdict from speed and accuracy together', () => {
  it('faster but less accurate is worse (issue 17, item 10)', () => {
    expect(trendVerdict(f(1000, 0.9, 900, 0.8))).toBe('worse')
  })
  it('much faster with 2 points less accuracy is still worse: accuracy is never traded for speed (Heitz 2014)', () => {
    // By inverse efficiency alone this would read 18 % better (1111 -> 909 ms).
    expect(trendVerdict(f(1000, 0.9, 800, 0.88))).toBe('worse')
  })
  it('faster at the same accuracy is better; slower at the same accuracy is worse', () => {
    expect(trendVerdict(f(1000, 0.9, 900, 0.9))).toBe('better')
    expect(trendVerdict(f(1000, 0.9, 1100, 0.9))).toBe('worse')
  })
  it('more accurate and a little slower: weighed by inverse efficiency (1111 -> 1158 ms, +4 %: steady)', () => {
    expect(trendVerdict(f(1000, 0.9, 1100, 0.95))).toBe('steady')
  })
  it('more accurate at the same speed is better (1111 -> 1053 ms, -5.3 %)', () => {
    expect(trendVerdict(f(1000, 0.9, 1000, 0.95))).toBe('better')
  })
  it('no verdict without both periods', () => {
    expect(trendVerdict({ days: 7, calls: 0, medianMs: null, accuracy: null, previousMedianMs: 900, previousAccuracy: 0.9 })).toBeNull()
  })
})
