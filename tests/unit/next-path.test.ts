// nextPath (shared/utils/next-path.ts): after sign-in only a path of this site. Payloads from the
// OWASP Unvalidated Redirects and Forwards Cheat Sheet and WSTG-CLNT-04; each result is read back
// with Node's WHATWG URL parser (what a browser does with a Location header) and must stay home.
import { describe, expect, it } from 'vitest'
import { nextPath } from '../../shared/utils/next-path'

const ORIGIN = 'https://glint.example.org'
const HOSTILE = [
  '/.//evil.example', '/%5Cevil.example', '//evil.example', '/\\evil.example', '\\\\evil.example', '/\\/evil.example',
  'https://evil.example', 'http:evil.example', '/%2F%2Fevil.example', '/%2fevil.example', '/%5C%5Cevil.example',
  '/..//evil.example', '/./%5Cevil.example', '/%09/evil.example', '/\t/evil.example', '/%0d%0a//evil.example',
  'javascript:alert(1)', '/%', '/%E0%A4%A', '///evil.example', ' //evil.example', '',
]

describe('nextPath', () => {
  it.each(HOSTILE)('sends %j home or to a path that a browser resolves on this origin', (next) => {
    const path = nextPath(next, ORIGIN)
    expect(new URL(path, ORIGIN).origin).toBe(ORIGIN)
    // Read once more as the Location of a second redirect: still home.
    expect(new URL(new URL(path, ORIGIN).pathname, ORIGIN).origin).toBe(ORIGIN)
    expect(path).toMatch(/^\/(?![/\\])/)
  })

  it('keeps a path of this site with its query and fragment (design value)', () => {
    expect(nextPath('/people/me?days=7#calls', ORIGIN)).toBe('/people/me?days=7#calls')
    expect(nextPath('/decks/abc', ORIGIN)).toBe('/decks/abc')
  })

  it('goes home for what is not a string', () => {
    expect(nextPath(['/decks'], ORIGIN)).toBe('/')
    expect(nextPath(undefined, ORIGIN)).toBe('/')
  })
})
