// Renders a silhouette under each lighting condition on a generated sky or sea, in linear light,
// and measures the Weber contrast of the result.
import { linearChannelToSrgb, srgbChannelToLinear, weberContrast } from '../../../shared/utils/contrast'
import { CONDITIONS, type Condition } from '../../../shared/utils/conditions'
import { ImageRejected } from './errors'
import type { Box, Mask } from './mask'
import { seededRng } from '../../../shared/utils/rng'
import { hash32, type NoiseSpec, valueNoise } from './noise'

/** Long-side sizes, in pixels, every view is rendered at. */
export const RENDER_SIZES = [320, 640, 1080] as const
export type RenderSize = typeof RENDER_SIZES[number]

/** What lies behind the target: sky only, or sky with sea below the target's waterline. */
export type Backdrop = 'sky' | 'sea'

export interface Coverage {
  /** share of each pixel inside the target, 0..1 */
  coverage: Float32Array
  width: number
  height: number
}

export interface Rendering {
  condition: Condition
  rgba: Uint8ClampedArray
  width: number
  height: number
  /** Weber contrast of the target's mean relative luminance on the background's */
  contrast: number
  targetLuminance: number
  backgroundLuminance: number
  /** the target's bounding box in the rendering */
  target: Box
}

/**
 * Buffers one caller reuses across the renderings of one size (filled in on first use), so a view's
 * six conditions do not allocate six sets of pixel buffers. A rendering's rgba is then valid only
 * until the next rendering made with the same scratch.
 */
export interface RenderScratch {
  rgba?: Uint8ClampedArray
  soften?: [Float32Array, Float32Array]
  /** the noise fields of the sky, clouds and sea, shared by the conditions of one view at one size */
  noise?: Map<string, Float32Array>
}

export interface RenderOptions {
  backdrop?: Backdrop
  scratch?: RenderScratch
}

type Rgb = readonly [number, number, number]

interface Scene {
  skyTop: Rgb
  skyBottom: Rgb
  /** multiplicative variation of the sky, +- this share */
  skyVariation: number
  cloud?: { colour: Rgb, from: number, to: number, variation: number }
  /** white glare from a sun just outside the frame, added to the sky */
  glare?: number
  seaTop: Rgb
  seaBottom: Rgb
  target: Rgb
  /** target brighter at its top by this share, darker at its bottom */
  shade: number
  /** share of the glare that veils the target */
  veil: number
  /** softening of the outline, as a share of the long side */
  blur: number
  /** transmission of a filter in front of the eye, per channel */
  filter?: Rgb
}

// Linear-light colours: design values, no source. Chosen so that each condition lands inside its
// band of CONTRAST_BANDS and so that the Weber contrast of the target falls along the difficulty
// order from backlit on (backlit > haze > goggles > dark cloud; tests/e2e/contrast-order.test.ts
// checks it on the served renderings).
const BLUE_TOP: Rgb = [0.10, 0.21, 0.55]
const BLUE_BOTTOM: Rgb = [0.20, 0.32, 0.62]
const SEA_TOP: Rgb = [0.045, 0.11, 0.19]
const SEA_BOTTOM: Rgb = [0.02, 0.06, 0.11]
const AIRLIGHT: Rgb = [0.60, 0.62, 0.66]
const HAZE_TRANSMISSION = 0.65

