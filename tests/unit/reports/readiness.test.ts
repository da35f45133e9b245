import { describe, expect, it } from 'vitest'
import { readiness } from '../../../server/core/reports/readiness'
import type { CallRecord } from '../../../server/core/reports/crew-stats'
import { DAY, NOW, call } from './helpers'

// Source of every boundary: the crew standard of issue 5 ("Leads' views") with its defaults:
// at least 90 % right, the median of right calls within the deck's hesitation limit, every
// target type and aspect called at least twice in the last 14 days.
const STANDARD = { minAccuracy: 0.9, minCallsPerTrack: 2, windowDays: 14 }
const HESITATION = 1500
const KEYS = [
  { targetTypeId: 't1', aspect: 'beam' },
  { targetTypeId: 't1', aspect: 'head-on' },
  { targetTypeId: 't2', aspect: 'beam' },
  { targetTypeId: 't2', aspect: 'head-on' },
]

/** `total` calls spread evenly over the four pairs, the first `wrong` of them wrong. */
function spread(total: number, wrong: number, latencyMs = 800): CallRecord[] {
  return Array.from({ length: total }, (_, i) => call({
    ...KEYS[i % KEYS.length]!,
    correct: i >= wrong,
    latencyMs,
    calledAt: NOW - (i % 10) * DAY,
  }))
}

function run(calls: CallRecord[]) {
  return readiness({ calls, trackKeys: KEYS, standard: STANDARD, hesitationMs: HESITATION, nowMs: NOW })
}

describe('readiness at its boundaries (issue 5 standard)', () => {
  it('exactly 90 % right is ready', () => {
    // 18 right of 20 = 0.9
    const r = run(spread(20, 2))
    expect(r.accuracy).toBe(18 / 20)
    expect(r.ready).toBe(true)
    expect(r.missing).toEqual([])
  })

  it('89.9 % right is not ready, and says so', () => {
    // 899 right of 1000 = 0.899
    const r = run(spread(1000, 101))
    expect(r.ready).toBe(false)
    expect(r.missing).toEqual(['accuracy 89.9% is below 90%'])
  })

  it('86 % reads as in the standard\'s wording', () => {
    const r = run(spread(50, 7))
    expect(r.missing).toEqual(['accuracy 86% is below 90%'])
  })

  it('a median exactly at the hesitation limit is ready', () => {
    const r = run(spread(20, 0, HESITATION))
    expect(r.medianMs).toBe(HESITATION)
    expect(r.ready).toBe(true)
  })

  it('a median over the limit is not ready', () => {
    const r = run(spread(20, 0, 1620))
    expect(r.ready).toBe(false)
    expect(r.missing).toEqual(['median 1.62 s is over the 1.50 s hesitation limit'])
    // One millisecond over still reads as over, not as the limit itself.
    expect(run(spread(20, 0, 1501)).missing).toEqual(['median 1.51 s is over the 1.50 s hesitation limit'])
  })

  it('a pair called once is missing; called twice it is covered', () => {
    const twice = [...KEYS, ...KEYS].map(k => call({ ...k }))
    expect(run(twice).ready).toBe(true)
    expect(run(twice).uncovered).toEqual([])

    const once = twice.slice(0, -1) // t2/head-on now has one call
    const r = run(once)
    expect(r.ready).toBe(false)
    expect(r.uncovered).toEqual([{ targetTypeId: 't2', aspect: 'head-on', count: 1 }])
    expect(r.missing).toEqual(['1 target type/aspect pair called fewer than 2 times in 14 days'])
  })

  it('a call just outside the 14-day window does not count; one exactly at its edge does', () => {
    const base = [...KEYS, ...KEYS].map(k => call({ ...k })).slice(0, -1)
    const edge = NOW - 14 * DAY
    const inside = run([...base, call({ ...KEYS[3]!, calledAt: edge })])
    expect(inside.ready).toBe(true)
    const outside = run([...base, call({ ...KEYS[3]!, calledAt: edge - 1 })])
    expect(outside.ready).toBe(false)
    expect(outside.calls).toBe(base.length)
    expect(outside.uncovered).toEqual([{ targetTypeId: 't2', aspect: 'head-on', count: 1 }])
  })

  it('accuracy and median are taken over the window too', () => {
    // Ten wrong calls three weeks ago do not pull a good fortnight below the mark.
    const old = Array.from({ length: 10 }, () => call({ correct: false, calledAt: NOW - 21 * DAY }))
    const r = run([...spread(20, 0), ...old])
    expect(r.accuracy).toBe(1)
    expect(r.ready).toBe(true)
  })

  it('lists every unmet part, and nothing called at all', () => {
    const r = run([])
    expect(r.ready).toBe(false)
    expect(r.missing).toEqual(['no calls in the last 14 days', '4 target type/aspect pairs called fewer than 2 times in 14 days'])
    expect(r.uncovered).toHaveLength(4)
  })

  it('a right name given before the image could be seen is not a right call', () => {
    // product.md: grades are computed; an anticipation is graded missed.
    const calls = spread(20, 0).map((c, i) => (i < 3 ? { ...c, grade: 'missed' as const, anticipation: true, latencyMs: 90 } : c))
    const r = run(calls)
    expect(r.accuracy).toBe(17 / 20)
    expect(r.ready).toBe(false)
  })
})

// product.md, "Offline": calls graded offline train and schedule as any other, and count toward
// readiness only where the crew's standard says so (default: they do not). Issue 14, item 2.
describe('calls graded offline', () => {
  const offline = (calls: CallRecord[]) => calls.map(c => ({ ...c, offline: true }))

  it('do not count by default: a standard met by offline calls alone is not met', () => {
    const r = run(offline(spread(20, 0)))
    expect(r.ready).toBe(false)
    expect(r.calls).toBe(0)
    expect(r.missing).toEqual(['no calls in the last 14 days', '4 target type/aspect pairs called fewer than 2 times in 14 days'])
  })

  it('count when the crew\'s standard says so', () => {
    const r = readiness({ calls: offline(spread(20, 0)), trackKeys: KEYS, standard: { ...STANDARD, offlineCounts: true }, hesitationMs: HESITATION, nowMs: NOW })
    expect(r.ready).toBe(true)
    expect(r.calls).toBe(20)
  })

  it('by default leave the online calls to decide: 8 online right calls ready, 12 offline wrong ones ignored', () => {
    const online = spread(8, 0)
    const wrongOffline = offline(spread(12, 12))
    expect(run([...online, ...wrongOffline]).ready).toBe(true)
    // Counted, the 12 wrong calls take accuracy to 8 / 20 = 40 %.
    const counted = readiness({ calls: [...online, ...wrongOffline], trackKeys: KEYS, standard: { ...STANDARD, offlineCounts: true }, hesitationMs: HESITATION, nowMs: NOW })
    expect(counted.accuracy).toBe(8 / 20)
    expect(counted.ready).toBe(false)
  })
})
