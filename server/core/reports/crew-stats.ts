// Recognition speed and accuracy of one person, as the crew table and the person page show it.
// Pure: the route loads the calls (already filtered by deck, aspect or condition) and passes them in.
import type { CallGrade } from '../../../shared/utils/grade'
import { quantileSorted, sortedCopy } from '../../../shared/utils/statistics'

export const DAY_MS = 86_400_000

export interface CallRecord {
  correct: boolean
  grade: CallGrade
  latencyMs: number | null
  calledAt: number
  aspect: string
  condition: string
  targetTypeId: string
  calledTypeId: string | null
  anticipation: boolean
  // graded on the phone offline, where the pack held the answer (the server decides: see calls.offline)
  offline?: boolean
}

export interface WindowStats {
  days: number
  calls: number
  accuracy: number | null
  medianMs: number | null
}

export interface PersonStats {
  calls: number
  right: number
  // right calls / calls; null with no calls
  accuracy: number | null
  // of right calls' latencies; null with no right call
  medianMs: number | null
  p90Ms: number | null
  trend7: WindowStats
  trend30: WindowStats
  lastCallAt: number | null
}

/**
 * A right call: the right type named in time, so graded hesitant, sure or instant. A call that
 * came before anyone could categorise the image (anticipation) or after the window closed is
 * graded missed and is not right, even when the tapped name happened to match.
 */
export function isRightCall(call: Pick<CallRecord, 'correct' | 'grade' | 'anticipation'>): boolean {
  return call.correct && call.grade !== 'missed' && !call.anticipation
}

/** Latencies of the right calls, sorted ascending: the sample recognition speed is measured on. */
export function rightLatencies(calls: readonly CallRecord[]): Float64Array {
  const out: number[] = []
  for (const c of calls) {
    if (isRightCall(c) && c.latencyMs !== null && Number.isFinite(c.latencyMs)) out.push(c.latencyMs)
  }
  return sortedCopy(out)
}

function quantileOrNull(sorted: Float64Array, p: number): number | null {
  return sorted.length ? quantileSorted(sorted, p) : null
}

function accuracyOf(calls: readonly CallRecord[]): number | null {
  if (!calls.length) return null
  let right = 0
  for (const c of calls) if (isRightCall(c)) right++
  return right / calls.length
}

/** Calls made in the last `days` days up to nowMs: calledAt >= nowMs - days·86 400 000. */
export function callsSince(calls: readonly CallRecord[], nowMs: number, days: number): CallRecord[] {
  const from = nowMs - days * DAY_MS
  return calls.filter(c => c.calledAt >= from)
}

export function windowStats(calls: readonly CallRecord[], nowMs: number, days: number): WindowStats {
  const inWindow = callsSince(calls, nowMs, days)
  return {
    days,
    calls: inWindow.length,
    accuracy: accuracyOf(inWindow),
    medianMs: quantileOrNull(rightLatencies(inWindow), 0.5),
  }
}

export function personStats(calls: readonly CallRecord[], nowMs: number): PersonStats {
  // One pass over what may be a year of calls: the crew table computes this for every trainee.
  const from7 = nowMs - 7 * DAY_MS
  const from30 = nowMs - 30 * DAY_MS
  const all: number[] = []
  const lat7: number[] = []
  const lat30: number[] = []
  let right = 0
  let calls7 = 0
  let right7 = 0
  let calls30 = 0
  let right30 = 0
  let lastCallAt: number | null = null
  for (const c of calls) {
    const ok = isRightCall(c)
    const timed = ok && c.latencyMs !== null && Number.isFinite(c.latencyMs)
    if (ok) right++
    if (timed) all.push(c.latencyMs!)
    if (c.calledAt >= from30) {
      calls30++
      if (ok) right30++
      if (timed) lat30.push(c.latencyMs!)
      if (c.calledAt >= from7) {
        calls7++
        if (ok) right7++
        if (timed) lat7.push(c.latencyMs!)
      }
    }
    if (lastCallAt === null || c.calledAt > lastCallAt) lastCallAt = c.calledAt
  }
  const sorted = sortedCopy(all)
  return {
    calls: calls.length,
    right,
    accuracy: calls.length ? right / calls.length : null,
    medianMs: quantileOrNull(sorted, 0.5),
    p90Ms: quantileOrNull(sorted, 0.9),
    trend7: { days: 7, calls: calls7, accuracy: calls7 ? right7 / calls7 : null, medianMs: quantileOrNull(sortedCopy(lat7), 0.5) },
    trend30: { days: 30, calls: calls30, accuracy: calls30 ? right30 / calls30 : null, medianMs: quantileOrNull(sortedCopy(lat30), 0.5) },
    lastCallAt,
  }
}

export type BreakdownKey = 'aspect' | 'condition' | 'targetTypeId'

export interface BreakdownRow {
  key: string
  calls: number
  accuracy: number | null
  medianMs: number | null
  p90Ms: number | null
}

/** Accuracy and speed per aspect, condition or target type, weakest (lowest accuracy) first. */
export function statsBy(calls: readonly CallRecord[], by: BreakdownKey): BreakdownRow[] {
  const groups = new Map<string, CallRecord[]>()
  for (const c of calls) {
    const k = c[by]
    const g = groups.get(k)
    if (g) g.push(c)
    else groups.set(k, [c])
  }
  const rows = [...groups].map(([key, group]): BreakdownRow => {
    const lat = rightLatencies(group)
    return { key, calls: group.length, accuracy: accuracyOf(group), medianMs: quantileOrNull(lat, 0.5), p90Ms: quantileOrNull(lat, 0.9) }
  })
  return rows.sort((a, b) => (a.accuracy ?? 0) - (b.accuracy ?? 0) || (b.medianMs ?? 0) - (a.medianMs ?? 0) || a.key.localeCompare(b.key))
}
