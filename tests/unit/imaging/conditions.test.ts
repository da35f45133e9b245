import { describe, expect, it } from 'vitest'
import { ASPECT_LABELS, ASPECTS, CONDITION_DIFFICULTY, CONDITION_INFO, CONDITIONS, CONTRAST_BANDS, conditionDifficulty } from '../../../shared/utils/conditions'

describe('conditions and aspects (glossary of product.md)', () => {
  it('lists the six conditions of the glossary', () => {
    expect([...CONDITIONS].sort()).toEqual(['backlit', 'dark-cloud', 'goggles', 'haze', 'sunlit', 'white-cloud'])
    for (const c of CONDITIONS) expect(CONDITION_INFO[c].label.length).toBeGreaterThan(0)
  })

  it('lists the seven aspects of the glossary, each with a label', () => {
    expect([...ASPECTS].sort()).toEqual(['beam', 'belly', 'bow-quarter', 'head-on', 'plan', 'stern-quarter', 'tail-on'])
    for (const a of ASPECTS) expect(ASPECT_LABELS[a].length).toBeGreaterThan(0)
  })

  it('orders the named easy cases before the named hard cases (product.md, common practice, no source)', () => {
    expect(new Set(CONDITION_DIFFICULTY).size).toBe(CONDITIONS.length)
    for (const easy of ['white-cloud', 'sunlit'] as const) {
      for (const hard of ['dark-cloud', 'goggles'] as const) expect(conditionDifficulty(easy)).toBeLessThan(conditionDifficulty(hard))
    }
  })

  it('bands: dark shapes on bright sky negative, sunlit shape positive, dark cloud weakest (glossary)', () => {
    expect(CONTRAST_BANDS.backlit.max).toBeLessThan(0)
    expect(CONTRAST_BANDS['white-cloud'].max).toBeLessThan(0)
    expect(CONTRAST_BANDS.sunlit.min).toBeGreaterThan(0)
    expect(Math.abs(CONTRAST_BANDS['dark-cloud'].min)).toBeLessThan(Math.abs(CONTRAST_BANDS['white-cloud'].max))
    expect(CONTRAST_BANDS.goggles.background.max).toBeLessThan(CONTRAST_BANDS.sunlit.background.min)
    for (const c of CONDITIONS) {
      expect(CONTRAST_BANDS[c].min).toBeGreaterThanOrEqual(-1)
      expect(CONTRAST_BANDS[c].min).toBeLessThan(CONTRAST_BANDS[c].max)
    }
  })
})
