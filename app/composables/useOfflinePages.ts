import type { Me } from '#shared/types/roles'

// The service worker's page cache (runtimeCaching in nuxt.config.ts).
const PAGES_CACHE = 'glint-pages'

/**
 * After a first visit every page of the person's main menu opens with no connection: once the
 * service worker is active, the pages not yet in its page cache are fetched into it, one at a
 * time when the phone is idle (so they never hold up a watch's images).
 */
export function useOfflinePages() {
  let done = false
  async function keep(me: Me | null) {
    if (done || !me || !navigator.onLine || !('serviceWorker' in navigator) || !('caches' in window)) return
    done = true
    await navigator.serviceWorker.ready
    const has = (...roles: string[]) => roles.some(r => me.roles.includes(r as never))
    const paths = navFor(me.roles, has).map(i => i.to)
    const cache = await caches.open(PAGES_CACHE)
    for (const path of paths) {
      if (await cache.match(path, { ignoreVary: true })) continue
      await new Promise<void>(resolve => ('requestIdleCallback' in window ? requestIdleCallback(() => resolve(), { timeout: 3000 }) : setTimeout(resolve, 200)))
      try {
        const res = await fetch(path, { credentials: 'same-origin', headers: { accept: 'text/html' } })
        if (res.ok && !res.redirected) await cache.put(path, res)
      }
      catch { /* no connection after all: tried again on the next visit */ }
    }
  }
  return { keep }
}
