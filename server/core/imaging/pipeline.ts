// One upload to its renderings: sniff, decode, extract the silhouette, crop, render every
// condition at every size, encode WebP. Pure: returns bytes, writes nothing.
import { createHash } from 'node:crypto'
import { CONDITIONS, type Condition } from '../../../shared/utils/conditions'
import { decodeImage, encodeWebp, type ImageMime } from './codecs'
import { ImageRejected } from './errors'
import { type Box, cropMask, extractSilhouette, type MaskMethod, padMaskToAspect } from './mask'
import { type Backdrop, coverageAt, RENDER_SIZES, renderCoverage, type RenderScratch } from './render'
import { DEFAULT_UPLOAD_LIMITS, inspectUpload, type UploadLimits } from './sniff'

export interface ProcessOptions {
  limits?: UploadLimits
  /** long sides to render, default RENDER_SIZES */
  sizes?: readonly number[]
  conditions?: readonly Condition[]
  /** 'sea' for vessels: the target's lowest row is taken as the waterline */
  backdrop?: Backdrop
  /** default: taken from the source's SHA-256, so the same upload renders the same */
  seed?: number
  /** WebP quality 0..100, default 80 */
  quality?: number
  /** margin around the silhouette, as a share of its longer side, default 0.08 */
  margin?: number
  /** called with the share of the work done, 0..1 */
  onProgress?: (done: number) => void
}

export interface ProcessedRendering {
  condition: Condition
  /** the long side asked for */
  size: number
  width: number
  height: number
  /** length of the WebP in bytes */
  bytes: number
  contrast: number
  targetLuminance: number
  backgroundLuminance: number
  /** the target's bounding box in the rendering */
  target: Box
  webp: Uint8Array
  sha256: string
}

export interface ProcessedImage {
  source: { mime: ImageMime, width: number, height: number, sha256: string }
  method: MaskMethod
  renderings: ProcessedRendering[]
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex')
}

/** Turns an upload into its renderings; throws ImageRejected for an upload Glint refuses. */
export async function processImage(bytes: Uint8Array, options: ProcessOptions = {}): Promise<ProcessedImage> {
  const progress = options.onProgress ?? (() => {})
  const info = inspectUpload(bytes, options.limits)
  const sourceHash = sha256Hex(bytes)
  progress(0.02)

  let image
  try {
    image = await decodeImage(bytes, info.mime)
  }
  catch (error) {
    throw new ImageRejected(422, `This ${info.mime.slice(6).toUpperCase()} file could not be decoded; it may be damaged or cut off.`, { cause: error })
  }
  // The header's size was checked before decoding; the decoder's own size is checked before any
  // pass over the pixels, since a file may decode to another size than its first header says.
  const { maxSide, maxPixels } = { ...DEFAULT_UPLOAD_LIMITS, ...options.limits }
  if (image.width !== info.width || image.height !== info.height || image.width * image.height > maxPixels || Math.max(image.width, image.height) > maxSide) {
    throw new ImageRejected(422, `This ${info.mime.slice(6).toUpperCase()} file declares ${info.width} x ${info.height} px but decodes to ${image.width} x ${image.height} px; it may be damaged. Save it again and upload the new file.`)
  }
  progress(0.1)

  const silhouette = extractSilhouette(image.data, image.width, image.height)
  const framed = padMaskToAspect(cropMask(silhouette, options.margin ?? 0.08), 2)
  progress(0.15)

  const sizes = options.sizes ?? RENDER_SIZES
  const conditions = options.conditions ?? CONDITIONS
  const seed = options.seed ?? Number.parseInt(sourceHash.slice(0, 8), 16)
  const total = sizes.length * conditions.length
  const renderings: ProcessedRendering[] = []
  for (const size of sizes) {
    const coverage = coverageAt(framed, size)
    // One set of pixel buffers for the conditions of this size: each rendering is encoded before the next.
    const scratch: RenderScratch = {}
    for (const condition of conditions) {
      const rendering = renderCoverage(coverage, condition, seed, { backdrop: options.backdrop, scratch })
      const webp = await encodeWebp({ data: rendering.rgba, width: rendering.width, height: rendering.height }, { quality: options.quality ?? 80 })
      renderings.push({
        condition,
        size,
        width: rendering.width,
        height: rendering.height,
        bytes: webp.byteLength,
        contrast: rendering.contrast,
        targetLuminance: rendering.targetLuminance,
        backgroundLuminance: rendering.backgroundLuminance,
        target: rendering.target,
        webp,
        sha256: sha256Hex(webp),
      })
      progress(0.15 + 0.85 * renderings.length / total)
    }
  }
  return {
    source: { mime: info.mime, width: image.width, height: image.height, sha256: sourceHash },
    method: silhouette.method,
    renderings,
  }
}
