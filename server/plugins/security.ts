import { createHash } from 'node:crypto'
import type { H3Event } from 'h3'

// Security headers of every response, set once: the 'request' hook runs before any handler
// (static files included); rendered HTML gets its script and style hashes in 'render:response'.
const PERMISSIONS = 'camera=(), microphone=(), geolocation=(), payment=(), usb=(), screen-wake-lock=(self)'

function contentSecurityPolicy(scriptHashes: string[] = [], styleHashes: string[] = []) {
  return [
    `default-src 'self'`,
    `script-src 'self'${scriptHashes.map(h => ` '${h}'`).join('')}`,
    `style-src 'self'${styleHashes.map(h => ` '${h}'`).join('')}`,
    // Vue renders :style bindings as attributes on the server; attributes cannot carry a script.
    `style-src-attr 'unsafe-inline'`,
    `img-src 'self' data: blob:`,
    `font-src 'self'`,
    `connect-src 'self'`,
    `worker-src 'self'`,
    `manifest-src 'self'`,
    `object-src 'none'`,
    `base-uri 'self'`,
    `form-action 'self'`,
    `frame-ancestors 'none'`,
  ].join('; ')
}

const sha256 = (text: string) => `sha256-${createHash('sha256').update(text, 'utf8').digest('base64')}`

// The hashes of the inline <script> and <style> elements of a page, exactly as sent.
// Data blocks (type="application/json", the Nuxt payload) are never run and need none.
function inlineHashes(html: string) {
  const scripts = new Set<string>()
  const styles = new Set<string>()
  for (const m of html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script\s*>/gi)) {
    const attrs = m[1] ?? ''
    if (/\ssrc\s*=/i.test(attrs) || /\stype\s*=\s*["']?application\/(ld\+)?json/i.test(attrs) || !m[2]) continue
    scripts.add(sha256(m[2]))
  }
  for (const m of html.matchAll(/<style\b[^>]*>([\s\S]*?)<\/style\s*>/gi)) {
    if (m[1]) styles.add(sha256(m[1]))
  }
  return { scripts: [...scripts], styles: [...styles] }
}

function isHttps(event: H3Event) {
  return getRequestProtocol(event, { xForwardedProto: true }) === 'https'
}

export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('request', (event) => {
    const headers: Record<string, string> = {
      'X-Content-Type-Options': 'nosniff',
      'Referrer-Policy': 'strict-origin-when-cross-origin',
      'Permissions-Policy': PERMISSIONS,
      'Cross-Origin-Opener-Policy': 'same-origin',
      'Cross-Origin-Resource-Policy': 'same-origin',
      'X-Frame-Options': 'DENY',
    }
    // The dev server's hot reload injects styles and scripts; the policy applies to the built app.
    if (!import.meta.dev) headers['Content-Security-Policy'] = contentSecurityPolicy()
    if (isHttps(event)) headers['Strict-Transport-Security'] = 'max-age=31536000; includeSubDomains'
    // API answers are a person's data: no browser or shared cache keeps them (RFC 9111 §5.2.2.5).
    if (event.path.startsWith('/api/')) headers['Cache-Control'] = 'no-store'
    setResponseHeaders(event, headers)
  })

  nitroApp.hooks.hook('render:response', (response) => {
    // Rendered pages (HTML and their payloads) carry the signed-in person: no-store as above,
    // and no X-Powered-By naming the framework (OWASP Secure Headers Project).
    const kept = Object.entries(response.headers ?? {}).filter(([name]) => name.toLowerCase() !== 'x-powered-by')
    response.headers = { ...Object.fromEntries(kept), 'cache-control': 'no-store' }
    if (import.meta.dev || typeof response.body !== 'string') return
    const type = String(response.headers['content-type'] ?? '')
    if (!type.includes('text/html')) return
    const { scripts, styles } = inlineHashes(response.body)
    response.headers = { ...response.headers, 'content-security-policy': contentSecurityPolicy(scripts, styles) }
  })
})
