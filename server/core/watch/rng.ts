// Seeds and draws for a watch's plan and choices, from the one seedable generator (shared/utils/rng.ts).
import { createHash } from 'node:crypto'
import { seededRng } from '../../../shared/utils/rng'
import type { Rng } from '../../../shared/utils/rng'

export { seededRng }
export type { Rng }

/** A 32-bit seed from a string (the first four bytes of its SHA-256), e.g. from a sighting's id. */
export function seedFromString(text: string): number {
  return createHash('sha256').update(text).digest().readUInt32LE(0)
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
