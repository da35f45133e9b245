// Headers, cross-site refusal, body caps and session cookies of the built server.
import { createHash } from 'node:crypto'
import { describe, expect, it, inject } from 'vitest'
import { Client, crewIdOf, freshPerson, signedIn } from '../support/client'
import { UNSAFE_METHODS, discoverRoutes, snapshot } from '../support/hostile-corpus'

const base = () => inject('baseUrl')
const JSON_TYPE = { 'content-type': 'application/json' }

function directives(csp: string) {
  return Object.fromEntries(csp.split(';').map(d => d.trim()).filter(Boolean).map((d) => {
    const [name, ...values] = d.split(/\s+/)
    return [name!, values]
  }))
}

// The inline scripts a browser would run, hashed as CSP Level 3 §"hash-source" says:
// base64 of the SHA-256 of the element's text (Node's crypto as the outside implementation).
function inlineScriptHashes(html: string) {
  return [...html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/gi)]
    .filter(m => !/\ssrc=/.test(m[1]!) && !/application\/json/.test(m[1]!) && m[2])
    .map(m => `'sha256-${createHash('sha256').update(m[2]!).digest('base64')}'`)
}

describe('security headers', () => {
  it('sends a Content-Security-Policy without unsafe-eval, with hashes of every inline script of the page', async () => {
    const admin = await signedIn('admin@glint.demo')
    for (const [who, path] of [[new Client(), '/login'], [admin, '/admin'], [admin, '/']] as const) {
      const r = await who.get(path)
      expect(r.status, path).toBe(200)
      const csp = r.headers.get('content-security-policy')!
      expect(csp, path).not.toMatch(/unsafe-eval/)
      const d = directives(csp)
      expect(d['default-src']).toEqual(['\'self\''])
      expect(d['script-src']![0]).toBe('\'self\'')
      expect(d['script-src']).not.toContain('\'unsafe-inline\'')
      expect(d['style-src']).not.toContain('\'unsafe-inline\'')
      expect(d['frame-ancestors']).toEqual(['\'none\''])
      expect(d['object-src']).toEqual(['\'none\''])
      expect(d['base-uri']).toEqual(['\'self\''])
      expect(d['form-action']).toEqual(['\'self\''])
      expect(d['connect-src']).toEqual(['\'self\''])
      expect(d['img-src']).toEqual(['\'self\'', 'data:', 'blob:'])
      const hashes = inlineScriptHashes(r.text)
      expect(hashes.length, `${path}: Nuxt inlines its config script`).toBeGreaterThan(0)
      for (const h of hashes) expect(d['script-src'], path).toContain(h)
    }
  })

  it('sets the other headers on pages, API answers, API errors and static files', async () => {
    const c = new Client()
    for (const path of ['/login', '/api/health', '/api/auth/me', '/glint-mark.svg']) {
      const r = await c.get(path)
      expect(r.headers.get('x-content-type-options'), path).toBe('nosniff')
      expect(r.headers.get('referrer-policy'), path).toMatch(/^(strict-origin-when-cross-origin|no-referrer)$/)
      expect(r.headers.get('cross-origin-opener-policy'), path).toBe('same-origin')
      expect(r.headers.get('content-security-policy'), path).toMatch(/frame-ancestors 'none'/)
      const pp = r.headers.get('permissions-policy')!
      for (const feature of ['camera=()', 'microphone=()', 'geolocation=()', 'payment=()', 'usb=()', 'screen-wake-lock=(self)']) {
        expect(pp, `${path} ${feature}`).toContain(feature)
      }
      expect(r.headers.get('strict-transport-security'), `${path}: no HSTS over plain http`).toBeNull()
    }
  })

  it('adds Strict-Transport-Security only for a request that came over HTTPS', async () => {
    const r = await new Client().req('GET', '/login', undefined, { 'x-forwarded-proto': 'https' })
    expect(r.headers.get('strict-transport-security')).toMatch(/max-age=\d{7,}/)
  })
})

