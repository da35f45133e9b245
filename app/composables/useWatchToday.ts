import type { WatchToday } from '#shared/types/drill'

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

/** The home card text for today's watch. */
export function watchCardText(today: WatchToday | null): string {
  if (!today) return 'Your daily drill: timed flash sightings of your crew\'s decks.'
  if (!today.decks.length) return 'No deck is assigned to your crew yet.'
  const open = today.decks.reduce((n, d) => n + d.openLeft, 0)
  if (open) return `${open} sighting${open === 1 ? '' : 's'} left in today's watch.`
  const due = today.decks.reduce((n, d) => n + d.due, 0)
  const fresh = today.decks.reduce((n, d) => n + d.new, 0)
  if (!due && !fresh) return 'Nothing due today.'
  return `Today: ${due} to refresh · ${fresh} to meet.`
}
