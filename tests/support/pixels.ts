// Pixels for the browser tests: screenshots (PNG) and served renderings (WebP) decoded with the
// @jsquash codecs, WCAG 2.2 relative luminance and contrast, and Otsu's threshold, written out here.
import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'

export interface Pixels { width: number, height: number, data: Uint8ClampedArray }

const require = createRequire(import.meta.url)
const wasm = (pkg: string, file: string) => WebAssembly.compile(readFileSync(join(dirname(require.resolve(`${pkg}/package.json`)), file)))
let png: Promise<(b: ArrayBuffer) => Promise<Pixels>> | null = null
let webp: Promise<(b: ArrayBuffer) => Promise<Pixels>> | null = null

const arrayBuffer = (b: Buffer) => b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer

export async function decodePng(bytes: Buffer): Promise<Pixels> {
  png ??= (async () => {
    const m = await import('@jsquash/png/decode.js')
    await m.init(await wasm('@jsquash/png', 'codec/pkg/squoosh_png_bg.wasm'))
    return (b: ArrayBuffer) => m.default(b) as Promise<Pixels>
  })()
  return (await png)(arrayBuffer(bytes))
}

export async function decodeWebp(bytes: Buffer): Promise<Pixels> {
  webp ??= (async () => {
    const m = await import('@jsquash/webp/decode.js')
    await m.init(await wasm('@jsquash/webp', 'codec/dec/webp_dec.wasm'))
    return (b: ArrayBuffer) => m.default(b) as Promise<Pixels>
  })()
  return (await webp)(arrayBuffer(bytes))
}

// WCAG 2.2, "relative luminance": sRGB channels linearised, then 0.2126 R + 0.7152 G + 0.0722 B.
export const linear = (c8: number) => {
  const c = c8 / 255
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4
}
export const relativeLuminance = (r: number, g: number, b: number) => 0.2126 * linear(r) + 0.7152 * linear(g) + 0.0722 * linear(b)
// WCAG 2.2, "contrast ratio": (L1 + 0.05) / (L2 + 0.05), L1 the lighter.
export const contrastRatio = (a: number, b: number) => (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05)

/** Luminance of every pixel, 0..255 (for thresholds). */
export function grey(p: Pixels): Float64Array {
  const out = new Float64Array(p.width * p.height)
  for (let i = 0; i < out.length; i++) out[i] = 255 * relativeLuminance(p.data[4 * i]!, p.data[4 * i + 1]!, p.data[4 * i + 2]!)
  return out
}

/** Otsu's threshold on 256 bins: the one that maximises the between-class variance (N. Otsu, IEEE Trans. SMC 9(1), 1979). */
export function otsu(values: Float64Array): number {
  const hist = new Float64Array(256)
  for (const v of values) hist[Math.min(255, Math.max(0, Math.round(v)))]!++
  const total = values.length
  let sumAll = 0
  for (let i = 0; i < 256; i++) sumAll += i * hist[i]!
  let w0 = 0
  let sum0 = 0
  let best = 0
  let at = 0
  for (let t = 0; t < 256; t++) {
    w0 += hist[t]!
    if (w0 === 0) continue
    const w1 = total - w0
    if (w1 === 0) break
    sum0 += t * hist[t]!
    const m0 = sum0 / w0
    const m1 = (sumAll - sum0) / w1
    const between = w0 * w1 * (m0 - m1) ** 2
    if (between > best) {
      best = between
      at = t
    }
  }
  return at + 0.5
}

/** The target's side of a threshold: the smaller class (a silhouette covers less than its picture). */
export function silhouette(values: Float64Array, threshold: number): Uint8Array {
  const above = values.reduce((n, v) => n + (v > threshold ? 1 : 0), 0)
  const targetAbove = above < values.length / 2
  return Uint8Array.from(values, v => ((v > threshold) === targetAbove ? 1 : 0))
}

export type Filter = 'bilinear' | 'box' | 'bicubic'

// Mitchell-Netravali cubic with B = C = 1/3 (Mitchell & Netravali, SIGGRAPH 1988).
function mitchell(x: number): number {
  const B = 1 / 3
  const C = 1 / 3
  const t = Math.abs(x)
  if (t < 1) return ((12 - 9 * B - 6 * C) * t ** 3 + (-18 + 12 * B + 6 * C) * t ** 2 + (6 - 2 * B)) / 6
  if (t < 2) return ((-B - 6 * C) * t ** 3 + (6 * B + 30 * C) * t ** 2 + (-12 * B - 48 * C) * t + (8 * B + 24 * C)) / 6
  return 0
}

/**
 * Grey values resampled to another size with one of the filters browsers draw images with (bilinear,
 * a box average over each output pixel's footprint, or a Mitchell cubic), shifted by (dx, dy) output
 * pixels to register a sub-pixel offset.
 */
export function resampleGrey(values: Float64Array, w: number, h: number, W: number, H: number, dx = 0, dy = 0, filter: Filter = 'bilinear'): Float64Array {
  const out = new Float64Array(W * H)
  const at = (x: number, y: number) => values[Math.min(h - 1, Math.max(0, y)) * w + Math.min(w - 1, Math.max(0, x))]!
  const bilinear = (sx: number, sy: number) => {
    const x0 = Math.floor(sx)
    const y0 = Math.floor(sy)
    const fx = sx - x0
    const fy = sy - y0
    return (at(x0, y0) * (1 - fx) + at(x0 + 1, y0) * fx) * (1 - fy) + (at(x0, y0 + 1) * (1 - fx) + at(x0 + 1, y0 + 1) * fx) * fy
  }
  const bicubic = (sx: number, sy: number) => {
    const x0 = Math.floor(sx)
    const y0 = Math.floor(sy)
    let sum = 0
    let wsum = 0
    for (let j = -1; j <= 2; j++) {
      const wy = mitchell(sy - (y0 + j))
      for (let i = -1; i <= 2; i++) {
        const wgt = wy * mitchell(sx - (x0 + i))
        sum += wgt * at(x0 + i, y0 + j)
        wsum += wgt
      }
    }
    return sum / wsum
  }
  const N = 4
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const sx = (x + dx + 0.5) * (w / W) - 0.5
      const sy = (y + dy + 0.5) * (h / H) - 0.5
      let v: number
      if (filter === 'bilinear') v = bilinear(sx, sy)
      else if (filter === 'bicubic') v = bicubic(sx, sy)
      else {
        v = 0
        for (let j = 0; j < N; j++) {
          for (let i = 0; i < N; i++) v += bilinear((x + dx + (i + 0.5) / N) * (w / W) - 0.5, (y + dy + (j + 0.5) / N) * (h / H) - 0.5)
        }
        v /= N * N
      }
      out[y * W + x] = v
    }
  }
  return out
}

/** Pixels on the target's side of a threshold (targetAbove: the target is the lighter class). */
export function side(values: Float64Array, threshold: number, targetAbove: boolean): Uint8Array {
  return Uint8Array.from(values, v => ((v > threshold) === targetAbove ? 1 : 0))
}

/** Intersection over union of two masks of the same size (Jaccard index). */
export function iou(a: Uint8Array, b: Uint8Array): number {
  let inter = 0
  let union = 0
  for (let i = 0; i < a.length; i++) {
    inter += a[i]! & b[i]!
    union += a[i]! | b[i]!
  }
  return union ? inter / union : 1
}
