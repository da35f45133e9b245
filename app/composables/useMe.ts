import type { Me, Role } from '#shared/types/roles'

// The phone's copy of the person, for a page opened with no connection (never after a 401).
const ME_KEY = 'glint-me'

function cachedMe(): Me | null {
  try {
    const text = localStorage.getItem(ME_KEY)
    return text ? JSON.parse(text) as Me : null
  }
  catch {
    return null
  }
}

function keepMe(me: Me | null) {
  if (!import.meta.client) return
  try {
    if (me) localStorage.setItem(ME_KEY, JSON.stringify(me))
    else localStorage.removeItem(ME_KEY)
  }
  catch { /* storage full or blocked: no offline copy */ }
}

// The signed-in person (roles and crews come from the server on every load).
export function useMe() {
  const me = useState<Me | null>('me', () => null)
  const loaded = useState<boolean>('me-loaded', () => false)

  async function refresh() {
    const headers = import.meta.server ? useRequestHeaders(['cookie']) : undefined
    try {
      me.value = await $fetch<Me>('/api/auth/me', { headers })
      keepMe(me.value)
    }
    catch (e) {
      const status = (e as { statusCode?: number }).statusCode
      // No answer at all (no connection): the copy from the last time the server answered.
      if (import.meta.client && status === undefined) me.value = cachedMe()
      else {
        me.value = null
        if (status === 401) keepMe(null)
      }
    }
    loaded.value = true
    return me.value
  }

  const has = (...roles: Role[]) => !!me.value && roles.some(r => me.value!.roles.includes(r))

  async function signOut() {
    await $fetch('/api/auth/logout', { method: 'POST' }).catch(() => {})
    me.value = null
    keepMe(null)
    await forgetPersonalData()
    // A full load of the sign-in page also drops what the stores hold in memory.
    reloadNuxtApp({ path: '/login', force: true })
  }

  return { me, loaded, refresh, has, signOut, keepMe }
}

// A readable message from a failed $fetch.
export function errorMessage(e: unknown): string {
  const err = e as { data?: { message?: string }, message?: string, statusCode?: number }
  if (err?.data?.message) return err.data.message
  if (err?.statusCode === undefined && typeof navigator !== 'undefined' && !navigator.onLine) return 'No connection. Try again when you are back online.'
  return err?.message || 'Something went wrong. Try again.'
}
