// One wording of what a deck holds today, used by the home page and the watch alike, so the two
// always say the same thing (both read GET /api/watches/today).
import type { DeckWorkload } from '#shared/types/watch'

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`

/**
 * "7 to refresh · 1 to meet", "4 sightings left in today's watch", or what there is with nothing due; with
 * `relative` (useDates().relative) the next due time is said in words.
 */
export function workloadText(d: DeckWorkload, relative?: (ms: number) => string): string {
  if (d.openLeft) return `${plural(d.openLeft, 'sighting')} left in today's watch.`
  if (!d.due && !d.new) {
    const next = relative && d.nextDueAt ? ` · next due ${relative(d.nextDueAt)}` : ''
    return `Nothing due${next}${d.practice ? ` · practice of ${plural(d.practice, 'sighting')} available` : ''}`
  }
  return `${d.due} to refresh · ${d.new} to meet`
}
