// Decks and target types over HTTP: who sees what, the api.md shape, validation, the demo decks.
import Database from 'better-sqlite3'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import { AIRCRAFT_ASPECTS, DEMO_TARGET_TYPES, LOOK_ALIKE_PAIRS, VESSEL_ASPECTS } from '../../server/core/imaging/generate/catalogue'
import { CONDITIONS, CONTRAST_BANDS, type Condition } from '../../shared/utils/conditions'
import type { Client } from '../support/client'
import { crewIdOf, freshPerson, signedIn } from '../support/client'

const AIR = 'Coastal air picture'
const SEA = 'Harbour approaches'

function readDb() {
  return new Database(inject('dbPath'), { readonly: true, fileMustExist: true })
}

let instructor: Client
let trainee: Client
let decks: { id: string, title: string, category: string, published: boolean }[]
let crewA = ''
let crewB = ''

beforeAll(async () => {
  instructor = await signedIn('instructor@glint.demo')
  trainee = await signedIn('trainee@glint.demo')
  decks = (await instructor.get('/api/decks')).body
  crewA = await crewIdOf('lead@glint.demo')
  crewB = await crewIdOf('lead2@glint.demo')
})

describe('the demo decks', () => {
  it('lists the decks with exactly api.md\'s fields', async () => {
    const air = decks.find(d => d.title === AIR)
    const sea = decks.find(d => d.title === SEA)
    expect(air).toMatchObject({ category: 'aircraft', published: true })
    expect(sea).toMatchObject({ category: 'vessel', published: true })
    for (const d of decks) expect(Object.keys(d).sort()).toEqual(['category', 'id', 'published', 'title'])
  })

  it('GET /api/decks/[id] has api.md\'s shape; rendering URLs only for the owner, and they name neither the type nor its id', async () => {
    const air = decks.find(d => d.title === AIR)!
    // api.md: deck details shown to trainees carry no variant URLs.
    const seen = await trainee.get(`/api/decks/${air.id}`)
    expect(seen.status).toBe(200)
    for (const t of seen.body.targetTypes) for (const v of t.views) expect(v.variants).toEqual([])
    const r = await instructor.get(`/api/decks/${air.id}`)
    expect(r.status).toBe(200)
    expect(Object.keys(r.body).sort()).toEqual(['id', 'settings', 'targetTypes', 'title'])
    expect(Object.keys(r.body.settings).sort()).toEqual(['answerMode', 'choiceCount', 'hesitationMs', 'minExposureMs', 'newPerDay', 'retention', 'windowMs'])
    for (const t of r.body.targetTypes) {
      expect(Object.keys(t).sort()).toEqual(['affiliation', 'category', 'id', 'name', 'sizeM', 'views'])
      for (const v of t.views) {
        expect(Object.keys(v).sort()).toEqual(['aspect', 'id', 'variants'])
        expect(v.variants.length).toBeGreaterThan(0)
        for (const x of v.variants) {
          expect(Object.keys(x).sort()).toEqual(['condition', 'url', 'width'])
          expect(x.url).toMatch(/^\/images\/[a-f0-9]{64}\.webp$/)
          expect(x.url).not.toContain(t.id)
          expect(x.url.toLowerCase()).not.toContain(t.name.toLowerCase())
        }
      }
    }
  })

  it('hold >= 8 aircraft and >= 6 vessel types from the catalogue, with its sizes, features and look-alikes', async () => {
    for (const [title, category, aspects, min] of [[AIR, 'aircraft', AIRCRAFT_ASPECTS, 8], [SEA, 'vessel', VESSEL_ASPECTS, 6]] as const) {
      const deck = decks.find(d => d.title === title)!
      const detail = (await instructor.get(`/api/decks/${deck.id}/builder`)).body
      const expected = DEMO_TARGET_TYPES.filter(t => t.category === category)
      expect(detail.targetTypes.length).toBeGreaterThanOrEqual(min)
      expect(detail.targetTypes.map((t: { name: string }) => t.name).sort()).toEqual(expected.map(t => t.name).sort())
      expect(detail.crews.map((c: { id: string }) => c.id).sort()).toEqual([crewA, crewB].sort())
      const byName = new Map(detail.targetTypes.map((t: { name: string }) => [t.name, t]))
      for (const spec of expected) {
        const t = byName.get(spec.name) as { id: string, sizeM: number, features: Record<string, string>, lookAlikes: string[], views: { aspect: string, variants: unknown[] }[] }
        expect(t.sizeM).toBe(spec.sizeMetres)
        expect(t.features).toEqual(spec.features)
        expect(t.views.map(v => v.aspect).sort()).toEqual([...aspects].sort())
        for (const v of t.views) expect(v.variants).toHaveLength(18)
        const partners = LOOK_ALIKE_PAIRS.filter(p => p.includes(spec.key)).map(p => p[0] === spec.key ? p[1] : p[0])
        const partnerIds = partners.map(k => (byName.get(DEMO_TARGET_TYPES.find(x => x.key === k)!.name) as { id: string }).id)
        expect(t.lookAlikes.sort()).toEqual(partnerIds.sort())
      }
    }
  })

  it('stores every rendering with its contrast inside its condition\'s band (shared/utils/conditions.ts), six conditions x three sizes a view', () => {
    const db = readDb()
    const rows = db.prepare(`
      select v.id as view, x.condition, x.width, x.height, x.contrast from variants x
      join views v on v.id = x.view_id join target_types t on t.id = v.target_type_id join decks d on d.id = t.deck_id
      where d.title in (?, ?)`).all(AIR, SEA) as { view: string, condition: Condition, width: number, height: number, contrast: number }[]
    db.close()
    expect(rows.length).toBeGreaterThanOrEqual((8 * 3 + 6 * 3) * 18)
    const perView = new Map<string, string[]>()
    for (const r of rows) {
      const band = CONTRAST_BANDS[r.condition]
      expect(r.contrast, `${r.condition} ${r.contrast}`).toBeGreaterThanOrEqual(band.min)
      expect(r.contrast, `${r.condition} ${r.contrast}`).toBeLessThanOrEqual(band.max)
      perView.set(r.view, [...(perView.get(r.view) ?? []), `${r.condition}@${Math.max(r.width, r.height)}`])
    }
    const expected = CONDITIONS.flatMap(c => [320, 640, 1080].map(s => `${c}@${s}`)).sort()
    for (const list of perView.values()) expect(list.sort()).toEqual(expected)
  })
})

