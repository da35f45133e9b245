// Seeds and draws for a watch's plan and choices, from the one seedable generator (shared/utils/rng.ts).

import { mulberry32 } from '../../../shared/utils/rng'
import type { Rng } from '../../../shared/utils/rng'

export { mulberry32 }
export type { Rng }

/** A 32-bit seed from a string (FNV-1a), e.g. from a watch id and a position. */
export function seedFromString(text: string): number {
  let h = 0x811C9DC5
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i)
    h = Math.imul(h, 0x01000193)
  }
  return h >>> 0
}

/** A whole number in [0, n) from the rng. */
export function randomIndex(rng: Rng, n: number): number {
  if (!Number.isInteger(n) || n <= 0) throw new RangeError(`n must be a whole number > 0, got ${n}`)
  return Math.min(n - 1, Math.floor(rng() * n))
}

/** Fisher–Yates shuffle into a new array. */
export function shuffled<T>(items: readonly T[], rng: Rng): T[] {
  const out = items.slice()
  for (let i = out.length - 1; i > 0; i--) {
    const j = randomIndex(rng, i + 1)
    const tmp = out[i]!
    out[i] = out[j]!
    out[j] = tmp
  }
  return out
}
