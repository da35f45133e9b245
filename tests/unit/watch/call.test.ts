// One grading of a call for the server and the phone (shared/utils/call.ts), against the grade
// definitions of product.md's glossary ("grade") and its Offline section (same grading code).
import { describe, expect, it } from 'vitest'
import { gradeAnswer } from '../../../shared/utils/call'

// A deck with the schema's defaults: hesitation limit 1500 ms, window 5000 ms.
const names = [{ id: 't-gull', name: 'Gullwing' }, { id: 't-kite', name: 'Kestrel Kite' }]
const key = { answerTypeId: 't-gull', answerChoiceId: 'c-right', names: () => names, hesitationMs: 1500, windowMs: 5000 }

describe('gradeAnswer: a choice or typed text graded as product.md defines the grades', () => {
  it('right choice within half the hesitation limit: instant; within the limit: sure; slower: hesitant', () => {
    expect(gradeAnswer({ choiceId: 'c-right', latencyMs: 700 }, key)).toMatchObject({ correct: true, grade: 'instant' })
    expect(gradeAnswer({ choiceId: 'c-right', latencyMs: 1400 }, key)).toMatchObject({ correct: true, grade: 'sure' })
    expect(gradeAnswer({ choiceId: 'c-right', latencyMs: 3000 }, key)).toMatchObject({ correct: true, grade: 'hesitant' })
  })

  it('a wrong choice, or no call in time, is missed', () => {
    expect(gradeAnswer({ choiceId: 'c-wrong', latencyMs: 700 }, key)).toMatchObject({ correct: false, grade: 'missed' })
    expect(gradeAnswer({ latencyMs: null }, key)).toMatchObject({ correct: false, grade: 'missed', anticipation: false })
  })

  it('typed text: the type it names, right or wrong', () => {
    expect(gradeAnswer({ typed: 'gullwing', latencyMs: 1400 }, key)).toEqual({ correct: true, typedTypeId: 't-gull', grade: 'sure', anticipation: false })
    expect(gradeAnswer({ typed: 'Kestrel Kite', latencyMs: 1400 }, key)).toEqual({ correct: false, typedTypeId: 't-kite', grade: 'missed', anticipation: false })
  })

  it('the hesitation limit is never longer than the sighting\'s window', () => {
    // limit clamped to 1000 ms: half of it is 500 ms, so 450 ms is instant and 900 ms is sure
    const short = { ...key, hesitationMs: 1500, windowMs: 1000 }
    expect(gradeAnswer({ choiceId: 'c-right', latencyMs: 450 }, short).grade).toBe('instant')
    expect(gradeAnswer({ choiceId: 'c-right', latencyMs: 900 }, short).grade).toBe('sure')
    // no limit stored: the window is the limit
    expect(gradeAnswer({ choiceId: 'c-right', latencyMs: 2600 }, { ...key, hesitationMs: null }).grade).toBe('sure')
  })

  it('names are read only for a typed call (the server reads them from the database)', () => {
    let reads = 0
    const counted = () => {
      reads++
      return names
    }
    gradeAnswer({ choiceId: 'c-right', latencyMs: 700 }, { ...key, names: counted })
    expect(reads).toBe(0)
  })
})
