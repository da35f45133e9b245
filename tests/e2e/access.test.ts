// The authorisation matrix: every route under server/api x each role x a real object of the caller's
// crew (Skerrow Point) and the matching real object of the other crew (Vellan Ness). A 404 from an
// id that exists nowhere proves nothing, so every id used here is made in beforeAll.
import { readFileSync } from 'node:fs'
import { randomBytes } from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import { Client, signedIn } from '../support/client'
import { TRAINEE_PASSWORD, directPerson, ensureWatchDeck, readDb, writeDb } from '../support/watch-fixture'
import { routeFiles, routeKey } from '../support/hostile-corpus'
import { MATRIX } from './access-matrix'
import type { Expect, Role } from './access-matrix'

const ROLES = ['trainee', 'instructor', 'lead', 'admin'] as const
type SideName = 'own' | 'other'

interface Person { id: string, email: string, client: Client }
interface Side {
  crew: string
  minAccuracy: number
  trainee: Person
  instructor: Person
  deck: string // published, with renderings
  draftDeck: string
  draftType: string
  check0: string // never taken: read and changed
  checkToTake: string
  attempts: { get: string, finish: string, reset: string, signOff: string }
  watch: string
  sightings: string[]
  job: string
  drill: string
}

const sides = {} as Record<SideName, Side>
const clients = {} as Record<Role, Client>
const emails = {} as Record<Role, string>
let count = 0
const unique = (what: string) => `${what} ${Date.now().toString(36)}-${++count}`

const CHECK = { sightingCount: 5, exposureMs: 500, conditions: ['sunlit', 'haze'], aspects: ['beam', 'head-on'], passMark: 0.6 }

async function ok<T = any>(p: Promise<{ status: number, text: string, body: T }>, what: string): Promise<T> {
  const r = await p
  if (r.status >= 300) throw new Error(`${what}: ${r.status} ${r.text}`)
  return r.body
}

async function buildSide(crewName: string, tag: string, tint: number): Promise<Side> {
  const crew = readDb(db => db.prepare('SELECT id, min_accuracy AS minAccuracy FROM crews WHERE name = ?').get(crewName) as { id: string, minAccuracy: number })
  const trainee = await directPerson(['trainee'], crew.id, false)
  const instructor = await directPerson(['instructor'], crew.id, false)
  // Encoding the renderings takes seconds: sign in after it, so no idle connection goes stale.
  const deck = (await ensureWatchDeck({ title: `Access matrix deck ${tag}`, crewId: crew.id, ownerId: instructor.id, tint })).deckId
  await trainee.client.login(trainee.email, TRAINEE_PASSWORD)
  await instructor.client.login(instructor.email, TRAINEE_PASSWORD)
  const ins = instructor.client
  const draftDeck = (await ok(ins.post('/api/decks', { title: `Access matrix draft ${tag}`, category: 'aircraft' }), 'draft deck')).id as string
  await ok(ins.req('PUT', `/api/decks/${draftDeck}/crews`, { crewIds: [crew.id] }), 'draft crews')
  const draftType = (await ok(ins.post(`/api/decks/${draftDeck}/target-types`, { name: unique('Matrix type'), affiliation: 'neutral', sizeM: 12 }), 'type')).id as string
  const newCheck = async () => (await ok(ins.post('/api/checks', { ...CHECK, deckId: deck, title: unique(`Matrix check ${tag}`) }), 'check')).id as string
  const [check0, checkToTake, cGet, cFinish, cReset, cSign] = [await newCheck(), await newCheck(), await newCheck(), await newCheck(), await newCheck(), await newCheck()]
  const t = trainee.client
  const start = async (checkId: string) => (await ok(t.post(`/api/checks/${checkId}/attempts`), 'attempt')).attemptId as string
  const finished = async (checkId: string) => {
    const id = await start(checkId)
    await ok(t.post(`/api/checks/attempts/${id}/finish`), 'finish')
    return id
  }
  const attempts = { get: await finished(cGet), reset: await finished(cReset), signOff: await finished(cSign), finish: await start(cFinish) }
  const watch = await ok(t.post('/api/watches', { deckId: deck }), 'watch')
  const job = randomBytes(16).toString('base64url')
  writeDb(db => db.prepare(`INSERT INTO jobs (id, user_id, deck_id, kind, state, progress) VALUES (?, ?, ?, 'render', 'done', 1)`).run(job, instructor.id, draftDeck))
  const settings = readDb(db => JSON.parse((db.prepare('SELECT settings FROM scan_drills ORDER BY created_at LIMIT 1').get() as { settings: string }).settings))
  const drill = (await ok(ins.post('/api/scan/drills', { title: `Access matrix drill ${tag}`, settings }), 'drill')).id as string
  await ok(ins.req('PUT', `/api/scan/drills/${drill}/crews`, { crewIds: [crew.id] }), 'drill crews')
  return {
    crew: crew.id, minAccuracy: crew.minAccuracy, trainee, instructor, deck, draftDeck, draftType, check0, checkToTake, attempts,
    watch: watch.id, sightings: watch.sightings.map((s: { id: string }) => s.id), job, drill,
  }
}

