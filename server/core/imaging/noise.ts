// Deterministic value noise for the generated skies, clouds and sea (smoothstep-interpolated
// lattice noise summed over octaves; common practice in procedural texturing, no source).

/** 32-bit integer hash of a lattice point, octave and seed (Murmur3-style finaliser). */
export function hash32(x: number, y: number, octave: number, seed: number): number {
  let h = Math.imul(x | 0, 0x27D4EB2D) ^ Math.imul(y | 0, 0x165667B1) ^ Math.imul(octave + 1, 0x9E3779B1) ^ (seed | 0)
  h = Math.imul(h ^ (h >>> 15), 0x85EBCA6B)
  h = Math.imul(h ^ (h >>> 13), 0xC2B2AE35)
  return (h ^ (h >>> 16)) >>> 0
}

export interface NoiseSpec {
  /** size of the coarsest lattice cell along x, as a share of the long side */
  cell: number
  octaves: number
  /** cells are this many times longer along x than along y (streaks on the sea) */
  stretch?: number
}

/**
 * Noise in [0, 1] over a width x height grid, laid out in units of the long side so that the
 * same seed gives the same pattern at every size.
 */
export function valueNoise(width: number, height: number, spec: NoiseSpec, seed: number): Float32Array {
  const out = new Float32Array(width * height)
  const longSide = Math.max(width, height)
  const stretch = spec.stretch ?? 1
  // Each octave's lattice and column weights first; then every row sums its octaves in a row
  // buffer that stays in cache and is written out once (the same sums, in the same order).
  const octaves: { amplitude: number, cellY: number, gw: number, lattice: Float32Array, ix: Int32Array, sx: Float32Array }[] = []
  let amplitude = 1
  let total = 0
  for (let o = 0; o < spec.octaves; o++) {
    const cellX = spec.cell / 2 ** o
    const cellY = cellX / stretch
    const gw = Math.floor(width / longSide / cellX) + 2
    const gh = Math.floor(height / longSide / cellY) + 2
    const lattice = new Float32Array(gw * gh)
    for (let j = 0; j < gh; j++) {
      for (let i = 0; i < gw; i++) lattice[j * gw + i] = hash32(i, j, o, seed) / 4294967296
    }
    const ix = new Int32Array(width)
    const sx = new Float32Array(width)
    for (let x = 0; x < width; x++) {
      const g = (x + 0.5) / longSide / cellX
      const i = Math.floor(g)
      const f = g - i
      ix[x] = i
      sx[x] = f * f * (3 - 2 * f)
    }
    octaves.push({ amplitude, cellY, gw, lattice, ix, sx })
    total += amplitude
    amplitude *= 0.5
  }
  const inv = 1 / total
  const sum = new Float32Array(width)
  for (let y = 0; y < height; y++) {
    sum.fill(0)
    for (const { amplitude, cellY, gw, lattice, ix, sx } of octaves) {
      const g = (y + 0.5) / longSide / cellY
      const j = Math.floor(g)
      const f = g - j
      const sy = f * f * (3 - 2 * f)
      const r0 = j * gw
      const r1 = r0 + gw
      for (let x = 0; x < width; x++) {
        const i = ix[x]!
        const s = sx[x]!
        const top = lattice[r0 + i]! + (lattice[r0 + i + 1]! - lattice[r0 + i]!) * s
        const bottom = lattice[r1 + i]! + (lattice[r1 + i + 1]! - lattice[r1 + i]!) * s
        sum[x]! += amplitude * (top + (bottom - top) * sy)
      }
    }
    const row = y * width
    for (let x = 0; x < width; x++) out[row + x] = sum[x]! * inv
  }
  return out
}
