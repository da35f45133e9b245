import { describe, expect, it } from 'vitest'
import { matchTypedAnswer, normaliseName } from '../../../shared/utils/typed-answer'

// Edit distances below are worked by hand from the definition (V. I. Levenshtein, Soviet
// Physics Doklady 10(8), 1966: the fewest single-character insertions, deletions and
// substitutions), written beside each case; the code computes them with a library, the test
// does not. The typo tolerance (none up to 3 characters, 1 up to 5, 2 above) is a design value.
// Invented target type names.
const names = [
  { id: 'halvard', name: 'Halvard' },
  { id: 'halvorn', name: 'Halvorn' },
  { id: 'brisk', name: 'Brisk' },
  { id: 'brusk', name: 'Brusk' },
  { id: 'seawren', name: 'Sea-Wren' },
  { id: 'ossian', name: 'Ossian Mk 2' },
  { id: 'kes', name: 'Kes' },
  { id: 'q', name: 'Q' },
]

describe('normaliseName', () => {
  it('ignores case, spaces, hyphens and diacritics (Unicode NFKD decomposition)', () => {
    expect(normaliseName(' Séa-Wrén ')).toBe(normaliseName('sea wren'))
    expect(normaliseName('SEAWREN')).toBe('seawren')
    expect(normaliseName('Ossian  mk-2')).toBe('ossianmk2')
  })
})

describe('matchTypedAnswer (Levenshtein distance, worked by hand)', () => {
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
    // brisq → brisk: substitute q→k, distance 1 (brusk: 2)
    expect(matchTypedAnswer('Brisq', names, 'brisk')).toEqual({ matchedId: 'brisk', correct: true })
    // osianmk → ossianmk2: insert s, insert 2, distance 2 (9 letters: 2 forgiven)
    expect(matchTypedAnswer('Osian Mk', names, 'ossian')).toEqual({ matchedId: 'ossian', correct: true })
    // brxxk → brisk: substitute x→i and x→s, distance 2 (5 letters: 1 forgiven)
    expect(matchTypedAnswer('Brxxk', names, 'brisk')).toEqual({ matchedId: null, correct: false })
    // osxxanmx → ossianmk2: three substitutions and an insertion, distance 4
    expect(matchTypedAnswer('Osxxan Mx', names, 'ossian')).toEqual({ matchedId: null, correct: false })
  })

  it('forgives no typo in a name of three letters or fewer: a one-letter name takes only itself', () => {
    // z → q: substitution, distance 1; a → q: distance 1. Each other letter is one edit from "q".
    for (const letter of 'abcdefghijklmnoprstuvwxyz') {
      expect(matchTypedAnswer(letter, names, 'q').correct).toBe(false)
    }
    expect(matchTypedAnswer('Q', names, 'q')).toEqual({ matchedId: 'q', correct: true })
    // kas → kes: substitution a→e, distance 1, but "Kes" has three letters
    expect(matchTypedAnswer('Kas', names, 'kes')).toEqual({ matchedId: null, correct: false })
    expect(matchTypedAnswer('KES', names, 'kes')).toEqual({ matchedId: 'kes', correct: true })
  })

  it('an exact other name is that other type', () => {
    expect(matchTypedAnswer('Halvorn', names, 'halvard')).toEqual({ matchedId: 'halvorn', correct: false })
    expect(matchTypedAnswer('brusk', names, 'brisk')).toEqual({ matchedId: 'brusk', correct: false })
  })

  it('never credits text as close to another type as to the right one', () => {
    // halvord → halvard: substitute o→a, 1; halvord → halvorn: substitute d→n, 1: a tie
    expect(matchTypedAnswer('Halvord', names, 'halvard')).toEqual({ matchedId: null, correct: false })
    // brsk → brisk: insert i, 1; brsk → brusk: insert u, 1: a tie
    expect(matchTypedAnswer('Brsk', names, 'brisk')).toEqual({ matchedId: null, correct: false })
  })

  it('empty text names nothing', () => {
    expect(matchTypedAnswer('  - ', names, 'brisk')).toEqual({ matchedId: null, correct: false })
  })
})