describe('cross-site requests', () => {
  it('refuses every state-changing route with 403 when Origin is another site or Sec-Fetch-Site is cross-site', async () => {
    const admin = await signedIn('admin@glint.demo')
    const before = snapshot(inject('dbPath'))
    const routes = discoverRoutes().filter(r => UNSAFE_METHODS.includes(r.method))
    expect(routes.length).toBeGreaterThan(5)
    const crew = await crewIdOf('lead@glint.demo')
    for (const route of routes) {
      const path = route.path.replace(/:(\w+)/g, (_, k: string) => (k === 'crew' ? crew : 'AAAAAAAAAAAAAAAAAAAAAA'))
      const forged: Record<string, string>[] = [{ origin: 'https://evil.example' }, { 'origin': base(), 'sec-fetch-site': 'cross-site' }, { origin: 'null' }]
      for (const headers of forged) {
        const r = await admin.req(route.method, path, { name: 'Forged Crew' }, headers)
        expect(r.status, `${route.key} ${JSON.stringify(headers)}`).toBe(403)
        expect(r.body.message).toBe('Cross-site requests are refused.')
      }
    }
    expect(snapshot(inject('dbPath')), 'nothing changed').toEqual(before)
  })

  it('lets same-origin requests and requests with neither header (curl, scripts) through', async () => {
    const admin = await signedIn('admin@glint.demo')
    const name = `Crew ${Date.now().toString(36)}`
    const same = await admin.req('POST', '/api/crews', { name }, { 'sec-fetch-site': 'same-origin' })
    expect(same.status).toBe(201)
    // No Origin and no Sec-Fetch-Site: a server-to-server call.
    const r = await fetch(`${base()}/api/crews`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'cookie': admin.cookieHeader() },
      body: JSON.stringify({ name: `${name} b` }),
    })
    expect(r.status).toBe(201)
  })

  it('changes nothing on GET: every GET route called as each role leaves every table as it was', async () => {
    const people = ['trainee@glint.demo', 'instructor@glint.demo', 'lead@glint.demo', 'admin@glint.demo']
    const clients = [new Client(), ...await Promise.all(people.map(p => signedIn(p)))]
    const crew = await crewIdOf('lead@glint.demo')
    const before = snapshot(inject('dbPath'))
    for (const route of discoverRoutes().filter(r => r.method === 'GET')) {
      const path = route.path.replace(/:(\w+)/g, (_, k: string) => (k === 'crew' ? crew : 'AAAAAAAAAAAAAAAAAAAAAA'))
      for (const c of clients) expect((await c.get(path)).status, route.key).toBeLessThan(500)
    }
    expect(snapshot(inject('dbPath'))).toEqual(before)
  })
})

