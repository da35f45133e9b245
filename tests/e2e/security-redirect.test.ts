// The page after sign-in (issue 14, item 10). OWASP Unvalidated Redirects and Forwards Cheat
// Sheet and WSTG-CLNT-04 (client-side URL redirect): `next` may lead only to this site; the
// payloads below are that guide's bypasses (protocol-relative, backslash, dot segments, escapes).
import { describe, expect, inject, it } from 'vitest'
import { signedIn } from '../support/client'

const HOSTILE = [
  '/.//evil.example', '/%5Cevil.example', '//evil.example', '/\\evil.example', '\\\\evil.example',
  'https://evil.example', 'http:evil.example', '/%2F%2Fevil.example', '/%2fevil.example', '/%5C%5Cevil.example',
  '/..//evil.example', '/./%5Cevil.example', '/%09/evil.example', '/%0d%0a//evil.example', 'javascript:alert(1)',
  '/%', '/%E0%A4%A', '///evil.example/%2F..',
]

describe('sign-in keeps `next` on this site', () => {
  it('answers a signed-in visit of /login?next=<hostile> with a redirect to a path of this origin, never a 500', async () => {
    const base = inject('baseUrl')
    const lead = await signedIn('lead@glint.demo')
    for (const next of HOSTILE) {
      const r = await lead.get(`/login?next=${encodeURIComponent(next)}`)
      // A raw (unencoded) form too, as a hand-made link would carry it.
      const raw = await lead.get(`/login?next=${next.replace(/[\\#]/g, c => encodeURIComponent(c))}`)
      for (const [form, res] of [['encoded', r], ['raw', raw]] as const) {
        expect(res.status, `${form} ${next}`).toBe(302)
        const location = res.headers.get('location')!
        expect(new URL(location, base).origin, `${form} ${next} -> ${location}`).toBe(base)
        expect(location, `${form} ${next}`).toMatch(/^\/(?![/\\])/)
      }
    }
  })

  it('keeps a path of this site, with its query', async () => {
    const lead = await signedIn('lead@glint.demo')
    const r = await lead.get(`/login?next=${encodeURIComponent('/people/me?days=7')}`)
    expect(r.status).toBe(302)
    expect(r.headers.get('location')).toBe('/people/me?days=7')
  })
})
