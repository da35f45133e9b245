// The silhouette of an upload: from its alpha channel when it has real transparency, else from
// Otsu's luminance threshold with the target taken as the class that leaves the border free.
import { ImageRejected } from './errors'
import { luminanceLevels, otsuThreshold } from './otsu'

export interface Mask {
  /** one byte a pixel, 255 inside the target, 0 outside */
  mask: Uint8Array
  width: number
  height: number
}

export type MaskMethod = 'alpha' | 'otsu-dark' | 'otsu-light'

export interface Silhouette extends Mask {
  method: MaskMethod
  /** Otsu's level for the otsu methods */
  threshold?: number
}

export interface Box {
  x: number
  y: number
  width: number
  height: number
}

/** Smallest share of the picture a silhouette may cover, and the largest. */
export const MIN_COVER = 0.0005
export const MAX_COVER = 0.9

function borderShare(inClass: (i: number) => boolean, width: number, height: number): number {
  let hits = 0
  let count = 0
  for (let x = 0; x < width; x++) {
    count += 2
    if (inClass(x)) hits++
    if (inClass((height - 1) * width + x)) hits++
  }
  for (let y = 1; y < height - 1; y++) {
    count += 2
    if (inClass(y * width)) hits++
    if (inClass(y * width + width - 1)) hits++
  }
  return count ? hits / count : 0
}

function refuseUnlessSilhouette(mask: Uint8Array): void {
  let inside = 0
  for (let i = 0; i < mask.length; i++) {
    if (mask[i]) inside++
  }
  const share = inside / mask.length
  if (inside < 16 || share < MIN_COVER) {
    throw new ImageRejected(422, 'No silhouette found: the picture looks blank. Upload a dark or light shape on a plain background, or a PNG with a transparent background.')
  }
  if (share > MAX_COVER) {
    throw new ImageRejected(422, 'No silhouette found: the shape fills almost the whole picture. Leave a plain background around the target.')
  }
}

/** Extracts the target's silhouette from an RGBA picture; throws ImageRejected (422) when there is none. */
export function extractSilhouette(rgba: Uint8Array | Uint8ClampedArray, width: number, height: number): Silhouette {
  const n = width * height
  if (!(width > 0 && height > 0) || rgba.length < n * 4) throw new RangeError('RGBA buffer does not match width x height')
  const mask = new Uint8Array(n)

  let transparent = 0
  for (let i = 0; i < n; i++) {
    if (rgba[i * 4 + 3]! < 128) transparent++
  }
  // Real transparency: a visible share of the picture is see-through, not just a stray pixel.
  if (transparent >= Math.max(16, n * 0.01)) {
    for (let i = 0; i < n; i++) mask[i] = rgba[i * 4 + 3]! >= 128 ? 255 : 0
    refuseUnlessSilhouette(mask)
    return { mask, width, height, method: 'alpha' }
  }

  const levels = luminanceLevels(rgba, width, height)
  const histogram = Array.from({ length: 256 }, () => 0)
  for (let i = 0; i < n; i++) histogram[levels[i]!]!++
  const threshold = otsuThreshold(histogram)
  const darkOnBorder = borderShare(i => levels[i]! <= threshold, width, height)
  const method: MaskMethod = darkOnBorder > 0.5 ? 'otsu-light' : 'otsu-dark'
  if (method === 'otsu-dark') {
    for (let i = 0; i < n; i++) mask[i] = levels[i]! <= threshold ? 255 : 0
  }
  else {
    for (let i = 0; i < n; i++) mask[i] = levels[i]! > threshold ? 255 : 0
  }
  refuseUnlessSilhouette(mask)
  return { mask, width, height, method, threshold }
}

/** Bounding box of the pixels inside the mask, or null for an empty mask. */
export function maskBounds(m: Mask): Box | null {
  let minX = m.width
  let minY = m.height
  let maxX = -1
  let maxY = -1
  for (let y = 0; y < m.height; y++) {
    const row = y * m.width
    let first = -1
    let last = -1
    for (let x = 0; x < m.width; x++) {
      if (m.mask[row + x]) {
        if (first < 0) first = x
        last = x
      }
    }
    if (first >= 0) {
      if (first < minX) minX = first
      if (last > maxX) maxX = last
      if (y < minY) minY = y
      maxY = y
    }
  }
  if (maxX < 0) return null
  return { x: minX, y: minY, width: maxX - minX + 1, height: maxY - minY + 1 }
}

/** Copies the region (x, y, width, height) of a mask; parts outside the source are empty. */
export function regionOf(m: Mask, region: Box): Mask {
  const out = new Uint8Array(region.width * region.height)
  for (let y = 0; y < region.height; y++) {
    const sy = y + region.y
    if (sy < 0 || sy >= m.height) continue
    const x0 = Math.max(0, -region.x)
    const x1 = Math.min(region.width, m.width - region.x)
    if (x1 > x0) out.set(m.mask.subarray(sy * m.width + region.x + x0, sy * m.width + region.x + x1), y * region.width + x0)
  }
  return { mask: out, width: region.width, height: region.height }
}

/**
 * Crops a mask to its bounding box plus a margin, given as a share of the box's longer side,
 * padding with background where the margin runs past the picture. Returns the target's box
 * inside the crop.
 */
export function cropMask(m: Mask, margin = 0.08): Mask & { target: Box } {
  const box = maskBounds(m)
  if (!box) throw new ImageRejected(422, 'No silhouette found: the picture looks blank.')
  const pad = Math.round(Math.max(0, margin) * Math.max(box.width, box.height))
  const region = { x: box.x - pad, y: box.y - pad, width: box.width + 2 * pad, height: box.height + 2 * pad }
  return { ...regionOf(m, region), target: { x: pad, y: pad, width: box.width, height: box.height } }
}

/** Pads a mask with background, centred, so its long side is at most maxRatio times its short side. */
export function padMaskToAspect(m: Mask, maxRatio = 2): Mask & { offsetX: number, offsetY: number } {
  let width = m.width
  let height = m.height
  if (width > height * maxRatio) height = Math.ceil(width / maxRatio)
  else if (height > width * maxRatio) width = Math.ceil(height / maxRatio)
  const offsetX = Math.floor((width - m.width) / 2)
  const offsetY = Math.floor((height - m.height) / 2)
  if (width === m.width && height === m.height) return { ...m, offsetX: 0, offsetY: 0 }
  return { ...regionOf(m, { x: -offsetX, y: -offsetY, width, height }), offsetX, offsetY }
}
