// The hostile corpus sent to every route under server/api, as each role that may call it: every
// answer is a 4xx (never a 5xx, never a success), and no table changes (row counts and contents).
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { Client, signedIn } from '../support/client'
import {
  BODY_CASES, GUARD_CASES, PARAM_VALUES, QUERY_KEYS, QUERY_VALUES, UNSAFE_METHODS,
  discoverRoutes, rawExchange, snapshot,
} from '../support/hostile-corpus'
import type { Route } from '../support/hostile-corpus'
import { bodyRuleFor } from '../../server/utils/body'
import { MATRIX } from './access-matrix'

type Who = 'anon' | 'trainee' | 'instructor' | 'lead' | 'admin'
const PEOPLE: Record<Exclude<Who, 'anon'>, string> = {
  trainee: 'trainee@glint.demo', instructor: 'instructor@glint.demo', lead: 'lead@glint.demo', admin: 'admin@glint.demo',
}
const NO_SUCH_ID = 'AAAAAAAAAAAAAAAAAAAAAA'

const routes = discoverRoutes()
const clients = {} as Record<Who, Client>
let ownCrew = ''
let before: Record<string, string> = {}
const startedAt = Date.now()

// The roles the matrix lets through the gate: only they reach the route's validation.
function callers(route: Route): Who[] {
  const entry = MATRIX[route.key]
  if (!entry) return ['admin']
  const who = (['anon', 'trainee', 'instructor', 'lead', 'admin'] as const).filter(w => entry[w] !== 401 && entry[w] !== 403)
  return who.length ? who : ['admin']
}

function concrete(route: Route, override: Record<string, string> = {}) {
  return route.path.replace(/:(\w+)/g, (_, k: string) => override[k] ?? (k === 'crew' ? ownCrew : NO_SUCH_ID))
}

// mayPass: the route ignores this input (a query it never reads), so its usual answer stands.
interface Outcome { label: string, status: number, mayPass?: boolean }

function refusedOnly(outcomes: Outcome[]) {
  return outcomes.filter(o => o.status >= 500 || (o.status < 400 && !o.mayPass)).map(o => `${o.status} ${o.label}`)
}

beforeAll(async () => {
  clients.anon = new Client()
  for (const [who, email] of Object.entries(PEOPLE)) clients[who as Who] = await signedIn(email)
  ownCrew = (await clients.lead.get('/api/auth/me')).body.crews[0].id
  before = snapshot(inject('dbPath'))
})

afterAll(() => {
  console.log(`hostile corpus: ${routes.length} routes in ${((Date.now() - startedAt) / 1000).toFixed(1)} s`)
})

describe('hostile corpus', () => {
  it('finds every route file', () => {
    expect(routes.length).toBeGreaterThan(10)
    expect(routes.filter(r => UNSAFE_METHODS.includes(r.method)).length).toBeGreaterThan(5)
  })

  for (const route of routes) {
    it(`${route.key} refuses every hostile input with a 4xx`, async () => {
      const outcomes: Outcome[] = []
      const unsafe = UNSAFE_METHODS.includes(route.method)
      for (const who of callers(route)) {
        const c = clients[who]
        const send = async (label: string, path: string, body?: string, type?: string, mayPass = false) => {
          const headers: Record<string, string> = {}
          if (body !== undefined) headers['content-type'] = type ?? 'application/json'
          const r = await c.req(route.method, path, body, headers)
          outcomes.push({ label: `${label} as ${who}`, status: r.status, mayPass })
        }
        if (unsafe) {
          // The middleware's cases reach every state-changing route, whether it reads a body or not.
          for (const k of GUARD_CASES) await send(k.name, concrete(route), k.body, k.type)
          if (route.readsBody) for (const k of BODY_CASES) await send(k.name, concrete(route), k.body, k.type)
        }
        for (const param of route.params) {
          for (const v of PARAM_VALUES) await send(`:${param} = ${v.slice(0, 30)}`, concrete(route, { [param]: v }), unsafe ? '{}' : undefined)
        }
        if (route.method === 'GET') {
          for (const v of QUERY_VALUES) {
            const q = QUERY_KEYS.map(k => `${k}=${encodeURIComponent(v)}`).join('&')
            await send(`query = ${v.slice(0, 30)}`, `${concrete(route)}?${q}`, undefined, undefined, !route.readsQuery)
          }
        }
      }
      if (unsafe) {
        // Bodies whose Content-Length lies, on a raw socket, with a signed-in caller's cookie.
        const who = callers(route).find(w => w !== 'anon') ?? 'anon'
        const cookie = clients[who].cookies.size ? `Cookie: ${clients[who].cookieHeader()}\n` : ''
        const base = inject('baseUrl')
        const rule = bodyRuleFor(route.method, concrete(route))
        const type = (multipart = false) => (multipart ? 'multipart/form-data; boundary=x' : 'application/json')
        const head = (extra: string, multipart = false) => `${route.method} ${concrete(route)} HTTP/1.1\nHost: ${new URL(base).host}\n${cookie}Content-Type: ${type(multipart)}\nConnection: close\n${extra}`
        const big = Buffer.from(JSON.stringify({ email: 'z'.repeat(200 * 1024) }))
        for (const s of await rawExchange(base, head('Content-Length: 20\n'), big)) outcomes.push({ label: `Content-Length 20, 200 KB sent as ${who}`, status: s })
        const huge = await rawExchange(base, head('Content-Length: 10000000000\n', rule.type === 'multipart'), '{"email": "a@b.c"}', { waitMs: 2000 })
        expect(huge, `${route.key}: a declared 10 GB body is refused before it arrives`).toEqual([413])
        const chunk = (b: Buffer) => Buffer.concat([Buffer.from(`${b.length.toString(16)}\r\n`), b, Buffer.from('\r\n')])
        const chunked = Buffer.concat([chunk(big.subarray(0, 100_000)), chunk(big.subarray(100_000)), Buffer.from('0\r\n\r\n')])
        const streamed = await rawExchange(base, head('Transfer-Encoding: chunked\n'), chunked)
        // Routes with a larger cap (uploads, scan passes) read the body and refuse it for what it is.
        if (rule.limit < big.length) {
          expect(streamed, `${route.key}: a chunked body with no length is counted from the stream`).toEqual([413])
        }
        else for (const s of streamed) outcomes.push({ label: `200 KB chunked as ${who}`, status: s })
      }
      expect(outcomes.length).toBeGreaterThan(0)
      expect(refusedOnly(outcomes), `${route.key}: answers that were not a 4xx`).toEqual([])
    })
  }

  it('changed nothing in any table', () => {
    expect(snapshot(inject('dbPath'))).toEqual(before)
  })

  it('left the demo accounts signed in and unthrottled', async () => {
    for (const who of ['trainee', 'instructor', 'lead', 'admin'] as const) {
      expect((await clients[who].get('/api/auth/me')).status, who).toBe(200)
    }
    expect((await new Client().post('/api/auth/login', { email: 'lead@glint.demo', password: 'harbour-lantern-42' })).status).toBe(200)
  })
})
