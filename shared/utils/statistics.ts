// Descriptive statistics for recognition speed. Pure and dependency-free: the server's crew
// tables and the phone's own progress view compute the same numbers from the same code.
// Quantiles use linear interpolation between order statistics at index (n - 1)·p (R type 7,
// numpy's default), the definition simple-statistics uses.

function assertValues(values: ArrayLike<number>, what: string): void {
  if (values.length === 0) throw new RangeError(`${what} requires at least one value`)
}

function assertP(p: number): void {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`a quantile's p must be in [0, 1], got ${p}`)
}

/** A sorted copy (ascending, numeric). The input is left untouched. */
export function sortedCopy(values: ArrayLike<number>): Float64Array {
  return Float64Array.from(values).sort()
}

/**
 * The p-quantile of values already sorted ascending (linear interpolation, R type 7).
 * Throws RangeError for an empty array or p outside [0, 1].
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  assertValues(sorted, 'quantile')
  assertP(p)
  const idx = (sorted.length - 1) * p
  const lower = Math.floor(idx)
  const fraction = idx - lower
  if (fraction === 0) return sorted[lower]!
  const upper = lower + 1
  // Same arithmetic order as the reference library, so results agree to the last bit.
  return sorted[lower]! + fraction * (sorted[upper]! - sorted[lower]!)
}

/** The p-quantile of values in any order (linear interpolation, R type 7). */
export function quantile(values: ArrayLike<number>, p: number): number {
  assertValues(values, 'quantile')
  assertP(p)
  return quantileSorted(sortedCopy(values), p)
}

/** Several quantiles of one array, sorting it once. */
export function quantiles(values: ArrayLike<number>, ps: readonly number[]): number[] {
  assertValues(values, 'quantile')
  const sorted = sortedCopy(values)
  return ps.map(p => quantileSorted(sorted, p))
}

export function median(values: ArrayLike<number>): number {
  return quantile(values, 0.5)
}

/** The 90th percentile. */
export function p90(values: ArrayLike<number>): number {
  return quantile(values, 0.9)
}

/** Arithmetic mean, with compensated (Neumaier) summation so long series do not drift. */
export function mean(values: ArrayLike<number>): number {
  assertValues(values, 'mean')
  let sum = values[0]!
  let correction = 0
  for (let i = 1; i < values.length; i++) {
    const x = values[i]!
    const t = sum + x
    correction += Math.abs(sum) >= Math.abs(x) ? sum - t + x : x - t + sum
    sum = t
  }
  return (sum + correction) / values.length
}

/**
 * Trailing rolling median: element i is the median of values[max(0, i - window + 1) .. i], so
 * the first window - 1 points use the shorter history they have. Same length as the input.
 */
export function rollingMedian(values: ArrayLike<number>, window: number): number[] {
  if (!Number.isInteger(window) || window < 1) {
    throw new RangeError(`a rolling window must be a whole number >= 1, got ${window}`)
  }
  const out: number[] = []
  // A sorted copy of the current window, updated by one insertion and one removal per step.
  const win: number[] = []
  for (let i = 0; i < values.length; i++) {
    insertSorted(win, values[i]!)
    if (i >= window) removeSorted(win, values[i - window]!)
    out.push(quantileSorted(win, 0.5))
  }
  return out
}

function lowerBound(arr: readonly number[], x: number): number {
  let lo = 0
  let hi = arr.length
  while (lo < hi) {
    const mid = (lo + hi) >> 1
    if (arr[mid]! < x) lo = mid + 1
    else hi = mid
  }
  return lo
}

function insertSorted(arr: number[], x: number): void {
  arr.splice(lowerBound(arr, x), 0, x)
}

function removeSorted(arr: number[], x: number): void {
  const i = lowerBound(arr, x)
  if (arr[i] === x) arr.splice(i, 1)
}
