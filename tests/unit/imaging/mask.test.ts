import { describe, expect, it } from 'vitest'
import { decodeImage, encodePng } from '../../../server/core/imaging/codecs'
import { ImageRejected } from '../../../server/core/imaging/errors'
import { cropMask, extractSilhouette, maskBounds, padMaskToAspect } from '../../../server/core/imaging/mask'

const W = 120
const H = 80
// An invented test shape: a rectangle from (30, 20) to (89, 49) inclusive.
const inside = (x: number, y: number) => x >= 30 && x < 90 && y >= 20 && y < 50

function picture(shape: [number, number, number, number], ground: [number, number, number, number]): Uint8ClampedArray {
  const data = new Uint8ClampedArray(W * H * 4)
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) data.set(inside(x, y) ? shape : ground, (y * W + x) * 4)
  }
  return data
}

describe('extractSilhouette', () => {
  it('takes a black shape on white as otsu-dark with the right bounding box', () => {
    const s = extractSilhouette(picture([0, 0, 0, 255], [255, 255, 255, 255]), W, H)
    expect(s.method).toBe('otsu-dark')
    expect(maskBounds(s)).toEqual({ x: 30, y: 20, width: 60, height: 30 })
  })

  it('takes a white shape on black as otsu-light with the right bounding box', () => {
    const s = extractSilhouette(picture([250, 250, 250, 255], [10, 10, 10, 255]), W, H)
    expect(s.method).toBe('otsu-light')
    expect(maskBounds(s)).toEqual({ x: 30, y: 20, width: 60, height: 30 })
  })

  it('takes a PNG with a transparent background from its alpha channel', async () => {
    const png = await encodePng({ data: picture([0, 0, 0, 255], [255, 255, 255, 0]), width: W, height: H })
    const decoded = await decodeImage(png, 'image/png')
    const s = extractSilhouette(decoded.data, decoded.width, decoded.height)
    expect(s.method).toBe('alpha')
    expect(maskBounds(s)).toEqual({ x: 30, y: 20, width: 60, height: 30 })
  })

  it('refuses a blank picture with 422', () => {
    const blank = new Uint8ClampedArray(W * H * 4).fill(255)
    expect(() => extractSilhouette(blank, W, H)).toThrow(ImageRejected)
    try {
      extractSilhouette(blank, W, H)
    }
    catch (error) {
      expect((error as ImageRejected).status).toBe(422)
    }
  })

  it('refuses a shape that fills almost the whole picture', () => {
    const data = new Uint8ClampedArray(W * H * 4)
    for (let i = 0; i < W * H; i++) data.set(i === 0 ? [255, 255, 255, 255] : [0, 0, 0, 255], i * 4)
    expect(() => extractSilhouette(data, W, H)).toThrow(/No silhouette/)
  })
})

describe('cropMask and padMaskToAspect', () => {
  it('crops to the bounding box plus the margin and reports the target inside the crop', () => {
    const s = extractSilhouette(picture([0, 0, 0, 255], [255, 255, 255, 255]), W, H)
    const c = cropMask(s, 0.1)
    expect(c.width).toBe(60 + 2 * 6)
    expect(c.height).toBe(30 + 2 * 6)
    expect(c.target).toEqual({ x: 6, y: 6, width: 60, height: 30 })
    expect(maskBounds(c)).toEqual(c.target)
  })

  it('pads past the picture edge with background', () => {
    const s = extractSilhouette(picture([0, 0, 0, 255], [255, 255, 255, 255]), W, H)
    const c = cropMask(s, 0.5)
    expect(c.width).toBe(120)
    expect(maskBounds(c)).toEqual({ x: 30, y: 30, width: 60, height: 30 })
  })

  it('pads a long thin mask to at most 2:1 and keeps the shape centred', () => {
    const s = extractSilhouette(picture([0, 0, 0, 255], [255, 255, 255, 255]), W, H)
    const padded = padMaskToAspect(cropMask(s, 0), 1.5)
    expect(padded.width / padded.height).toBeLessThanOrEqual(1.5)
    expect(maskBounds(padded)).toEqual({ x: 0, y: padded.offsetY, width: 60, height: 30 })
  })
})
