// Counts in words. Source: Unicode CLDR plural rules for English (cardinal "one": i = 1 and v = 0,
// everything else "other"), https://www.unicode.org/cldr/charts/latest/supplemental/language_plural_rules.html
import { describe, expect, it } from 'vitest'
import { countOf } from '../../shared/utils/count-of'

describe('countOf', () => {
  it('uses the singular for exactly one only (CLDR English "one")', () => {
    expect(countOf(1, 'target type')).toBe('1 target type')
    expect(countOf(0, 'target type')).toBe('0 target types')
    expect(countOf(2, 'view')).toBe('2 views')
    expect(countOf(21, 'member')).toBe('21 members')
  })
  it('takes an irregular plural when given', () => {
    expect(countOf(3, 'person', 'people')).toBe('3 people')
    expect(countOf(1, 'person', 'people')).toBe('1 person')
  })
})
