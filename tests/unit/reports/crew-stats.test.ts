import { describe, expect, it } from 'vitest'
import { median, quantile } from 'simple-statistics'
import { personStats, statsBy } from '../../../server/core/reports/crew-stats'
import { DAY, NOW, call } from './helpers'

// Median and 90th percentile of right calls are checked against simple-statistics (source: the library).
describe('personStats', () => {
  const calls = [
    call({ latencyMs: 600, calledAt: NOW - 2 * DAY }),
    call({ latencyMs: 900, calledAt: NOW - 3 * DAY }),
    call({ latencyMs: 1200, calledAt: NOW - 10 * DAY }),
    call({ latencyMs: 700, calledAt: NOW - 20 * DAY }),
    call({ latencyMs: 2100, calledAt: NOW - 40 * DAY, grade: 'hesitant' }),
    call({ correct: false, latencyMs: 500, calledAt: NOW - 1 * DAY }),
    call({ correct: false, latencyMs: null, calledAt: NOW - 12 * DAY }),
    call({ latencyMs: 95, grade: 'missed', anticipation: true, calledAt: NOW - 5 * DAY }),
  ]
  const rightAll = [600, 900, 1200, 700, 2100]
  const s = personStats(calls, NOW)

  it('counts calls and right calls; a wrong call or an anticipation is not right', () => {
    expect(s.calls).toBe(8)
    expect(s.right).toBe(5)
    expect(s.accuracy).toBe(5 / 8)
    expect(s.lastCallAt).toBe(NOW - DAY)
  })

  it('median and p90 of right calls agree with simple-statistics', () => {
    expect(s.medianMs).toBe(median(rightAll))
    expect(s.p90Ms).toBe(quantile(rightAll, 0.9))
  })

  it('the 7- and 30-day windows take only their calls', () => {
    // last 7 days: 600, 900 right; one wrong (1 day); the anticipation (5 days) → 2 of 4
    expect(s.trend7).toEqual({ days: 7, calls: 4, accuracy: 2 / 4, medianMs: median([600, 900]) })
    // last 30 days: everything but the 40-day-old call → 4 right of 7
    expect(s.trend30).toEqual({ days: 30, calls: 7, accuracy: 4 / 7, medianMs: median([600, 900, 1200, 700]) })
  })

  it('no calls: nulls, not zeros', () => {
    const empty = personStats([], NOW)
    expect(empty).toMatchObject({ calls: 0, accuracy: null, medianMs: null, p90Ms: null, lastCallAt: null })
    expect(empty.trend7).toEqual({ days: 7, calls: 0, accuracy: null, medianMs: null })
  })
})

describe('statsBy', () => {
  it('groups by aspect, weakest first, with the library\'s median', () => {
    const rows = statsBy([
      call({ aspect: 'beam', latencyMs: 500 }),
      call({ aspect: 'beam', latencyMs: 700 }),
      call({ aspect: 'head-on', latencyMs: 1400 }),
      call({ aspect: 'head-on', correct: false }),
    ], 'aspect')
    expect(rows.map(r => r.key)).toEqual(['head-on', 'beam'])
    expect(rows[0]).toMatchObject({ calls: 2, accuracy: 0.5, medianMs: 1400 })
    expect(rows[1]!.medianMs).toBe(median([500, 700]))
  })
})