describe('request bodies', () => {
  it('answers 413 past 64 KB, whether the size is declared or streamed', async () => {
    const big = JSON.stringify({ email: 'a'.repeat(70 * 1024), password: 'x' })
    const declared = await new Client().req('POST', '/api/auth/login', big, JSON_TYPE)
    expect(declared.status).toBe(413)
    expect(declared.body.message).toBe('The request is too large (limit 64 KB).')
    // A stream has no Content-Length: the server counts the bytes as they come.
    const bytes = new TextEncoder().encode(big)
    const stream = new ReadableStream({
      start(c) {
        for (let i = 0; i < bytes.length; i += 8192) c.enqueue(bytes.subarray(i, i + 8192))
        c.close()
      },
    })
    const r = await fetch(`${base()}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: stream, duplex: 'half' } as RequestInit)
    expect(r.status).toBe(413)
    // Just under the cap is read and validated as usual.
    const under = await new Client().req('POST', '/api/auth/login', JSON.stringify({ email: 'a'.repeat(60 * 1024), password: 'x' }), JSON_TYPE)
    expect(under.status).toBe(400)
  })

  it('refuses other content types with 415 and NUL characters and deep nesting with 400', async () => {
    const c = new Client()
    expect((await c.req('POST', '/api/auth/login', 'email=a&password=b', { 'content-type': 'application/x-www-form-urlencoded' })).status).toBe(415)
    expect((await c.req('POST', '/api/auth/login', '{"email":"a@b.c","password":"x"}', { 'content-type': 'text/plain' })).status).toBe(415)
    const nul = await c.req('POST', '/api/auth/login', '{"email":"lead@glint.demo\\u0000","password":"x"}', JSON_TYPE)
    expect(nul.status).toBe(400)
    expect(nul.body.message).toMatch(/NUL/)
    const deep = await c.req('POST', '/api/auth/login', `${'['.repeat(40)}${']'.repeat(40)}`, JSON_TYPE)
    expect(deep.status).toBe(400)
    expect(deep.body.message).toMatch(/nested/)
    // A backslash before "u0000" is text, not a NUL: the body passes on to the route (here its gate).
    expect((await c.req('POST', '/api/auth/logout', '{"note":"a\\\\u0000"}', JSON_TYPE)).status).toBe(401)
  })
})

describe('files outside server/api', () => {
  it('refuses path traversal in the image route', async () => {
    const c = await signedIn('trainee@glint.demo')
    for (const name of ['..%2F..%2F..%2Fetc%2Fpasswd', '..%2Fglint.sqlite', '%2e%2e%2f%2e%2e%2fpackage.json', `${'a'.repeat(64)}.webp%00.txt`]) {
      const r = await c.get(`/images/${name}`)
      expect(r.status, name).toBeGreaterThanOrEqual(400)
      expect(r.status, name).toBeLessThan(500)
      expect(r.text, name).not.toMatch(/root:|SQLite format|"dependencies"/)
    }
  })
})

describe('session cookies', () => {
  it('is HttpOnly, SameSite=Lax, Secure, and lasts 12 hours', async () => {
    const r = await new Client().post('/api/auth/login', { email: 'trainee6@glint.demo', password: 'harbour-lantern-42' })
    const cookie = r.headers.getSetCookie().find(c => /session/i.test(c))!
    expect(cookie).toMatch(/;\s*HttpOnly/i)
    expect(cookie).toMatch(/;\s*SameSite=Lax/i)
    expect(cookie).toMatch(/;\s*Secure/i)
    // 12 hours from now (runtimeConfig.session.maxAge = 43200 s), give or take a minute.
    const expires = Date.parse(cookie.match(/Expires=([^;]+)/i)![1]!)
    expect(Math.abs(expires - (Date.now() + 12 * 3600_000))).toBeLessThan(60_000)
  })

  it('refuses a cookie whose sealed content was altered', async () => {
    const p = await freshPerson('trainee', null)
    const [name, value] = [...p.client.cookies][0]!
    const forged = new Client()
    const i = Math.floor(value.length / 2)
    forged.cookies.set(name, value.slice(0, i) + (value[i] === 'A' ? 'B' : 'A') + value.slice(i + 1))
    expect((await forged.get('/api/auth/me')).status).toBe(401)
  })

  it('a disabled account: every copy of its cookie fails, and enabling it again does not revive them', async () => {
    const admin = await signedIn('admin@glint.demo')
    const p = await freshPerson('trainee', null)
    const copy = new Client()
    copy.cookies = new Map(p.client.cookies)
    expect((await admin.patch(`/api/admin/users/${p.id}`, { disabled: true })).status).toBe(200)
    expect((await copy.get('/api/auth/me')).status).toBe(401)
    expect((await admin.patch(`/api/admin/users/${p.id}`, { disabled: false })).status).toBe(200)
    const again = new Client()
    again.cookies = new Map(copy.cookies.size ? copy.cookies : p.client.cookies)
    expect((await again.get('/api/auth/me')).status).toBe(401)
  })

  it('a crew change applies on the next request: a lead removed from a crew loses it at once', async () => {
    const admin = await signedIn('admin@glint.demo')
    const crew = await crewIdOf('lead@glint.demo')
    const p = await freshPerson('lead', crew)
    expect((await p.client.get(`/api/crews/${crew}`)).status).toBe(200)
    expect((await admin.del(`/api/crews/${crew}/members/${p.id}`)).status).toBe(200)
    expect((await p.client.get(`/api/crews/${crew}`)).status).toBe(403)
    expect((await admin.post(`/api/crews/${crew}/members`, { userId: p.id })).status).toBe(200)
    expect((await p.client.get(`/api/crews/${crew}`)).status).toBe(200)
  })
})
