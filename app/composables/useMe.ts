import type { Me, Role } from '#shared/types/roles'

// The signed-in person (roles and crews come from the server on every load).
export function useMe() {
  const me = useState<Me | null>('me', () => null)
  const loaded = useState<boolean>('me-loaded', () => false)

  async function refresh() {
    const headers = import.meta.server ? useRequestHeaders(['cookie']) : undefined
    try {
      me.value = await $fetch<Me>('/api/auth/me', { headers })
    }
    catch {
      me.value = null
    }
    loaded.value = true
    return me.value
  }

  const has = (...roles: Role[]) => !!me.value && roles.some(r => me.value!.roles.includes(r))

  async function signOut() {
    await $fetch('/api/auth/logout', { method: 'POST' }).catch(() => {})
    me.value = null
    await navigateTo('/login')
  }

  return { me, loaded, refresh, has, signOut }
}

// A readable message from a failed $fetch.
export function errorMessage(e: unknown): string {
  const err = e as { data?: { message?: string }, message?: string, statusCode?: number }
  if (err?.data?.message) return err.data.message
  if (err?.statusCode === undefined && typeof navigator !== 'undefined' && !navigator.onLine) return 'No connection. Try again when you are back online.'
  return err?.message || 'Something went wrong. Try again.'
}
