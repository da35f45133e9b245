import type { CallRecord } from '../../../server/core/reports/crew-stats'

export const DAY = 86_400_000
export const NOW = Date.UTC(2025, 5, 16, 12, 0, 0)

/** One call; a right call is graded sure, a wrong one missed (the grade rules of product.md). */
export function call(over: Partial<CallRecord> = {}): CallRecord {
  const correct = over.correct ?? true
  return {
    correct,
    grade: correct ? 'sure' : 'missed',
    latencyMs: 800,
    calledAt: NOW - DAY,
    aspect: 'beam',
    condition: 'sunlit',
    targetTypeId: 't1',
    calledTypeId: correct ? (over.targetTypeId ?? 't1') : 'tX',
    anticipation: false,
    ...over,
  }
}
