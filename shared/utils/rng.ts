// Small seedable random numbers, so that a watch's plan, a rendering's sun and a scan scene can
// be replayed and tested. One generator for the server and the phone: pure-rand's Mersenne Twister
// (MT19937, Matsumoto & Nishimura, ACM TOMACS 8(1), 1998), read as 53-bit floats by pure-rand's
// uniformFloat64. Its seeding spreads neighbouring seeds (0, 1, 2, ...) apart from the first draw,
// which pure-rand's xoroshiro128+ does not (measured: its first float was 1.000 for seeds 0 to 199).
// Not for secrets (ids and tokens use node:crypto).
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64'
import { mersenne } from 'pure-rand/generator/mersenne'

export type Rng = () => number

/** Floats in [0, 1), the same sequence for the same 32-bit seed on every machine. */
export function seededRng(seed: number): Rng {
  const generator = mersenne(seed | 0)
  return () => uniformFloat64(generator)
}