const SCENES: Record<Condition, Scene> = {
  'sunlit': {
    skyTop: BLUE_TOP, skyBottom: BLUE_BOTTOM, skyVariation: 0.04,
    seaTop: SEA_TOP, seaBottom: SEA_BOTTOM,
    target: [0.62, 0.62, 0.60], shade: 0.25, veil: 0, blur: 0,
  },
  'backlit': {
    skyTop: [0.70, 0.76, 0.86], skyBottom: [0.74, 0.79, 0.87], skyVariation: 0.02, glare: 0.35,
    seaTop: [0.40, 0.43, 0.47], seaBottom: [0.22, 0.25, 0.29],
    target: [0.022, 0.024, 0.028], shade: 0.05, veil: 0.08, blur: 0,
  },
  'white-cloud': {
    skyTop: BLUE_TOP, skyBottom: BLUE_BOTTOM, skyVariation: 0.03,
    cloud: { colour: [0.80, 0.81, 0.84], from: 0.22, to: 0.46, variation: 0.12 },
    seaTop: [0.36, 0.38, 0.41], seaBottom: [0.26, 0.28, 0.31],
    target: [0.075, 0.075, 0.08], shade: 0.08, veil: 0, blur: 0,
  },
  'dark-cloud': {
    skyTop: [0.060, 0.063, 0.072], skyBottom: [0.070, 0.073, 0.080], skyVariation: 0.03,
    cloud: { colour: [0.080, 0.082, 0.090], from: 0.3, to: 0.7, variation: 0.25 },
    seaTop: [0.050, 0.055, 0.060], seaBottom: [0.035, 0.040, 0.045],
    target: [0.053, 0.053, 0.055], shade: 0.06, veil: 0, blur: 0,
  },
  'haze': {
    skyTop: [AIRLIGHT[0] * 0.95, AIRLIGHT[1] * 0.95, AIRLIGHT[2] * 0.96], skyBottom: [AIRLIGHT[0] * 1.03, AIRLIGHT[1] * 1.03, AIRLIGHT[2] * 1.02], skyVariation: 0.02,
    seaTop: [0.50, 0.52, 0.55], seaBottom: [0.42, 0.44, 0.47],
    target: [
      0.05 * HAZE_TRANSMISSION + AIRLIGHT[0] * (1 - HAZE_TRANSMISSION),
      0.05 * HAZE_TRANSMISSION + AIRLIGHT[1] * (1 - HAZE_TRANSMISSION),
      0.055 * HAZE_TRANSMISSION + AIRLIGHT[2] * (1 - HAZE_TRANSMISSION),
    ],
    shade: 0.03, veil: 0, blur: 1 / 250,
  },
  'goggles': {
    skyTop: BLUE_TOP, skyBottom: BLUE_BOTTOM, skyVariation: 0.04,
    // A sea lighter than under sunlit light (the sky it reflects near the horizon), so that a vessel
    // under goggles keeps about the contrast of an aircraft against the sky.
    seaTop: [0.12, 0.20, 0.30], seaBottom: [0.06, 0.12, 0.20],
    target: [0.115, 0.115, 0.115], shade: 0.08, veil: 0, blur: 0,
    // An amber filter: neutral light dimmed, blue cut hardest, so blue sky darkens most.
    filter: [0.14, 0.09, 0.02],
  },
}

interface Contributions {
  start: Int32Array
  weights: Float32Array
  taps: number
}

// Area averaging when shrinking (each output pixel averages the source pixels it covers), linear
// interpolation when enlarging.
function contributions(src: number, dst: number): Contributions {
  const scale = src / dst
  const taps = scale > 1 ? Math.ceil(scale) + 1 : 2
  const start = new Int32Array(dst)
  const weights = new Float32Array(dst * taps)
  for (let i = 0; i < dst; i++) {
    if (scale > 1) {
      const from = i * scale
      const to = from + scale
      const first = Math.floor(from)
      start[i] = first
      for (let k = 0; k < taps; k++) {
        const j = first + k
        if (j >= src) break
        const overlap = Math.min(to, j + 1) - Math.max(from, j)
        if (overlap > 0) weights[i * taps + k] = overlap / scale
      }
    }
    else {
      const centre = (i + 0.5) * scale - 0.5
      const first = Math.max(0, Math.min(src - 1, Math.floor(centre)))
      const f = Math.max(0, Math.min(1, centre - first))
      start[i] = first
      weights[i * taps] = first + 1 < src ? 1 - f : 1
      if (first + 1 < src) weights[i * taps + 1] = f
    }
  }
  return { start, weights, taps }
}

/** The mask's coverage at a size whose long side is longSide pixels, anti-aliased. */
export function coverageAt(m: Mask, longSide: number): Coverage {
  const scale = longSide / Math.max(m.width, m.height)
  const width = Math.max(1, Math.round(m.width * scale))
  const height = Math.max(1, Math.round(m.height * scale))
  const cx = contributions(m.width, width)
  const cy = contributions(m.height, height)
  const across = new Float32Array(m.height * width)
  for (let y = 0; y < m.height; y++) {
    const src = y * m.width
    const dst = y * width
    for (let x = 0; x < width; x++) {
      const s = cx.start[x]!
      const w0 = x * cx.taps
      let sum = 0
      for (let k = 0; k < cx.taps; k++) {
        const w = cx.weights[w0 + k]!
        if (w !== 0) sum += w * m.mask[src + s + k]!
      }
      across[dst + x] = sum * (1 / 255)
    }
  }
  const coverage = new Float32Array(width * height)
  for (let y = 0; y < height; y++) {
    const s = cy.start[y]!
    const dst = y * width
    for (let k = 0; k < cy.taps; k++) {
      const w = cy.weights[y * cy.taps + k]!
      if (w === 0) continue
      const src = (s + k) * width
      for (let x = 0; x < width; x++) coverage[dst + x]! += w * across[src + x]!
    }
  }
  for (let i = 0; i < coverage.length; i++) {
    if (coverage[i]! > 1) coverage[i] = 1
  }
  return { coverage, width, height }
}

