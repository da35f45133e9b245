// A time from now as one whole unit, for Intl.RelativeTimeFormat ("in 3 hours", "in 8 days").

const MIN = 60_000
const HOUR = 60 * MIN
const DAY = 24 * HOUR

// Each unit is used while the span is below its limit: days up to two weeks, weeks up to eight
// (design values: a count a person reads at a glance, no source).
const STEPS: { unit: Intl.RelativeTimeFormatUnit, size: number, below: number }[] = [
  { unit: 'second', size: 1000, below: MIN },
  { unit: 'minute', size: MIN, below: HOUR },
  { unit: 'hour', size: HOUR, below: DAY },
  { unit: 'day', size: DAY, below: 14 * DAY },
  { unit: 'week', size: 7 * DAY, below: 56 * DAY },
  { unit: 'month', size: 30 * DAY, below: 365 * DAY },
  { unit: 'year', size: 365 * DAY, below: Infinity },
]

/** The span from nowMs to ms in the unit its size calls for, rounded to a whole count. */
export function relativeParts(ms: number, nowMs: number): { value: number, unit: Intl.RelativeTimeFormatUnit } {
  const span = ms - nowMs
  const step = STEPS.find(s => Math.abs(span) < s.below)!
  return { value: Math.round(span / step.size), unit: step.unit }
}
