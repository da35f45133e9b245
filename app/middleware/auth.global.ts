import type { Role } from '#shared/types/roles'

const PUBLIC = new Set(['/login', '/reset', '/invite'])

declare module '#app' {
  interface PageMeta {
    roles?: Role[]
  }
}

// Pages are guarded here for a clear path; the server is the gate for the data.
export default defineNuxtRouteMiddleware(async (to) => {
  const { me, loaded, refresh } = useMe()
  if (!loaded.value) await refresh()
  if (PUBLIC.has(to.path)) return
  if (!me.value) return navigateTo({ path: '/login', query: to.fullPath !== '/' ? { next: to.fullPath } : {} })
  const roles = to.meta.roles
  if (roles && !roles.some(r => me.value!.roles.includes(r))) {
    throw createError({ statusCode: 403, statusMessage: 'This page needs another role.', fatal: true })
  }
})
