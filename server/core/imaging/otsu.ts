// Otsu's threshold (N. Otsu, "A Threshold Selection Method from Gray-Level Histograms",
// IEEE Trans. SMC 9(1), 1979) and the luminance histogram it runs on.
import { linearChannelToSrgb, srgbChannelToLinear } from '../../../shared/utils/contrast'

/**
 * The level t maximising the between-class variance w0·w1·(m0 − m1)², class 0 being levels 0..t
 * and class 1 levels t+1..255. Where several levels tie (an empty gap between two modes), the
 * middle of the tie is returned. A histogram with a single occupied level returns that level.
 */
export function otsuThreshold(histogram: ArrayLike<number>): number {
  const levels = histogram.length
  if (levels < 2) throw new RangeError('Otsu threshold needs a histogram of at least two levels')
  let total = 0
  let sumAll = 0
  for (let i = 0; i < levels; i++) {
    const n = histogram[i]!
    if (n < 0 || !Number.isFinite(n)) throw new RangeError('Histogram counts must be finite and not negative')
    total += n
    sumAll += i * n
  }
  if (total === 0) throw new RangeError('Otsu threshold of an empty histogram')

  let w0 = 0
  let sum0 = 0
  let best = -1
  let bestStart = 0
  let bestEnd = 0
  let onPlateau = false
  for (let t = 0; t < levels - 1; t++) {
    w0 += histogram[t]!
    sum0 += t * histogram[t]!
    const w1 = total - w0
    let between = 0
    if (w0 > 0 && w1 > 0) {
      const m0 = sum0 / w0
      const m1 = (sumAll - sum0) / w1
      between = (w0 / total) * (w1 / total) * (m0 - m1) * (m0 - m1)
    }
    // Relative tolerance so that float noise does not break a plateau of exact ties.
    if (between > best * (1 + 1e-12) + 1e-15) {
      best = between
      bestStart = t
      bestEnd = t
      onPlateau = true
    }
    else if (onPlateau && Math.abs(between - best) <= best * 1e-12 + 1e-15) {
      bestEnd = t
    }
    else {
      onPlateau = false
    }
  }
  if (best <= 0) {
    for (let i = 0; i < levels; i++) {
      if (histogram[i]! > 0) return i
    }
  }
  return Math.floor((bestStart + bestEnd) / 2)
}

let linearLut: Float32Array | null = null
let encodeLut: Uint8Array | null = null
const ENCODE_STEPS = 4096

function luts(): { linear: Float32Array, encode: Uint8Array } {
  if (!linearLut || !encodeLut) {
    linearLut = new Float32Array(256)
    for (let i = 0; i < 256; i++) linearLut[i] = srgbChannelToLinear(i / 255)
    encodeLut = new Uint8Array(ENCODE_STEPS + 1)
    for (let i = 0; i <= ENCODE_STEPS; i++) encodeLut[i] = Math.round(linearChannelToSrgb(i / ENCODE_STEPS) * 255)
  }
  return { linear: linearLut, encode: encodeLut }
}

/**
 * Per-pixel luminance level 0..255: WCAG relative luminance of the sRGB pixel, encoded back with
 * the sRGB transfer so that a grey pixel keeps its own value. Alpha is ignored.
 */
export function luminanceLevels(rgba: Uint8Array | Uint8ClampedArray, width: number, height: number): Uint8Array {
  const n = width * height
  if (rgba.length < n * 4) throw new RangeError('RGBA buffer is smaller than width x height x 4')
  const { linear, encode } = luts()
  const out = new Uint8Array(n)
  for (let i = 0, p = 0; i < n; i++, p += 4) {
    const y = 0.2126 * linear[rgba[p]!]! + 0.7152 * linear[rgba[p + 1]!]! + 0.0722 * linear[rgba[p + 2]!]!
    out[i] = encode[Math.round(y * ENCODE_STEPS)]!
  }
  return out
}

/** 256-bin histogram of luminance levels (see luminanceLevels) over opaque pixels (alpha >= 128). */
export function luminanceHistogram(rgba: Uint8Array | Uint8ClampedArray, width: number, height: number): number[] {
  const levels = luminanceLevels(rgba, width, height)
  const histogram = Array.from({ length: 256 }, () => 0)
  for (let i = 0; i < levels.length; i++) {
    if (rgba[i * 4 + 3]! >= 128) histogram[levels[i]!]!++
  }
  return histogram
}
