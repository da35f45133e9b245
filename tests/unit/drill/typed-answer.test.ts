import { distance } from 'fastest-levenshtein'
import { describe, expect, it } from 'vitest'
import { matchTypedAnswer, normaliseName } from '../../../shared/utils/typed-answer'

// Edit distances are checked against fastest-levenshtein, the reference library (Levenshtein
// distance, V. I. Levenshtein 1966); the forgiving rule itself is common practice, no source.
// Invented target type names.
const names = [
  { id: 'halvard', name: 'Halvard' },
  { id: 'halvorn', name: 'Halvorn' },
  { id: 'brisk', name: 'Brisk' },
  { id: 'brusk', name: 'Brusk' },
  { id: 'seawren', name: 'Sea-Wren' },
  { id: 'ossian', name: 'Ossian Mk 2' },
]

describe('normaliseName', () => {
  it('ignores case, spaces, hyphens and diacritics (Unicode NFKD decomposition)', () => {
    expect(normaliseName(' Séa-Wrén ')).toBe(normaliseName('sea wren'))
    expect(normaliseName('SEAWREN')).toBe('seawren')
    expect(normaliseName('Ossian  mk-2')).toBe('ossianmk2')
  })
})

describe('matchTypedAnswer (Levenshtein distance by fastest-levenshtein)', () => {
  it('credits the right name whatever its case, spacing and accents', () => {
    const cases = [
      ['halvard', 'halvard'], [' HALVARD ', 'halvard'], ['Hálvard', 'halvard'],
      ['sea wren', 'seawren'], ['Seawren', 'seawren'], ['ossian mk2', 'ossian'],
    ] as const
    for (const [typed, correctId] of cases) {
      expect(matchTypedAnswer(typed, names, correctId)).toEqual({ matchedId: correctId, correct: true })
    }
  })

  it('forgives one typo in a short name and two in a longer one', () => {
    expect(distance('brisq', 'brisk')).toBe(1)
    expect(matchTypedAnswer('Brisq', names, 'brisk')).toEqual({ matchedId: 'brisk', correct: true })
    expect(distance('ossianmk', 'ossianmk2')).toBe(1)
    expect(distance('osianmk', 'ossianmk2')).toBe(2)
    expect(matchTypedAnswer('Osian Mk', names, 'ossian')).toEqual({ matchedId: 'ossian', correct: true })
    expect(distance('brxxk', 'brisk')).toBe(2)
    expect(matchTypedAnswer('Brxxk', names, 'brisk')).toEqual({ matchedId: null, correct: false })
  })

  it('an exact other name is that other type', () => {
    expect(matchTypedAnswer('Halvorn', names, 'halvard')).toEqual({ matchedId: 'halvorn', correct: false })
    expect(matchTypedAnswer('brusk', names, 'brisk')).toEqual({ matchedId: 'brusk', correct: false })
  })

  it('never credits text as close to another type as to the right one', () => {
    expect(distance('halvord', 'halvard')).toBe(distance('halvord', 'halvorn'))
    expect(matchTypedAnswer('Halvord', names, 'halvard')).toEqual({ matchedId: null, correct: false })
    expect(distance('brsk', 'brisk')).toBe(distance('brsk', 'brusk'))
    expect(matchTypedAnswer('Brsk', names, 'brisk')).toEqual({ matchedId: null, correct: false })
  })

  it('empty text names nothing', () => {
    expect(matchTypedAnswer('  - ', names, 'brisk')).toEqual({ matchedId: null, correct: false })
  })
})