// A waiting invitation into the side's crew, sent by its instructor.
const invitation = async (s: Side) => (await ok(s.instructor.client.post('/api/invites', {
  email: `${unique('matrix-wait').replace(/\W/g, '-')}@glint.test`, role: 'trainee', crewId: s.crew,
}), 'invitation')).id as string

interface Call { params?: Record<string, string>, body?: unknown, query?: string }
type Build = (s: Side) => Call | Promise<Call>

const multipart = (s: Side) => {
  const form = new FormData()
  form.set('targetTypeId', s.draftType)
  form.set('aspect', 'beam')
  form.append('files', new Blob([readFileSync('tests/fixtures/images/valid.png')], { type: 'image/png' }), 'valid.png')
  return form
}

// How to call each route that names an object, with the objects of one side. A route missing here
// whose path has a parameter gets the side's crew, published deck, draft type, and so on.
const REQUESTS: Record<string, Build> = {
  'GET /api/decks/:deck/builder': s => ({ params: { deck: s.draftDeck } }),
  'PATCH /api/decks/:deck': s => ({ params: { deck: s.draftDeck }, body: { description: 'Changed by the access matrix.' } }),
  'DELETE /api/decks/:deck': async s => ({ params: { deck: (await ok(s.instructor.client.post('/api/decks', { title: unique('Matrix doomed deck'), category: 'aircraft' }), 'deck')).id } }),
  'PUT /api/decks/:deck/crews': s => ({ params: { deck: s.draftDeck }, body: { crewIds: [s.crew] } }),
  'POST /api/decks/:deck/target-types': s => ({ params: { deck: s.draftDeck }, body: { name: unique('Matrix type'), affiliation: 'hostile', sizeM: 20 } }),
  'POST /api/decks/:deck/views': s => ({ params: { deck: s.draftDeck }, body: multipart(s) }),
  'PATCH /api/target-types/:target-type': s => ({ params: { 'target-type': s.draftType }, body: { sizeM: 13 } }),
  'DELETE /api/target-types/:target-type': async s => ({
    params: { 'target-type': (await ok(s.instructor.client.post(`/api/decks/${s.draftDeck}/target-types`, { name: unique('Matrix doomed type'), affiliation: 'neutral', sizeM: 9 }), 'type')).id },
  }),
  'DELETE /api/views/:view': (s) => {
    const view = randomBytes(16).toString('base64url')
    writeDb(db => db.prepare(`INSERT INTO views (id, target_type_id, aspect, source_sha, width, height) VALUES (?, ?, 'beam', ?, 320, 214)`).run(view, s.draftType, randomBytes(32).toString('hex')))
    return { params: { view } }
  },
  'GET /api/decks/:deck/trash': s => ({ params: { deck: s.draftDeck } }),
  'POST /api/decks/:deck/type-links': async s => ({
    params: { deck: (await ok(s.instructor.client.post('/api/decks', { title: unique('Matrix link target'), category: 'aircraft' }), 'deck')).id },
    body: { targetTypeId: s.draftType },
  }),
  'POST /api/target-types/:target-type/unlink': async (s) => {
    // The side's draft type, used in a new deck of the same instructor: that deck's row is shared.
    const deck = (await ok(s.instructor.client.post('/api/decks', { title: unique('Matrix unlink'), category: 'aircraft' }), 'deck')).id as string
    return { params: { 'target-type': (await ok(s.instructor.client.post(`/api/decks/${deck}/type-links`, { targetTypeId: s.draftType }), 'link')).id } }
  },
  'POST /api/views/:view/restore': (s) => {
    // A view in the draft deck's trash, as DELETE /api/views/:view leaves it.
    const view = randomBytes(16).toString('base64url')
    const snapshot = { view: { id: view, targetTypeId: s.draftType, aspect: 'beam', sourceSha: randomBytes(32).toString('hex'), width: 320, height: 214 }, variants: [] }
    writeDb(db => db.prepare(`INSERT INTO removed_views (id, deck_id, target_type_id, aspect, snapshot, removed_at) VALUES (?, ?, ?, 'beam', ?, ?)`)
      .run(view, s.draftDeck, s.draftType, JSON.stringify(snapshot), Date.now()))
    return { params: { view } }
  },
  'POST /api/watches': s => ({ body: { deckId: s.deck } }),
  'POST /api/sightings/:sighting/call': s => ({ params: { sighting: s.sightings[0]! }, body: { choiceId: null, latencyMs: null, framesShown: 6, frameIntervalMs: 16.7 } }),
  'POST /api/sightings/:sighting/void': s => ({ params: { sighting: s.sightings[1]! } }),
  'POST /api/invites': s => ({ body: { email: `${unique('matrix').replace(/\W/g, '-')}@glint.test`, role: 'trainee', crewId: s.crew } }),
  'PATCH /api/admin/users/:user': s => ({ params: { user: s.trainee.id }, body: { roles: ['trainee'] } }),
  'PUT /api/admin/users/:user/crews': s => ({ params: { user: s.trainee.id }, body: { crewIds: [s.crew] } }),
  'POST /api/invites/:invite/resend': async s => ({ params: { invite: await invitation(s) } }),
  'DELETE /api/invites/:invite': async s => ({ params: { invite: await invitation(s) } }),
  'PATCH /api/crews/:crew': s => ({ params: { crew: s.crew }, body: { minAccuracy: s.minAccuracy } }),
  'POST /api/crews/:crew/members': s => ({ params: { crew: s.crew }, body: { userId: s.trainee.id } }),
  'DELETE /api/crews/:crew/members/:user': async s => ({ params: { crew: s.crew, user: (await directPerson(['trainee'], s.crew)).id } }),
  'GET /api/people/:user': s => ({ params: { user: s.trainee.id } }),
  'PATCH /api/scan/drills/:drill': s => ({ params: { drill: s.drill }, body: { title: unique('Matrix drill') } }),
  'PUT /api/scan/drills/:drill/crews': s => ({ params: { drill: s.drill }, body: { crewIds: [s.crew] } }),
  'GET /api/scan/passes': s => ({ query: `userId=${s.trainee.id}` }),
  'POST /api/checks': s => ({ body: { ...CHECK, deckId: s.deck, title: unique('Matrix check') } }),
  'PATCH /api/checks/:check': s => ({ params: { check: s.check0 }, body: { title: unique('Matrix check') } }),
  'DELETE /api/checks/:check': async s => ({
    params: { check: (await ok(s.instructor.client.post('/api/checks', { ...CHECK, deckId: s.deck, title: unique('Matrix doomed check') }), 'check')).id },
  }),
  'POST /api/checks/:check/retire': async s => ({
    params: { check: (await ok(s.instructor.client.post('/api/checks', { ...CHECK, deckId: s.deck, title: unique('Matrix retired check') }), 'check')).id },
  }),
  'POST /api/checks/:check/attempts': s => ({ params: { check: s.checkToTake } }),
  'GET /api/checks/attempts/:attempt': s => ({ params: { attempt: s.attempts.get } }),
  'POST /api/checks/attempts/:attempt/finish': s => ({ params: { attempt: s.attempts.finish } }),
  'POST /api/checks/attempts/:attempt/reset': s => ({ params: { attempt: s.attempts.reset } }),
  'POST /api/checks/attempts/:attempt/sign-off': s => ({ params: { attempt: s.attempts.signOff } }),
  'POST /api/checks/attempts/:attempt/withdraw-sign-off': async (s) => {
    const check = (await ok(s.instructor.client.post('/api/checks', { ...CHECK, deckId: s.deck, title: unique('Matrix signed check') }), 'check')).id as string
    const attempt = (await ok(s.trainee.client.post(`/api/checks/${check}/attempts`), 'attempt')).attemptId as string
    await ok(s.trainee.client.post(`/api/checks/attempts/${attempt}/finish`), 'finish')
    writeDb(db => db.prepare('UPDATE check_attempts SET signed_off_by = ?, signed_off_at = ? WHERE id = ?').run(s.instructor.id, Date.now(), attempt))
    return { params: { attempt }, body: { reason: 'Signed off by mistake (access matrix).' } }
  },
}

