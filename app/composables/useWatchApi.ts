import type { CallResult, IssuedWatch, WatchPack } from '#shared/types/watch'
import type { CallInput } from '#shared/schemas/watch'

// The watch routes (api.md): issue today's watch (or a practice), send a call, fetch the pack.
export function useWatchApi() {
  return {
    issue: (deckId?: string, practice?: boolean) => $fetch<IssuedWatch>('/api/watches', {
      method: 'POST', body: { ...(deckId ? { deckId } : {}), ...(practice ? { practice: true } : {}) },
    }),
    call: (sightingId: string, body: CallInput) => $fetch<CallResult>(`/api/sightings/${sightingId}/call`, { method: 'POST', body }),
    pack: (watchId: string) => $fetch<WatchPack>(`/api/watches/${watchId}/pack`),
  }
}