// Two passes of a running box average per axis, close to a Gaussian softening. Rows are walked
// in memory order in both directions, keeping one running sum per column for the vertical pass.
function soften(c: Coverage, radius: number, scratch?: RenderScratch): Float32Array {
  const { width, height } = c
  const r = Math.max(1, Math.round(radius))
  const norm = 1 / (2 * r + 1)
  const n = c.coverage.length
  if (scratch && scratch.soften?.[0].length !== n) scratch.soften = [new Float32Array(n), new Float32Array(n)]
  let a = scratch ? scratch.soften![0] : new Float32Array(n)
  let b = scratch ? scratch.soften![1] : new Float32Array(n)
  a.set(c.coverage)
  const sums = new Float32Array(width)
  for (let pass = 0; pass < 2; pass++) {
    for (let y = 0; y < height; y++) {
      const row = y * width
      let sum = 0
      for (let k = -r; k <= r; k++) sum += a[row + (k < 0 ? 0 : k >= width ? width - 1 : k)]!
      for (let x = 0; x < width; x++) {
        b[row + x] = sum * norm
        const add = x + r + 1
        const drop = x - r
        sum += a[row + (add >= width ? width - 1 : add)]! - a[row + (drop < 0 ? 0 : drop)]!
      }
    }
    ;[a, b] = [b, a]
    sums.fill(0)
    for (let k = -r; k <= r; k++) {
      const src = (k < 0 ? 0 : k >= height ? height - 1 : k) * width
      for (let x = 0; x < width; x++) sums[x]! += a[src + x]!
    }
    for (let y = 0; y < height; y++) {
      const row = y * width
      const add = (y + r + 1 >= height ? height - 1 : y + r + 1) * width
      const drop = (y - r < 0 ? 0 : y - r) * width
      for (let x = 0; x < width; x++) {
        b[row + x] = sums[x]! * norm
        sums[x]! += a[add + x]! - a[drop + x]!
      }
    }
    ;[a, b] = [b, a]
  }
  return a
}

function boundsOf(coverage: Float32Array, width: number, height: number, level: number): Box {
  let minX = width
  let minY = height
  let maxX = -1
  let maxY = -1
  for (let y = 0; y < height; y++) {
    const row = y * width
    for (let x = 0; x < width; x++) {
      if (coverage[row + x]! >= level) {
        if (x < minX) minX = x
        if (x > maxX) maxX = x
        if (y < minY) minY = y
        maxY = y
      }
    }
  }
  if (maxX < 0) return { x: 0, y: 0, width: 0, height: 0 }
  return { x: minX, y: minY, width: maxX - minX + 1, height: maxY - minY + 1 }
}

const ENCODE_STEPS = 16384
const GLARE_STEPS = 2048
let encodeLut: Uint8Array | null = null
let decodeLut: Float32Array | null = null

function toSrgbLut(): Uint8Array {
  if (!encodeLut) {
    encodeLut = new Uint8Array(ENCODE_STEPS + 1)
    for (let i = 0; i <= ENCODE_STEPS; i++) encodeLut[i] = Math.round(linearChannelToSrgb(i / ENCODE_STEPS) * 255)
  }
  return encodeLut
}

function toLinearLut(): Float32Array {
  if (!decodeLut) {
    decodeLut = new Float32Array(256)
    for (let i = 0; i < 256; i++) decodeLut[i] = srgbChannelToLinear(i / 255)
  }
  return decodeLut
}

/** Share of coverage above which a pixel counts as the target's core, and below which as background. */
export const TARGET_CORE = 0.9
export const BACKGROUND_EDGE = 0.02

