// Small seedable random numbers, so that a watch's plan, a rendering's grain and a scan scene can
// be replayed and tested. One generator for the server and the phone.

export type Rng = () => number

/**
 * mulberry32 (Tommy Ettinger's 32-bit state generator, common practice in small JavaScript
 * simulations, no published paper): floats in [0, 1). Not for secrets (ids and tokens use node:crypto).
 */
export function mulberry32(seed: number): Rng {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6D2B79F5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}
