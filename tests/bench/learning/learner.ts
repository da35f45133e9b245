// A simulated learner for the learning benchmark: ACT-R declarative memory (Anderson &
// Lebiere, The Atomic Components of Thought, 1998) with the spacing-dependent decay of
// Pavlik & Anderson (Cognitive Science 29, 2005). It imports nothing from Glint: the
// benchmark drives it through see() and respond() only.

export interface LearnerParams {
  // decay intercept a and scale c of d_j = c·e^(m_(j−1)) + a (Pavlik & Anderson 2005)
  a: number
  c: number
  // retrieval threshold τ and noise s of P = 1/(1 + e^(−(A−τ)/s))
  tau: number
  s: number
  // psychological time between sessions: a gap counts h times its length (Pavlik & Anderson 2005)
  h: number
  // retrieval latency F·e^(−A), in seconds
  latencyFactorS: number
  // perception and key press added to every response, in seconds
  motorS: number
  // a gap longer than this ends a session, in seconds
  sessionGapS: number
  // chance that a failed retrieval names the item's look-alike when it is among the choices
  confusion: number
}

/**
 * The values of the papers; every one is recorded with its source in the design card.
 * τ, s, h and F were recalled without the papers at hand ("from memory").
 */
export const PAPER_PARAMS: Readonly<LearnerParams> = Object.freeze({
  // Pavlik & Anderson 2005: a = 0.177, c = 0.217
  a: 0.177,
  c: 0.217,
  // Pavlik & Anderson 2005, from memory: τ = −0.704, s = 0.255, h = 0.025
  tau: -0.704,
  s: 0.255,
  h: 0.025,
  // ACT-R's default latency factor F = 1 s (Anderson & Lebiere 1998, from memory)
  latencyFactorS: 1,
  // Thorpe, Fize & Marlot 1996 (150 ms to categorise) + Hick-Hyman 150 ms·log2(4 + 1) ≈ 0.5 s
  motorS: 0.5,
  // design value: a break of ten minutes separates sessions
  sessionGapS: 600,
  // design value: half of the failed retrievals go to the look-alike when it is offered
  confusion: 0.5,
})

export type Rng = () => number

export interface Response {
  choice: number
  latencyMs: number
  // retrieval succeeded (the choice is the item itself)
  retrieved: boolean
}

interface Trace {
  // psychological time of the presentation, in seconds
  at: number
  decay: number
}

/** One simulated person: one list of traces per item, a psychological clock. */
export class Learner {
  readonly params: LearnerParams
  private readonly traces: Trace[][]
  private readonly rng: Rng
  // additive activation of the person and of each item (Pavlik & Anderson 2005's β terms)
  private readonly personBeta: number
  private readonly itemBeta: readonly number[]
  private readonly lookalike: readonly number[]
  private lastRealS: number | null = null
  private psychS = 0

  constructor(options: { params: LearnerParams, items: number, lookalike: readonly number[], rng: Rng, personBeta?: number, itemBeta?: readonly number[] }) {
    this.params = options.params
    this.traces = Array.from({ length: options.items }, () => [])
    this.rng = options.rng
    this.lookalike = options.lookalike
    this.personBeta = options.personBeta ?? 0
    this.itemBeta = options.itemBeta ?? Array.from({ length: options.items }, () => 0)
  }

  /** Moves the psychological clock to real time tS (seconds, never backwards); returns it. */
  private clock(tS: number): number {
    if (this.lastRealS === null) this.lastRealS = tS
    const gap = tS - this.lastRealS
    if (gap < 0) throw new RangeError('time runs forward only')
    this.psychS += gap > this.params.sessionGapS ? this.params.h * gap : gap
    this.lastRealS = tS
    return this.psychS
  }

  private activationAt(item: number, psych: number): number {
    const list = this.traces[item]!
    if (!list.length) return -Infinity
    let sum = 0
    // a trace laid down this instant counts as one second old (the model's time unit)
    for (const t of list) sum += Math.max(1, psych - t.at) ** -t.decay
    return this.personBeta + this.itemBeta[item]! + Math.log(sum)
  }

  /** Activation A = β + ln Σ t_j^(−d_j) of an item at real time tS. */
  activation(item: number, tS: number): number {
    return this.activationAt(item, this.clock(tS))
  }

  /** Recall probability 1/(1 + e^(−(A−τ)/s)) at real time tS. */
  recallProbability(item: number, tS: number): number {
    return recallOf(this.activation(item, tS), this.params)
  }

  /** A presentation (introduction or reveal): a new trace whose decay depends on the activation now. */
  see(item: number, tS: number): void {
    const psych = this.clock(tS)
    const m = this.activationAt(item, psych)
    this.traces[item]!.push({ at: psych, decay: decayFor(m, this.params) })
  }

  /**
   * A call: retrieval succeeds when the activation plus logistic noise (scale s) exceeds τ,
   * which happens with the recall probability; its latency is F·e^(−(A+ε)) + the motor time.
   * A failure takes F·e^(−τ) + the motor time and names the look-alike (when offered) or a
   * random choice. The reveal that follows is a separate see().
   */
  respond(item: number, choices: readonly number[], tS: number): Response {
    const p = this.params
    const a = this.activation(item, tS)
    const u = Math.min(1 - 1e-12, Math.max(1e-12, this.rng()))
    const noisy = a + p.s * Math.log(u / (1 - u))
    if (noisy > p.tau) {
      return { choice: item, latencyMs: 1000 * (p.latencyFactorS * Math.exp(-noisy) + p.motorS), retrieved: true }
    }
    const latencyMs = 1000 * (p.latencyFactorS * Math.exp(-p.tau) + p.motorS)
    const twin = this.lookalike[item]
    let choice: number
    if (twin !== undefined && twin >= 0 && choices.includes(twin) && this.rng() < p.confusion) choice = twin
    else choice = choices[Math.floor(this.rng() * choices.length)]!
    return { choice, latencyMs, retrieved: false }
  }
}

/** The decay of a new trace given the activation at its presentation (−∞ for the first: d = a). */
export function decayFor(activation: number, params: Pick<LearnerParams, 'a' | 'c'>): number {
  return params.c * Math.exp(activation) + params.a
}

export function recallOf(activation: number, params: Pick<LearnerParams, 'tau' | 's'>): number {
  return 1 / (1 + Math.exp(-(activation - params.tau) / params.s))
}

export function latencyOfS(activation: number, params: Pick<LearnerParams, 'latencyFactorS' | 'motorS'>): number {
  return params.latencyFactorS * Math.exp(-activation) + params.motorS
}
