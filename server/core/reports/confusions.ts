// Confusions: what trainees call a target type when it is something else. The matrix feeds the
// crew's heat map; the worst pairs tell an instructor which look-alikes to teach, per aspect or condition.

export interface ConfusionCall {
  targetTypeId: string
  // null: no name given before the window closed
  calledTypeId: string | null
  aspect?: string
  condition?: string
}

export interface ConfusionMatrix {
  // row and column order: the given order first, then any other type in sorted order
  types: string[]
  // counts[truth][called], every cell present (0 when never called), diagonal = right names
  counts: Record<string, Record<string, number>>
  // per truth: sightings with no name given
  noCall: Record<string, number>
  // per truth: all calls, named or not
  totals: Record<string, number>
}

function byCodePoint(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0
}

export function confusionMatrix(calls: readonly ConfusionCall[], opts: { types?: readonly string[] } = {}): ConfusionMatrix {
  const seen = new Set<string>()
  for (const c of calls) {
    seen.add(c.targetTypeId)
    if (c.calledTypeId !== null) seen.add(c.calledTypeId)
  }
  const given = [...new Set(opts.types ?? [])]
  const extra = [...seen].filter(t => !given.includes(t)).sort(byCodePoint)
  const types = [...given, ...extra]

  const counts: Record<string, Record<string, number>> = {}
  const noCall: Record<string, number> = {}
  const totals: Record<string, number> = {}
  for (const truth of types) {
    counts[truth] = Object.fromEntries(types.map(t => [t, 0]))
    noCall[truth] = 0
    totals[truth] = 0
  }
  for (const c of calls) {
    totals[c.targetTypeId]!++
    if (c.calledTypeId === null) noCall[c.targetTypeId]!++
    else counts[c.targetTypeId]![c.calledTypeId]!++
  }
  return { types, counts, noCall, totals }
}

export type ConfusionGroup = 'aspect' | 'condition'

export interface ConfusionPair {
  truthId: string
  calledId: string
  count: number
  // count / all calls of this truth (in the same aspect or condition when grouped)
  share: number
  aspect?: string
  condition?: string
}

/**
 * Wrong names, most frequent first (then by share, then by ids for a stable order). With `by`,
 * pairs are counted separately per aspect or condition and carry it.
 */
export function worstPairs(
  calls: readonly ConfusionCall[],
  opts: { by?: ConfusionGroup | null, limit?: number } = {},
): ConfusionPair[] {
  const by = opts.by ?? null
  const totals = new Map<string, number>()
  const pairs = new Map<string, ConfusionPair>()
  for (const c of calls) {
    const group = by ? (c[by] ?? '') : ''
    const truthKey = `${group}\u0000${c.targetTypeId}`
    totals.set(truthKey, (totals.get(truthKey) ?? 0) + 1)
    if (c.calledTypeId === null || c.calledTypeId === c.targetTypeId) continue
    const key = `${truthKey}\u0000${c.calledTypeId}`
    const pair = pairs.get(key)
    if (pair) {
      pair.count++
    }
    else {
      const p: ConfusionPair = { truthId: c.targetTypeId, calledId: c.calledTypeId, count: 1, share: 0 }
      if (by) p[by] = group
      pairs.set(key, p)
    }
  }
  const list = [...pairs.values()]
  for (const p of list) {
    const group = by ? (p[by] ?? '') : ''
    p.share = p.count / totals.get(`${group}\u0000${p.truthId}`)!
  }
  list.sort((a, b) =>
    b.count - a.count
    || b.share - a.share
    || byCodePoint(a.truthId, b.truthId)
    || byCodePoint(a.calledId, b.calledId)
    || byCodePoint((by && a[by]) || '', (by && b[by]) || ''),
  )
  const limit = opts.limit ?? list.length
  return list.slice(0, Math.max(0, limit))
}
