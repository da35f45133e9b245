import { describe, expect, it } from 'vitest'
import { Rating, State } from 'ts-fsrs'
import {
  ANTICIPATION_FLOOR_MS,
  FSRS_STATE,
  GRADES,
  gradeCall,
  gradeToRatingName,
  MAX_LATENCY_MS,
  trackStage,
} from '../../../shared/utils/grade'

// Deck defaults of the schema: hesitation limit 1500 ms, window 5000 ms.
const deck = { hesitationMs: 1500, windowMs: 5000 }
const right = (latencyMs: number | null) => gradeCall({ correct: true, latencyMs, ...deck })

describe('gradeCall: grade definitions of product.md (glossary "grade")', () => {
  it('Thorpe, Fize & Marlot, Nature 381 (1996): a call under 150 ms is anticipation, graded missed', () => {
    expect(ANTICIPATION_FLOOR_MS).toBe(150)
    expect(right(149)).toEqual({ grade: 'missed', anticipation: true })
    expect(right(0)).toEqual({ grade: 'missed', anticipation: true })
    expect(gradeCall({ correct: false, latencyMs: 149, ...deck })).toEqual({ grade: 'missed', anticipation: true })
    expect(right(150)).toEqual({ grade: 'instant', anticipation: false })
  })

  it('instant: right within half the limit (750 ms inclusive)', () => {
    expect(right(750).grade).toBe('instant')
    expect(right(751).grade).toBe('sure')
  })

  it('sure: right within the limit (1500 ms inclusive)', () => {
    expect(right(1500).grade).toBe('sure')
    expect(right(1501).grade).toBe('hesitant')
  })

  it('hesitant up to the window (5000 ms inclusive), missed after it', () => {
    expect(right(5000).grade).toBe('hesitant')
    expect(right(5001)).toEqual({ grade: 'missed', anticipation: false })
  })

  it('wrong or no call is missed', () => {
    expect(gradeCall({ correct: false, latencyMs: 400, ...deck })).toEqual({ grade: 'missed', anticipation: false })
    expect(right(null)).toEqual({ grade: 'missed', anticipation: false })
  })

  it('an odd hesitation limit halves exactly (product.md: "within half the limit")', () => {
    const odd = { correct: true, hesitationMs: 1001, windowMs: 3000 }
    expect(gradeCall({ ...odd, latencyMs: 500.5 }).grade).toBe('instant')
    expect(gradeCall({ ...odd, latencyMs: 501 }).grade).toBe('sure')
  })

  it('product.md "bounds impossible latencies": rejects negative, non-finite and over-long latencies and bad deck settings', () => {
    expect(() => right(-1)).toThrow(RangeError)
    expect(() => right(Number.NaN)).toThrow(RangeError)
    expect(() => right(MAX_LATENCY_MS + 1)).toThrow(RangeError)
    expect(() => gradeCall({ correct: true, latencyMs: 500, hesitationMs: 0, windowMs: 5000 })).toThrow(RangeError)
    expect(() => gradeCall({ correct: true, latencyMs: 500, hesitationMs: 6000, windowMs: 5000 })).toThrow(RangeError)
  })
})

describe('grade to rating (product.md, The drill 1: missed→Again, hesitant→Hard, sure→Good, instant→Easy)', () => {
  it('names members of the ts-fsrs Rating enum in the order of the grades', () => {
    expect(GRADES).toEqual(['missed', 'hesitant', 'sure', 'instant'])
    expect(GRADES.map(g => Rating[gradeToRatingName(g)])).toEqual([Rating.Again, Rating.Hard, Rating.Good, Rating.Easy])
  })
})

describe('trackStage', () => {
  it('FSRS_STATE mirrors the ts-fsrs State enum', () => {
    expect(FSRS_STATE).toEqual({ New: State.New, Learning: State.Learning, Review: State.Review, Relearning: State.Relearning })
  })

  it('follows the documented rule', () => {
    expect(trackStage({ reps: 0, state: State.New, stability: 0, retrievability: 0 })).toBe('new')
    expect(trackStage({ reps: 1, state: State.Learning, stability: 2.3, retrievability: 0.99 })).toBe('forming')
    expect(trackStage({ reps: 3, state: State.Review, stability: 6.9, retrievability: 0.95 })).toBe('forming')
    expect(trackStage({ reps: 4, state: State.Review, stability: 7, retrievability: 0.95 })).toBe('holding')
    expect(trackStage({ reps: 4, state: State.Review, stability: 40, retrievability: 0.89 })).toBe('slipping')
    expect(trackStage({ reps: 5, state: State.Relearning, stability: 3, retrievability: 0.99 })).toBe('slipping')
    // desired retention is the deck's: at 0.8, R = 0.85 still holds
    expect(trackStage({ reps: 4, state: State.Review, stability: 40, retrievability: 0.85, retention: 0.8 })).toBe('holding')
  })
})
