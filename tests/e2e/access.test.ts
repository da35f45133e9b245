// The authorisation matrix: every route under server/api x each role x own crew / other crew.
import { beforeAll, describe, expect, it } from 'vitest'
import { Client, signedIn } from '../support/client'
import { routeFiles, routeKey } from '../support/hostile-corpus'
import { MATRIX } from './access-matrix'
import type { Expect } from './access-matrix'

const ROLES = ['trainee', 'instructor', 'lead', 'admin'] as const
const PEOPLE = { trainee: 'trainee@glint.demo', instructor: 'instructor@glint.demo', lead: 'lead@glint.demo', admin: 'admin@glint.demo' }

function concrete(key: string, params: Record<string, string>) {
  const [method, path] = key.split(' ') as [string, string]
  // Crew-scoped params are resolved first; any other param gets a well-formed id that exists nowhere.
  return { method, path: path.replace(/:(\w+)/g, (_, k: string) => params[k] ?? 'AAAAAAAAAAAAAAAAAAAAAA') }
}

function check(status: number, expected: Expect, label: string) {
  if (expected === 'pass') expect(status, label).not.toBeOneOf([401, 403])
  else expect(status, label).toBe(expected)
  expect(status, `${label}: never a 5xx`).toBeLessThan(500)
}

describe('authorisation matrix', () => {
  // server/routes/images/s/[file].get.ts -> GET /images/s/:file
  const fileKeys = routeFiles('server/routes').map(f => routeKey(f).replace(' /routes/', ' /').replace('[file]', ':file'))
  const keys = [...routeFiles('server/api').map(routeKey), ...fileKeys]
  let ownCrew = ''
  let otherCrew = ''

  beforeAll(async () => {
    const lead = await signedIn('lead@glint.demo')
    const lead2 = await signedIn('lead2@glint.demo')
    ownCrew = (await lead.get('/api/auth/me')).body.crews[0].id
    otherCrew = (await lead2.get('/api/auth/me')).body.crews[0].id
  })

  it('has an entry for every route file, and no entry without a route', () => {
    expect(keys.length).toBeGreaterThan(10)
    expect(keys.filter(k => !MATRIX[k]), 'routes missing from tests/e2e/access-matrix.ts').toEqual([])
    expect(Object.keys(MATRIX).filter(k => !keys.includes(k)), 'matrix entries without a route').toEqual([])
  })

  for (const key of Object.keys(MATRIX)) {
    it(key, async () => {
      const entry = MATRIX[key]!
      const crewScoped = key.includes(':crew')
      // A well-formed name that exists nowhere: a sighting id, or a SHA-256 in hex.
      const file = key.includes('/images/s/') ? 'AAAAAAAAAAAAAAAAAAAAAA.webp' : `${'0'.repeat(64)}.webp`
      const anon = concrete(key, { crew: ownCrew, file })
      check((await new Client().req(anon.method, anon.path, anon.method === 'GET' ? undefined : {})).status, entry.anon, `${key} anonymous`)
      for (const role of ROLES) {
        // The demo trainee and instructor are in the lead's crew (Skerrow Point); lead2 leads the other.
        const own = concrete(key, { crew: ownCrew, file })
        const c = await signedIn(PEOPLE[role])
        check((await c.req(own.method, own.path, own.method === 'GET' ? undefined : {})).status, entry[role], `${key} as ${role}`)
        if (crewScoped) {
          const other = concrete(key, { crew: otherCrew })
          const expected = entry.otherCrew?.[role] ?? (entry[role] === 'pass' ? 403 : entry[role])
          const c2 = await signedIn(PEOPLE[role])
          check((await c2.req(other.method, other.path, other.method === 'GET' ? undefined : {})).status, expected, `${key} as ${role}, other crew`)
        }
      }
    })
  }
})
