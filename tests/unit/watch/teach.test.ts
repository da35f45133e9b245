import { describe, expect, it } from 'vitest'
import { featureDifferences } from '../../../shared/utils/features'
import { relativeParts } from '../../../shared/utils/relative-time'

describe('featureDifferences (what tells two types apart; product.md: recognition is taught by features)', () => {
  it('lists the features whose words differ, ignoring case and spacing, and those only one type names', () => {
    const a = { wings: 'swept, low-set', engines: 'two, under the wings', tail: 'single fin' }
    const b = { wings: 'Swept,  low-set', engines: 'one, in the tail', tail: 'T-tail', fuselage: 'slender' }
    expect(featureDifferences(a, b)).toEqual([
      { feature: 'engines', a: 'two, under the wings', b: 'one, in the tail' },
      { feature: 'tail', a: 'single fin', b: 'T-tail' },
      { feature: 'fuselage', a: null, b: 'slender' },
    ])
    expect(featureDifferences(a, a)).toEqual([])
  })
})

describe('relativeParts with Intl.RelativeTimeFormat (ECMA-402; the next due time in words, issue 15 item 9)', () => {
  const now = Date.UTC(2026, 11, 2, 12)
  const en = new Intl.RelativeTimeFormat('en-US', { numeric: 'auto' })
  const de = new Intl.RelativeTimeFormat('de-DE', { numeric: 'auto' })
  const say = (f: Intl.RelativeTimeFormat, ms: number) => {
    const p = relativeParts(ms, now)
    return f.format(p.value, p.unit)
  }
  it('says the span in the largest whole unit, in the locale\'s words', () => {
    expect(say(en, now + 3 * 3_600_000 + 10 * 60_000)).toBe('in 3 hours')
    expect(say(en, now + 86_400_000)).toBe('tomorrow')
    expect(say(en, now + 8 * 86_400_000 + 3_600_000)).toBe('in 8 days')
    expect(say(en, now + 20 * 86_400_000)).toBe('in 3 weeks')
    expect(say(en, now + 90 * 86_400_000)).toBe('in 3 months')
    expect(say(en, now - 5 * 60_000)).toBe('5 minutes ago')
    expect(say(en, now + 20_000)).toBe('in 20 seconds')
    expect(say(de, now + 86_400_000)).toBe('morgen')
  })
})
