import { describe, expect, it } from 'vitest'
import { relativeLuminance, weberContrast } from '../../../shared/utils/contrast'
import { CONDITIONS, CONTRAST_BANDS } from '../../../shared/utils/conditions'
import { DEMO_TARGET_TYPES } from '../../../server/core/imaging/generate/catalogue'
import { drawSilhouette } from '../../../server/core/imaging/generate/index'
import { cropMask, extractSilhouette, padMaskToAspect } from '../../../server/core/imaging/mask'
import { BACKGROUND_EDGE, coverageAt, RENDER_SIZES, renderCondition, renderCoverage, TARGET_CORE } from '../../../server/core/imaging/render'

function framedMask(index: number, aspect: string) {
  const type = DEMO_TARGET_TYPES[index]!
  const img = drawSilhouette(type.params, aspect as never, { width: 480, height: 320 })
  return padMaskToAspect(cropMask(extractSilhouette(img.data, img.width, img.height)), 2)
}

describe('renderCondition', () => {
  it('renders at the sizes phones need, long side 320, 640, 1080 px', () => {
    expect([...RENDER_SIZES]).toEqual([320, 640, 1080])
    const mask = framedMask(0, 'plan')
    for (const size of RENDER_SIZES) {
      const r = renderCondition(mask, 'sunlit', size, 1)
      expect(Math.max(r.width, r.height)).toBe(size)
      expect(r.rgba.length).toBe(r.width * r.height * 4)
    }
  })

  it('reports the Weber contrast of its own pixels, measured with WCAG 2.2 relative luminance', () => {
    const mask = framedMask(2, 'beam')
    const cov = coverageAt(mask, 320)
    // Haze softens the outline, so its pixels are classed on the softened coverage; the others here.
    for (const condition of CONDITIONS.filter(c => c !== 'haze')) {
      const r = renderCoverage(cov, condition, 5)
      let t = 0
      let nt = 0
      let b = 0
      let nb = 0
      const coverage = cov.coverage
      for (let i = 0; i < coverage.length; i++) {
        const l = relativeLuminance(r.rgba[i * 4]!, r.rgba[i * 4 + 1]!, r.rgba[i * 4 + 2]!)
        if (coverage[i]! >= TARGET_CORE) {
          t += l
          nt++
        }
        else if (coverage[i]! <= BACKGROUND_EDGE) {
          b += l
          nb++
        }
      }
      expect(r.contrast).toBeCloseTo(weberContrast(t / nt, b / nb), 4)
    }
  })

  it('is deterministic for a seed and changes with the seed', () => {
    const mask = framedMask(10, 'beam')
    const a = renderCondition(mask, 'white-cloud', 320, 42)
    const b = renderCondition(mask, 'white-cloud', 320, 42)
    const c = renderCondition(mask, 'white-cloud', 320, 43)
    expect(Buffer.from(a.rgba).equals(Buffer.from(b.rgba))).toBe(true)
    expect(Buffer.from(a.rgba).equals(Buffer.from(c.rgba))).toBe(false)
  })

  it('puts every condition of every demo silhouette inside its band (bands of conditions.ts)', () => {
    const misses: string[] = []
    DEMO_TARGET_TYPES.forEach((type, index) => {
      for (const aspect of type.aspects) {
        const mask = framedMask(index, aspect)
        for (const size of [320, 640]) {
          const cov = coverageAt(mask, size)
          // One scratch for the conditions of a size, as the pipeline does: they share its noise fields.
          const scratch = {}
          for (const condition of CONDITIONS) {
            const r = renderCoverage(cov, condition, index * 31 + size, { backdrop: type.category === 'vessel' ? 'sea' : 'sky', scratch })
            const band = CONTRAST_BANDS[condition]
            const ok = r.contrast >= band.min && r.contrast <= band.max
              && r.backgroundLuminance >= band.background.min && r.backgroundLuminance <= band.background.max
            if (!ok) misses.push(`${type.key} ${aspect} ${size} ${condition}: C=${r.contrast.toFixed(3)} Lb=${r.backgroundLuminance.toFixed(3)}`)
          }
        }
      }
    })
    expect(misses).toEqual([])
  })

  it('dims the scene under goggles and darkens the sky more than under sunlit light', () => {
    const mask = framedMask(4, 'plan')
    const sunlit = renderCondition(mask, 'sunlit', 320, 3)
    const goggles = renderCondition(mask, 'goggles', 320, 3)
    expect(goggles.backgroundLuminance).toBeLessThan(sunlit.backgroundLuminance / 5)
  })
})
