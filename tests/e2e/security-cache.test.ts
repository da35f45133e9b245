// Personal answers are not kept by caches (issue 14, item 15). RFC 9111 §5.2.2.5: no-store tells
// every cache, the browser's included, not to store the response. OWASP Secure Headers Project and
// WSTG-INFO-02: no X-Powered-By naming the framework.
import { describe, expect, it } from 'vitest'
import { Client, signedIn } from '../support/client'

const PAGES = ['/', '/people/me', '/settings', '/watch']
const API = ['/api/auth/me', '/api/decks', '/api/watches/today', '/api/checks']

describe('caching of personal data', () => {
  it('signed-in pages and API answers carry Cache-Control: no-store and no X-Powered-By', async () => {
    const trainee = await signedIn('trainee@glint.demo')
    for (const path of [...PAGES, ...API]) {
      const r = await trainee.get(path)
      expect(r.status, path).toBe(200)
      const directives = (r.headers.get('cache-control') ?? '').split(',').map(d => d.trim().toLowerCase())
      expect(directives, path).toContain('no-store')
      expect(r.headers.get('x-powered-by'), path).toBeNull()
    }
  })

  it('a refused API request and a signed-out page carry no X-Powered-By either', async () => {
    const anon = new Client()
    for (const path of ['/api/auth/me', '/login', '/no-such-page']) {
      const r = await anon.get(path)
      expect(r.headers.get('x-powered-by'), path).toBeNull()
    }
  })
})