const defaults = (s: Side): Record<string, string> => ({
  'crew': s.crew, 'deck': s.deck, 'target-type': s.draftType, 'job': s.job, 'watch': s.watch, 'user': s.trainee.id,
  'drill': s.drill, 'check': s.check0, 'path': 'no-such-route',
})

const namesObject = (key: string) => (key.includes('/:') && !key.endsWith('/:path')) || key in REQUESTS

async function send(c: Client, key: string, side: Side) {
  const [method, pattern] = key.split(' ') as [string, string]
  const call = await (REQUESTS[key]?.(side) ?? {})
  const params = { ...defaults(side), ...call.params }
  const path = pattern.replace(/:([\w-]+)/g, (_, k: string) => {
    if (!params[k]) throw new Error(`${key}: no object for :${k}`)
    return params[k]
  }) + (call.query ? `?${call.query}` : '')
  const body = call.body ?? (method === 'GET' || method === 'DELETE' ? undefined : {})
  return c.req(method, path, body)
}

function check(res: { status: number, text: string }, expected: Expect, label: string) {
  const detail = `${label}: ${res.status} ${res.text.slice(0, 160)}`
  if (expected === 'ok') expect(res.status, detail).toBeOneOf([200, 201, 202, 204])
  else if (expected === 'pass') expect(res.status, detail).not.toBeOneOf([401, 403])
  else if (expected === 'refused') expect(res.status, detail).toBeOneOf([403, 404])
  else expect(res.status, detail).toBe(expected)
  expect(res.status, `${detail}: never a 5xx`).toBeLessThan(500)
}