describe('who sees a deck', () => {
  it('a trainee and a lead of a crew see the published decks of their crews', async () => {
    const lead = await signedIn('lead@glint.demo')
    for (const c of [trainee, lead]) {
      const titles = (await c.get('/api/decks')).body.map((d: { title: string }) => d.title)
      expect(titles).toEqual(expect.arrayContaining([AIR, SEA]))
    }
  })

  it('a lead or an instructor of no crew of the deck cannot see it (404) nor its images', async () => {
    const air = decks.find(d => d.title === AIR)!
    const url = (await instructor.get(`/api/decks/${air.id}`)).body.targetTypes[0].views[0].variants[0].url
    for (const role of ['lead', 'instructor'] as const) {
      const p = await freshPerson(role, null)
      const list = (await p.client.get('/api/decks')).body
      expect(list.map((d: { id: string }) => d.id)).not.toContain(air.id)
      expect((await p.client.get(`/api/decks/${air.id}`)).status).toBe(404)
      expect((await p.client.get(url)).status).toBe(404)
    }
  })
})

describe('building a deck', () => {
  let owner: Client
  let deckId = ''

  beforeAll(async () => {
    owner = (await freshPerson('instructor', crewA)).client
  })

  it('creates a deck; refuses bad JSON, wrong types and out-of-range settings with 400, changing nothing', async () => {
    const created = await owner.post('/api/decks', { title: 'Estuary trial', category: 'aircraft' })
    expect(created.status).toBe(201)
    deckId = created.body.id
    const before = (await owner.get(`/api/decks/${deckId}/builder`)).body

    const malformed = await owner.req('PATCH', `/api/decks/${deckId}`, '{"title": "Broken', { 'content-type': 'application/json' })
    expect(malformed.status).toBe(400)
    const bodies = [
      { title: 42 },
      { category: 'balloon' },
      { settings: { retention: 0.5 } },
      { settings: { retention: 1 } },
      { settings: { choiceCount: 7 } },
      { settings: { choiceCount: 1 } },
      { settings: { minExposureMs: 50 } },
      { settings: { minExposureMs: 5000 } },
      { settings: { answerMode: 'spoken' } },
      { settings: { hesitationMs: 'fast' } },
      { settings: { hesitationMs: 6000, windowMs: 5000 } },
      { status: 'deleted' },
      { ownerId: 'someone' },
    ]
    for (const body of bodies) {
      const r = await owner.patch(`/api/decks/${deckId}`, body)
      expect(r.status, JSON.stringify(body)).toBe(400)
      expect(typeof r.body.message).toBe('string')
    }
    expect((await owner.get(`/api/decks/${deckId}/builder`)).body).toEqual(before)
  })

  it('saves settings within their bounds (retention 0.7..0.99, choices 2..6, shortest exposure 100..4000 ms)', async () => {
    const r = await owner.patch(`/api/decks/${deckId}`, { description: 'Trial deck', settings: { retention: 0.85, choiceCount: 6, minExposureMs: 100, answerMode: 'typed', hesitationMs: 1200, windowMs: 4000, newPerDay: 5 } })
    expect(r.status).toBe(200)
    const d = (await owner.get(`/api/decks/${deckId}`)).body
    expect(d.settings).toEqual({ retention: 0.85, choiceCount: 6, minExposureMs: 100, answerMode: 'typed', hesitationMs: 1200, windowMs: 4000, newPerDay: 5 })
  })

  it('adds target types with features and look-alikes stored both ways; refuses what does not fit', async () => {
    const a = await owner.post(`/api/decks/${deckId}/target-types`, {
      name: 'Hollin', affiliation: 'friendly', sizeM: 12.5, features: { wings: 'low, swept', tail: 'single fin' },
    })
    expect(a.status).toBe(201)
    const b = await owner.post(`/api/decks/${deckId}/target-types`, {
      name: 'Farrant', affiliation: 'hostile', sizeM: 13, features: { wings: 'low, swept', tail: 'twin fins' }, lookAlikes: [a.body.id],
    })
    expect(b.status).toBe(201)
    const refused = [
      { name: 'Wrongkey', affiliation: 'hostile', sizeM: 10, features: { hull: 'long' } },
      { name: 'Tiny', affiliation: 'hostile', sizeM: 0.1 },
      { name: 'Huge', affiliation: 'hostile', sizeM: 501 },
      { name: 'Boaty', category: 'vessel', affiliation: 'neutral', sizeM: 40 },
      { name: 'Nobody', affiliation: 'enemy', sizeM: 10 },
      { name: 'Stranger', affiliation: 'hostile', sizeM: 10, lookAlikes: [decks[0]!.id] },
    ]
    for (const body of refused) {
      const r = await owner.post(`/api/decks/${deckId}/target-types`, body)
      expect(r.status, JSON.stringify(body)).toBe(400)
    }
    expect((await owner.post(`/api/decks/${deckId}/target-types`, { name: 'Hollin', affiliation: 'neutral', sizeM: 9 })).status).toBe(409)

    let detail = (await owner.get(`/api/decks/${deckId}/builder`)).body
    const find = (id: string) => detail.targetTypes.find((t: { id: string }) => t.id === id)
    expect(detail.targetTypes).toHaveLength(2)
    expect(find(a.body.id).lookAlikes).toEqual([b.body.id])
    expect(find(b.body.id).lookAlikes).toEqual([a.body.id])
    expect(find(a.body.id).features).toEqual({ wings: 'low, swept', tail: 'single fin' })

    const patched = await owner.patch(`/api/target-types/${b.body.id}`, { sizeM: 14, lookAlikes: [] })
    expect(patched.status).toBe(200)
    expect((await owner.patch(`/api/target-types/${b.body.id}`, { sizeM: 0 })).status).toBe(400)
    detail = (await owner.get(`/api/decks/${deckId}/builder`)).body
    expect(find(b.body.id).sizeM).toBe(14)
    expect(find(a.body.id).lookAlikes).toEqual([])

    expect((await owner.del(`/api/target-types/${b.body.id}`)).status).toBe(200)
    expect((await owner.get(`/api/decks/${deckId}`)).body.targetTypes).toHaveLength(1)
  })

  it('refuses to publish a deck with nothing to drill (409); another instructor cannot change it', async () => {
    const r = await owner.patch(`/api/decks/${deckId}`, { status: 'published' })
    expect(r.status).toBe(409)
    expect(r.body.message).toMatch(/two target types/)
    // The demo instructor shares the crew but does not own the deck; a draft is not shown to them.
    expect((await instructor.patch(`/api/decks/${deckId}`, { title: 'Taken over' })).status).toBe(404)
  })

  it('assigns crews the instructor belongs to, refuses others (403); an admin assigns any', async () => {
    expect((await owner.req('PUT', `/api/decks/${deckId}/crews`, { crewIds: [crewA] })).status).toBe(200)
    expect((await owner.req('PUT', `/api/decks/${deckId}/crews`, { crewIds: [crewB] })).status).toBe(403)
    expect((await owner.req('PUT', `/api/decks/${deckId}/crews`, { crewIds: 'all' })).status).toBe(400)
    const admin = await signedIn('admin@glint.demo')
    const r = await admin.req('PUT', `/api/decks/${deckId}/crews`, { crewIds: [crewA, crewB] })
    expect(r.status).toBe(200)
    expect(r.body.crewIds.sort()).toEqual([crewA, crewB].sort())
    const detail = (await owner.get(`/api/decks/${deckId}/builder`)).body
    expect(detail.crews.map((c: { id: string }) => c.id).sort()).toEqual([crewA, crewB].sort())
    // Out of draft and assigned to their crew, another instructor sees the deck but may not change it.
    expect((await owner.patch(`/api/decks/${deckId}`, { status: 'archived' })).status).toBe(200)
    expect((await instructor.get(`/api/decks/${deckId}`)).status).toBe(200)
    expect((await instructor.patch(`/api/decks/${deckId}`, { title: 'Taken over' })).status).toBe(403)
    expect((await trainee.get(`/api/decks/${deckId}`)).status).toBe(404)
  })

  it('a trainee cannot create or change decks (403)', async () => {
    expect((await trainee.post('/api/decks', { title: 'Mine', category: 'vessel' })).status).toBe(403)
    expect((await trainee.patch(`/api/decks/${deckId}`, { title: 'Mine' })).status).toBe(403)
  })

  it('deletes a deck never drilled; a drilled deck answers 409 "archive it instead"', async () => {
    const drilled = decks.find(d => d.title === AIR)!
    const db = new Database(inject('dbPath'))
    const watchId = `test-watch-${Date.now()}`
    const userId = (db.prepare('select id from users where email = ?').get('trainee@glint.demo') as { id: string }).id
    // A watch on the deck makes it drilled, as the watch work records it.
    db.prepare('insert into watches (id, user_id, deck_id, day) values (?, ?, ?, ?)').run(watchId, userId, drilled.id, '2000-01-01')
    try {
      const r = await instructor.del(`/api/decks/${drilled.id}`)
      expect(r.status).toBe(409)
      expect(r.body.message).toMatch(/archive it instead/)
    }
    finally {
      db.prepare('delete from watches where id = ?').run(watchId)
      db.close()
    }
    expect((await owner.del(`/api/decks/${deckId}`)).status).toBe(200)
    expect((await owner.get(`/api/decks/${deckId}`)).status).toBe(404)
  })
})
