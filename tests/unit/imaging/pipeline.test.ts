import { createHash } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { CONDITIONS, CONTRAST_BANDS } from '../../../shared/utils/conditions'
import { decodeWebp, encodePng } from '../../../server/core/imaging/codecs'
import { ImageRejected } from '../../../server/core/imaging/errors'
import { DEMO_TARGET_TYPES } from '../../../server/core/imaging/generate/catalogue'
import { drawSilhouette } from '../../../server/core/imaging/generate/index'
import { processImage } from '../../../server/core/imaging/pipeline'
import { RENDER_SIZES } from '../../../server/core/imaging/render'

describe('processImage', () => {
  it('turns a 1600 x 1000 generated PNG into 18 WebP renderings that decode to their stated size', async () => {
    const png = await encodePng(drawSilhouette(DEMO_TARGET_TYPES[4]!.params, 'plan', { width: 1600, height: 1000 }))
    await processImage(png, { sizes: [320], conditions: ['sunlit'] })
    const steps: number[] = []
    // Its time is a figure of `npm run bench` (upload-pipeline), not asserted here.
    const result = await processImage(png, { onProgress: p => steps.push(p) })

    expect(result.source).toMatchObject({ mime: 'image/png', width: 1600, height: 1000 })
    // SHA-256 as computed by Node's crypto (FIPS 180-4).
    expect(result.source.sha256).toBe(createHash('sha256').update(png).digest('hex'))
    expect(result.method).toBe('alpha')
    expect(result.renderings).toHaveLength(RENDER_SIZES.length * CONDITIONS.length)
    for (const r of result.renderings) {
      const decoded = await decodeWebp(r.webp)
      expect([decoded.width, decoded.height]).toEqual([r.width, r.height])
      expect(Math.max(r.width, r.height)).toBe(r.size)
      expect(r.bytes).toBe(r.webp.byteLength)
      expect(r.sha256).toBe(createHash('sha256').update(r.webp).digest('hex'))
      const band = CONTRAST_BANDS[r.condition]
      expect(r.contrast).toBeGreaterThanOrEqual(band.min)
      expect(r.contrast).toBeLessThanOrEqual(band.max)
    }
    expect(steps.at(-1)).toBe(1)
    expect(steps.every((p, i) => i === 0 || p >= steps[i - 1]!)).toBe(true)
  })

  it('renders the same upload the same way twice', async () => {
    const png = await encodePng(drawSilhouette(DEMO_TARGET_TYPES[12]!.params, 'beam', { width: 600, height: 300 }))
    const a = await processImage(png, { sizes: [320], backdrop: 'sea' })
    const b = await processImage(png, { sizes: [320], backdrop: 'sea' })
    expect(a.renderings.map(r => r.sha256)).toEqual(b.renderings.map(r => r.sha256))
  })

  it('refuses an upload that sniffs as PNG but does not decode, with 422', async () => {
    const png = await encodePng(drawSilhouette(DEMO_TARGET_TYPES[0]!.params, 'beam', { width: 200, height: 120 }))
    const broken = png.slice()
    // Corrupt the compressed data but keep the chunk structure intact.
    for (let i = 60; i < broken.length - 20; i++) broken[i] = (broken[i]! * 7 + 13) & 255
    await expect(processImage(broken)).rejects.toBeInstanceOf(ImageRejected)
    await expect(processImage(broken)).rejects.toMatchObject({ status: 422 })
  })
})
