// One judgement of a trend from speed and accuracy together, so a faster median bought with more
// wrong calls is never shown as progress. Speed is weighed by the inverse efficiency score
// (IES = mean or median time / proportion right; Townsend & Ashby 1983, "Stochastic modeling of
// elementary psychological processes"): lower is better. A drop in accuracy is never "better",
// whatever the speed: on a watch a wrong call costs more than a slow one (the speed-accuracy
// trade-off, Heitz 2014, Frontiers in Neuroscience 8:150).
import type { TrendFigures } from '../types/stats'

export type TrendVerdict = 'better' | 'worse' | 'steady'

// Design values: one percentage point of accuracy, 5 % of the inverse efficiency score.
export const ACCURACY_STEP = 0.01
export const IES_STEP = 0.05

export function inverseEfficiency(medianMs: number, accuracy: number): number {
  return accuracy > 0 ? medianMs / accuracy : Number.POSITIVE_INFINITY
}

export function trendVerdict(f: TrendFigures): TrendVerdict | null {
  if (f.medianMs === null || f.previousMedianMs === null || f.accuracy === null || f.previousAccuracy === null) return null
  const accuracyChange = f.accuracy - f.previousAccuracy
  // Rounded to whole points first, as the table shows them.
  const points = Math.round(accuracyChange * 100) / 100
  if (points <= -ACCURACY_STEP) return 'worse'
  const before = inverseEfficiency(f.previousMedianMs, f.previousAccuracy)
  const now = inverseEfficiency(f.medianMs, f.accuracy)
  if (!Number.isFinite(before)) return Number.isFinite(now) ? 'better' : 'steady'
  const change = (now - before) / before
  if (change <= -IES_STEP) return 'better'
  if (change >= IES_STEP) return 'worse'
  return 'steady'
}
