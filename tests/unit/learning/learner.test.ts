// The learning benchmark's simulated learner against the equations and findings of its papers:
// Anderson & Lebiere, The Atomic Components of Thought, 1998 (ACT-R declarative memory) and
// Pavlik & Anderson, Cognitive Science 29, 2005 (spacing-dependent decay). Expected numbers are
// the papers' equations worked by hand with the papers' a and c.
import { describe, expect, it } from 'vitest'
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64'
import { mersenne } from 'pure-rand/generator/mersenne'
import { decayFor, latencyOfS, Learner, PAPER_PARAMS, recallOf } from '../../bench/learning/learner'
import type { LearnerParams } from '../../bench/learning/learner'

function learner(params: LearnerParams = PAPER_PARAMS, rng = () => 0.5) {
  return new Learner({ params, items: 2, lookalike: [1, 0], rng })
}

describe('activation (Pavlik & Anderson 2005, A = ln Σ t_j^(−d_j))', () => {
  it('one presentation decays with d = a (first trace: m = −∞, so c·e^m vanishes)', () => {
    expect(decayFor(-Infinity, PAPER_PARAMS)).toBe(0.177)
    const l = learner()
    l.see(0, 0)
    // ln(100^−0.177) = −0.177 · ln 100 = −0.81512
    expect(l.activation(0, 100)).toBeCloseTo(-0.81512, 4)
    // never presented: no trace, no activation
    expect(learner().activation(1, 5)).toBe(-Infinity)
  })

  it('a second presentation 10 s after the first decays with d = c·e^m + a = 0.3213', () => {
    // m = −0.177 · ln 10 = −0.40756; 0.217 · e^−0.40756 + 0.177 = 0.32135
    expect(decayFor(-0.177 * Math.log(10), PAPER_PARAMS)).toBeCloseTo(0.32135, 4)
    const l = learner()
    l.see(0, 0)
    l.see(0, 10)
    // 100 s after the first: ln(100^−0.177 + 90^−0.32135) = ln(0.44259 + 0.23541) = −0.38860
    expect(l.activation(0, 100)).toBeCloseTo(Math.log(100 ** -0.177 + 90 ** -0.32135), 3)
  })

  it('presentations at higher activation decay faster: the spacing effect\'s mechanism', () => {
    // after 1000 s: m = −1.22268, d = 0.217 · e^m + 0.177 = 0.24089 < 0.32135 after 10 s
    expect(decayFor(-0.177 * Math.log(1000), PAPER_PARAMS)).toBeCloseTo(0.24089, 4)
    expect(decayFor(-0.177 * Math.log(1000), PAPER_PARAMS)).toBeLessThan(decayFor(-0.177 * Math.log(10), PAPER_PARAMS))
  })

  it('spacing helps at a long retention interval and massing at a very short one (Pavlik & Anderson 2005, abstract)', () => {
    const massed = learner()
    const spaced = learner()
    massed.see(0, 0)
    massed.see(0, 5)
    spaced.see(0, 0)
    spaced.see(0, 300)
    // 2 s after the second presentation the massed item is stronger
    expect(massed.activation(0, 7)).toBeGreaterThan(spaced.activation(0, 302))
    // a week later (psychological time h · 7 days) the spaced item is stronger
    expect(spaced.activation(0, 300 + 7 * 86_400)).toBeGreaterThan(massed.activation(0, 5 + 7 * 86_400))
  })

  it('time between sessions counts h = 0.025 times its length (Pavlik & Anderson 2005)', () => {
    const l = learner()
    l.see(0, 0)
    // one day later: ln((0.025 · 86 400)^−0.177) = −0.177 · ln 2160 = −1.35983
    expect(l.activation(0, 86_400)).toBeCloseTo(-0.177 * Math.log(2160), 4)
  })
})

describe('recall and latency (Anderson & Lebiere 1998)', () => {
  it('recall probability is one half at the threshold, P = 1/(1 + e^(−(A−τ)/s))', () => {
    expect(recallOf(PAPER_PARAMS.tau, PAPER_PARAMS)).toBe(0.5)
    // A = τ + s·ln 3 gives 1/(1 + 1/3) = 0.75
    expect(recallOf(PAPER_PARAMS.tau + PAPER_PARAMS.s * Math.log(3), PAPER_PARAMS)).toBeCloseTo(0.75, 12)
  })

  it('latency is F·e^(−A) plus the motor time: 1.5 s at A = 0 with F = 1 s and 0.5 s motor', () => {
    expect(latencyOfS(0, PAPER_PARAMS)).toBeCloseTo(1.5, 12)
    expect(latencyOfS(Math.log(2), PAPER_PARAMS)).toBeCloseTo(1.0, 12)
  })

  it('retrieval with logistic noise of scale s succeeds as often as the recall probability says', () => {
    // a seeded generator from the registry (pure-rand's Mersenne Twister): 20 000 calls at A = τ + s·ln 3 → 0.75
    const generator = mersenne(12345)
    const rng = () => uniformFloat64(generator)
    // one trace of decay a seen at 0 has A = −0.177 · ln t; pick t so that A = τ + s·ln 3
    const target = PAPER_PARAMS.tau + PAPER_PARAMS.s * Math.log(3)
    const t = Math.exp(-target / 0.177)
    let retrieved = 0
    const n = 20_000
    for (let i = 0; i < n; i++) {
      const l = learner(PAPER_PARAMS, rng)
      l.see(0, 0)
      if (l.respond(0, [0, 1], t).retrieved) retrieved++
    }
    // binomial 95 % band: 1.96 · √(0.75 · 0.25 / 20 000) ≈ 0.006
    expect(Math.abs(retrieved / n - 0.75)).toBeLessThan(0.01)
  })

  it('a failed retrieval takes F·e^(−τ) + motor and names the look-alike as often as the confusion rate', () => {
    let k = 0
    // rng: first draw fails the retrieval (noise at its lowest), then alternates the confusion draw
    const draws = [1e-9, 0.2, 1e-9, 0.8, 0.1]
    const l = learner(PAPER_PARAMS, () => draws[k++ % draws.length]!)
    const first = l.respond(0, [0, 1], 10)
    expect(first.retrieved).toBe(false)
    expect(first.choice).toBe(1)
    expect(first.latencyMs).toBeCloseTo(1000 * (Math.exp(0.704) + 0.5), 6)
    // 0.8 ≥ confusion 0.5: a random choice instead (0.1 · 2 → the first offered)
    const second = l.respond(0, [0, 1], 11)
    expect(second.choice).toBe(0)
  })
})
