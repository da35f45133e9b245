// Refuses state-changing requests sent from another site (cross-site request forgery): the
// browser names the sender in Origin and Sec-Fetch-Site. Requests with neither (curl, scripts) pass.
const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])

function ownOrigins(event: import('h3').H3Event) {
  const origins = [getRequestURL(event).origin]
  const configured = useRuntimeConfig(event).publicUrl
  if (configured) {
    try {
      origins.push(new URL(configured).origin)
    }
    catch { /* an unusable NUXT_PUBLIC_URL adds nothing */ }
  }
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
