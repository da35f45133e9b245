// Refuses state-changing requests sent from another site (cross-site request forgery): the
// browser names the sender in Origin and Sec-Fetch-Site. Requests with neither (curl, scripts) pass.
const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])

let configuredOrigin: string | null | undefined

// The configured public address is read once (runtime config is rebuilt on each call with an event).
function ownOrigins(event: import('h3').H3Event) {
  if (configuredOrigin === undefined) {
    configuredOrigin = null
    const configured = useRuntimeConfig().publicUrl
    if (configured) {
      try {
        configuredOrigin = new URL(configured).origin
      }
      catch { /* an unusable NUXT_PUBLIC_URL adds nothing */ }
    }
  }
  const origins = [getRequestURL(event).origin]
  if (configuredOrigin) origins.push(configuredOrigin)
  return origins
}

export default defineEventHandler((event) => {
  if (!UNSAFE.has(event.method)) return
  const site = getRequestHeader(event, 'sec-fetch-site')
  const origin = getRequestHeader(event, 'origin')
  if (site === 'cross-site' || (origin !== undefined && !ownOrigins(event).includes(origin))) {
    throw createError({ statusCode: 403, message: 'Cross-site requests are refused.' })
  }
})
