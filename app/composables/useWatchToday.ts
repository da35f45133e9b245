import type { WatchToday } from '#shared/types/watch'
import { workloadText } from '~/utils/workload'

// Client-side only: when the counts were last asked for (they change after every watch).
let askedAt = 0
const STALE_MS = 10_000

// Today's counts for the trainee's decks (due, new, an open watch), fetched on the client.
export function useWatchToday() {
  const today = useState<WatchToday | null>('watch-today', () => null)
  function refresh() {
    askedAt = Date.now()
    return $fetch<WatchToday>('/api/watches/today').then((t) => {
      today.value = t
    }).catch(() => {})
  }
  // Deferred, so that reading the counts (also from a computed) never writes state synchronously.
  if (import.meta.client && Date.now() - askedAt > STALE_MS) {
    askedAt = Date.now()
    queueMicrotask(refresh)
  }
  return { today, refresh }
}

/** The home card text for today's watch: the watch page's own words (workloadText), deck by deck. */
export function watchCardText(today: WatchToday | null, relative?: (ms: number) => string): string {
  if (!today) return 'Your daily drill: timed flash sightings of your crew\'s decks.'
  if (!today.decks.length) return 'No deck is assigned to your crew yet.'
  if (today.decks.length === 1) return workloadText(today.decks[0]!, relative)
  return today.decks.map(d => `${d.title}: ${workloadText(d, relative)}`).join('. ')
}