/** Mean relative luminance of target core and background pixels of an RGBA rendering, and their Weber contrast. */
export function measureContrast(rgba: Uint8ClampedArray | Uint8Array, coverage: Float32Array): { contrast: number, targetLuminance: number, backgroundLuminance: number } {
  const lin = toLinearLut()
  let core = 0
  let coreSum = 0
  let half = 0
  let halfSum = 0
  let back = 0
  let backSum = 0
  for (let i = 0, p = 0; i < coverage.length; i++, p += 4) {
    const c = coverage[i]!
    const l = 0.2126 * lin[rgba[p]!]! + 0.7152 * lin[rgba[p + 1]!]! + 0.0722 * lin[rgba[p + 2]!]!
    if (c >= TARGET_CORE) {
      core++
      coreSum += l
    }
    if (c >= 0.5) {
      half++
      halfSum += l
    }
    else if (c <= BACKGROUND_EDGE) {
      back++
      backSum += l
    }
  }
  // A target too thin to have core pixels at this size is measured on its half-covered pixels.
  const targetLuminance = core >= 8 ? coreSum / core : half > 0 ? halfSum / half : Number.NaN
  const backgroundLuminance = back > 0 ? backSum / back : Number.NaN
  // No target pixel or no lit background: there is no contrast to measure (NaN, refused by the renderer).
  const contrast = Number.isFinite(targetLuminance) && backgroundLuminance > 0 ? weberContrast(targetLuminance, backgroundLuminance) : Number.NaN
  return { contrast, targetLuminance, backgroundLuminance }
}

// The conditions of one view share their noise fields, so with a scratch each is computed once
// per size; the fields go with the scratch, so nothing outlives the view.
function noiseField(width: number, height: number, spec: NoiseSpec, seed: number, scratch?: RenderScratch): Float32Array {
  if (!scratch) return valueNoise(width, height, spec, seed)
  scratch.noise ??= new Map()
  const key = `${width}x${height}:${spec.cell}:${spec.octaves}:${spec.stretch ?? 1}:${seed}`
  let field = scratch.noise.get(key)
  if (!field) {
    field = valueNoise(width, height, spec, seed)
    scratch.noise.set(key, field)
  }
  return field
}

