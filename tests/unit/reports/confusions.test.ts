import { describe, expect, it } from 'vitest'
import { confusionMatrix, worstPairs } from '../../../server/core/reports/confusions'
import type { ConfusionCall } from '../../../server/core/reports/confusions'

// A known small set of calls; every expected count below is tallied by hand from this list
// (definition of a confusion matrix, common practice in classification: rows are the truth,
// columns what was called; no outside table of values).
function calls(n: number, targetTypeId: string, calledTypeId: string | null, aspect: string, condition: string): ConfusionCall[] {
  return Array.from({ length: n }, () => ({ targetTypeId, calledTypeId, aspect, condition }))
}
const SET: ConfusionCall[] = [
  ...calls(3, 'A', 'A', 'beam', 'sunlit'),
  ...calls(1, 'A', 'B', 'head-on', 'dark-cloud'),
  ...calls(1, 'A', 'B', 'head-on', 'sunlit'),
  ...calls(1, 'A', null, 'beam', 'haze'),
  ...calls(4, 'B', 'B', 'beam', 'sunlit'),
  ...calls(1, 'B', 'A', 'head-on', 'dark-cloud'),
  ...calls(1, 'C', 'B', 'beam', 'dark-cloud'),
]

describe('confusionMatrix of a known set (hand count)', () => {
  const m = confusionMatrix(SET, { types: ['A', 'B', 'C'] })

  it('counts [truth][called], the diagonal being right names', () => {
    expect(m.types).toEqual(['A', 'B', 'C'])
    expect(m.counts).toEqual({
      A: { A: 3, B: 2, C: 0 },
      B: { A: 1, B: 4, C: 0 },
      C: { A: 0, B: 1, C: 0 },
    })
  })

  it('keeps sightings with no name apart and totals every call', () => {
    expect(m.noCall).toEqual({ A: 1, B: 0, C: 0 })
    expect(m.totals).toEqual({ A: 6, B: 5, C: 1 })
  })

  it('adds types met in the calls but not listed, after the listed ones', () => {
    expect(confusionMatrix(SET, { types: ['C'] }).types).toEqual(['C', 'A', 'B'])
  })
})

describe('worstPairs of the same set (hand count)', () => {
  it('overall: A called B twice (2 of 6 A calls), then C→B (1 of 1), then B→A (1 of 5)', () => {
    expect(worstPairs(SET)).toEqual([
      { truthId: 'A', calledId: 'B', count: 2, share: 2 / 6 },
      { truthId: 'C', calledId: 'B', count: 1, share: 1 },
      { truthId: 'B', calledId: 'A', count: 1, share: 1 / 5 },
    ])
  })

  it('by aspect: head-on holds the A/B confusions', () => {
    // head-on: A has 2 calls, both called B; B has 1, called A. beam: C's one call was called B.
    expect(worstPairs(SET, { by: 'aspect' })).toEqual([
      { truthId: 'A', calledId: 'B', count: 2, share: 1, aspect: 'head-on' },
      { truthId: 'B', calledId: 'A', count: 1, share: 1, aspect: 'head-on' },
      { truthId: 'C', calledId: 'B', count: 1, share: 1, aspect: 'beam' },
    ])
  })

  it('by condition, limited to the worst two', () => {
    // dark-cloud: A 1 call → B; B 1 call → A; C 1 call → B. sunlit: A 4 calls, 1 → B (share 1/4).
    expect(worstPairs(SET, { by: 'condition', limit: 2 })).toEqual([
      { truthId: 'A', calledId: 'B', count: 1, share: 1, condition: 'dark-cloud' },
      { truthId: 'B', calledId: 'A', count: 1, share: 1, condition: 'dark-cloud' },
    ])
  })
})