describe('authorisation matrix', () => {
  const keys = routeFiles('server/api').map(routeKey)

  beforeAll(async () => {
    sides.own = await buildSide('Skerrow Point Station', 'Skerrow', 12)
    sides.other = await buildSide('Vellan Ness Station', 'Vellan', 24)
    emails.trainee = sides.own.trainee.email
    emails.instructor = sides.own.instructor.email
    emails.lead = 'lead@glint.demo'
    emails.admin = 'admin@glint.demo'
    clients.trainee = sides.own.trainee.client
    clients.instructor = sides.own.instructor.client
    clients.lead = await signedIn(emails.lead)
    clients.admin = await signedIn(emails.admin)
  }, 240_000)

  it('has an entry for every route file, and no entry without a route', () => {
    expect(keys.length).toBeGreaterThan(10)
    expect(keys.filter(k => !MATRIX[k]), 'routes missing from tests/e2e/access-matrix.ts').toEqual([])
    expect(Object.keys(MATRIX).filter(k => !keys.includes(k)), 'matrix entries without a route').toEqual([])
    expect(Object.keys(REQUESTS).filter(k => !keys.includes(k)), 'requests without a route').toEqual([])
  })

  for (const key of Object.keys(MATRIX)) {
    it(key, async () => {
      const entry = MATRIX[key]!
      check(await send(new Client(), key, sides.own), entry.anon, `${key} anonymous`)
      for (const role of ROLES) {
        check(await send(clients[role], key, sides.own), entry[role], `${key} as ${role}, own crew`)
        if (namesObject(key)) {
          const expected = entry.other?.[role] ?? (entry[role] === 'ok' ? 'refused' : entry[role])
          check(await send(clients[role], key, sides.other), expected, `${key} as ${role}, other crew`)
        }
        // Signing out ends every session of the account: sign in again for the routes after.
        if (key === 'POST /api/auth/logout') {
          clients[role] = await signedIn(emails[role], role === 'trainee' || role === 'instructor' ? TRAINEE_PASSWORD : undefined)
          if (role === 'trainee' || role === 'instructor') sides.own[role].client = clients[role]
        }
      }
    })
  }
})
