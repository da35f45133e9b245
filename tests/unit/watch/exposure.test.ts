import { describe, expect, it } from 'vitest'
import { exposureFor, framesForExposure, ladderRung } from '../../../shared/utils/exposure'

const at = (stability: number, min?: number) => exposureFor({ reps: 3, stability }, min)

describe('exposure ladder of product.md (The drill 3)', () => {
  it('new: until the call, at most 4 s', () => {
    expect(exposureFor({ reps: 0, stability: 0 })).toEqual({ untilCall: true, maxMs: 4000 })
  })

  it('under 1 day: 2 s; 1 to 7 days: 1 s; 7 to 30 days: 0.5 s; over 30 days: 0.2 s', () => {
    expect(at(0.1)).toEqual({ untilCall: false, ms: 2000 })
    expect(at(0.999)).toEqual({ untilCall: false, ms: 2000 })
    expect(at(1)).toEqual({ untilCall: false, ms: 1000 })
    expect(at(6.999)).toEqual({ untilCall: false, ms: 1000 })
    expect(at(7)).toEqual({ untilCall: false, ms: 500 })
    expect(at(30)).toEqual({ untilCall: false, ms: 500 })
    expect(at(30.001)).toEqual({ untilCall: false, ms: 200 })
    expect([0.5, 3, 10, 31].map(s => ladderRung({ reps: 1, stability: s }))).toEqual([1, 2, 3, 4])
  })

  it('a deck may go down to 0.1 s, and its shortest exposure is a floor for every rung', () => {
    expect(at(90, 100)).toEqual({ untilCall: false, ms: 100 })
    expect(at(10, 100)).toEqual({ untilCall: false, ms: 500 })
    expect(at(10, 600)).toEqual({ untilCall: false, ms: 600 })
    expect(at(3, 600)).toEqual({ untilCall: false, ms: 1000 })
    expect(() => at(90, 99)).toThrow(RangeError)
  })
})

describe('framesForExposure', () => {
  // 60 Hz (16.67 ms a frame) and 120 Hz are the usual phone refresh rates (common practice, no source).
  it('rounds to whole frames', () => {
    expect(framesForExposure(200, 1000 / 60)).toBe(12)
    expect(framesForExposure(200, 1000 / 120)).toBe(24)
    expect(framesForExposure(500, 1000 / 60)).toBe(30)
  })

  it('a 1/50 s wartime flash (Time, "Fast Looks", 1945) is one 60 Hz frame; never fewer than one', () => {
    expect(framesForExposure(20, 1000 / 60)).toBe(1)
    expect(framesForExposure(5, 1000 / 60)).toBe(1)
    expect(() => framesForExposure(200, 0)).toThrow(RangeError)
  })
})