/** Renders prepared coverage under one condition. Deterministic for a seed. */
export function renderCoverage(cov: Coverage, condition: Condition, seed: number, options: RenderOptions = {}): Rendering {
  const scene = SCENES[condition]
  const { width, height } = cov
  const longSide = Math.max(width, height)
  const n = width * height
  const conditionSeed = hash32(seed, CONDITIONS.indexOf(condition), 7, 0x61C88647)
  const coverage = scene.blur > 0 ? soften(cov, scene.blur * longSide, options.scratch) : cov.coverage
  const target = boundsOf(cov.coverage, width, height, 0.5)
  const horizon = options.backdrop === 'sea' && target.height > 0 ? target.y + target.height - 1 : height

  const skyNoise = noiseField(width, height, { cell: 0.6, octaves: 3 }, seed, options.scratch)
  const cloudNoise = scene.cloud ? noiseField(width, height, { cell: 0.45, octaves: 5 }, seed ^ 0x5BD1E995, options.scratch) : null
  const seaNoise = horizon < height ? noiseField(width, height, { cell: 0.25, octaves: 3, stretch: 6 }, seed ^ 0x1B873593, options.scratch) : null

  const random = seededRng(conditionSeed)
  const sunX = random() * width
  const sunY = -(0.15 + 0.25 * random()) * height
  const glareReach = 1 / (0.55 * Math.hypot(width, height))
  // Glare falls off exponentially with distance from the sun; tabulated over 0..4 reach lengths.
  const glareStep = GLARE_STEPS * glareReach / 4
  let glareLut: Float32Array | null = null
  if (scene.glare) {
    glareLut = new Float32Array(GLARE_STEPS + 1)
    for (let k = 0; k <= GLARE_STEPS; k++) glareLut[k] = scene.glare * Math.exp(-4 * k / GLARE_STEPS)
  }

  const lut = toSrgbLut()
  const scratch = options.scratch
  if (scratch && scratch.rgba?.length !== n * 4) scratch.rgba = new Uint8ClampedArray(n * 4)
  const rgba = scratch ? scratch.rgba! : new Uint8ClampedArray(n * 4)
  const [fr, fg, fb] = scene.filter ?? [1, 1, 1]
  const [tr, tg, tb] = scene.target
  const sv = scene.skyVariation * 2
  const cloud = scene.cloud
  const cloudSpan = cloud ? 1 / (cloud.to - cloud.from) : 0
  const cx = width / 2
  const cy = height / 2
  const invHalfDiag = 1 / Math.hypot(cx, cy)

  for (let y = 0; y < height; y++) {
    const t = height > 1 ? y / (height - 1) : 0
    const skyR = scene.skyTop[0] + (scene.skyBottom[0] - scene.skyTop[0]) * t
    const skyG = scene.skyTop[1] + (scene.skyBottom[1] - scene.skyTop[1]) * t
    const skyB = scene.skyTop[2] + (scene.skyBottom[2] - scene.skyTop[2]) * t
    const seaT = horizon < height ? Math.max(0, (y - horizon) / Math.max(1, height - 1 - horizon)) : 0
    const seaR = scene.seaTop[0] + (scene.seaBottom[0] - scene.seaTop[0]) * seaT
    const seaG = scene.seaTop[1] + (scene.seaBottom[1] - scene.seaTop[1]) * seaT
    const seaB = scene.seaTop[2] + (scene.seaBottom[2] - scene.seaTop[2]) * seaT
    const ty = target.height > 0 ? (y - target.y) / target.height : 0.5
    const shade = 1 + scene.shade * (0.5 - Math.max(0, Math.min(1, ty))) * 2
    const row = y * width
    const isSea = y > horizon
    const dyc2 = (y - cy) * (y - cy)
    const dys2 = (y - sunY) * (y - sunY)
    for (let x = 0; x < width; x++) {
      const i = row + x
      let r: number
      let g: number
      let b: number
      let glare = 0
      if (glareLut) {
        const dx = x - sunX
        const d = Math.sqrt(dx * dx + dys2) * glareStep
        glare = glareLut[d < GLARE_STEPS ? d | 0 : GLARE_STEPS]!
      }
      if (isSea) {
        const m = 1 + 0.16 * (seaNoise![i]! - 0.5)
        r = seaR * m + glare * 0.6
        g = seaG * m + glare * 0.6
        b = seaB * m + glare * 0.6
      }
      else {
        const m = 1 + sv * (skyNoise[i]! - 0.5)
        r = skyR * m
        g = skyG * m
        b = skyB * m
        if (cloud) {
          // Cloud thickest near the middle of the frame, where the target crosses it.
          const centre = 1 - Math.sqrt((x - cx) * (x - cx) + dyc2) * invHalfDiag
          const d = Math.max(0, Math.min(1, (cloudNoise![i]! + 0.3 * centre - cloud.from) * cloudSpan))
          const density = d * d * (3 - 2 * d)
          const bright = 1 + cloud.variation * 2 * (cloudNoise![i]! - 0.5)
          r += (cloud.colour[0] * bright - r) * density
          g += (cloud.colour[1] * bright - g) * density
          b += (cloud.colour[2] * bright - b) * density
        }
        r += glare
        g += glare
        b += glare
      }
      const c = coverage[i]!
      if (c > 0) {
        const veil = glare * scene.veil
        r += (tr * shade + veil - r) * c
        g += (tg * shade + veil - g) * c
        b += (tb * shade + veil - b) * c
      }
      const p = i * 4
      rgba[p] = lut[Math.min(ENCODE_STEPS, Math.max(0, (r * fr * ENCODE_STEPS + 0.5) | 0))]!
      rgba[p + 1] = lut[Math.min(ENCODE_STEPS, Math.max(0, (g * fg * ENCODE_STEPS + 0.5) | 0))]!
      rgba[p + 2] = lut[Math.min(ENCODE_STEPS, Math.max(0, (b * fb * ENCODE_STEPS + 0.5) | 0))]!
      rgba[p + 3] = 255
    }
  }

  const measured = measureContrast(rgba, coverage)
  if (!Number.isFinite(measured.contrast)) {
    throw new ImageRejected(422, `The target is too small or too thin to show at ${longSide} px: no part of it covers a whole pixel. Crop the picture closer around the target, or use a picture where it is a solid shape.`)
  }
  return { condition, rgba, width, height, ...measured, target }
}

/** Renders a mask under one condition with its long side at longSide pixels. Deterministic for a seed. */
export function renderCondition(m: Mask, condition: Condition, longSide: number, seed: number, options: RenderOptions = {}): Rendering {
  return renderCoverage(coverageAt(m, longSide), condition, seed, options)
}
