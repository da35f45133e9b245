// Issue 14, item 1: nothing a trainee can read maps a sighting's picture to its target type.
// Sightings (watch and check) are served at per-sighting addresses; a trainee never sees a
// rendering's content hash, and the content-hash route answers 404 to a trainee. Sources: api.md
// ("no image address a trainee can find elsewhere"), OWASP ASVS 4.0.3 V4.2.1 (insecure direct object
// references: an object is served only to the user it belongs to).
import { beforeAll, describe, expect, it } from 'vitest'
import { Client, signedIn } from '../support/client'
import { drillTrainee, ensureWatchFixture, readDb } from '../support/watch-fixture'
import type { WatchFixture } from '../support/watch-fixture'
import { MATRIX } from './access-matrix'

let fx: WatchFixture
let trainee: Awaited<ReturnType<typeof drillTrainee>>
let other: Awaited<ReturnType<typeof drillTrainee>>
let watch: { id: string, sightings: { id: string, imageUrl: string }[] }
let check: { id: string, attemptId: string, checkId: string, sightings: { id: string, imageUrl: string }[] }
// Every answer text a trainee read: the two POST answers that issue sightings and every GET.
const read: { label: string, status: number, text: string }[] = []
let renderings: string[] = []

beforeAll(async () => {
  fx = await ensureWatchFixture()
  trainee = await drillTrainee(fx.crewId)
  other = await drillTrainee(fx.crewId)
  const instructor = await signedIn('instructor@glint.demo')
  const defined = await instructor.post('/api/checks', {
    deckId: fx.deckId, title: 'Picture lookup check (test)', sightingCount: 6, exposureMs: 500,
    conditions: ['sunlit', 'haze'], aspects: ['beam', 'head-on'], passMark: 0.6,
  })
  expect(defined.status, defined.text).toBe(201)
  const w = await trainee.client.post('/api/watches', { deckId: fx.deckId })
  expect(w.status, w.text).toBe(200)
  watch = w.body
  read.push({ label: 'POST /api/watches', status: w.status, text: w.text })
  const c = await trainee.client.post(`/api/checks/${defined.body.id}/attempts`)
  expect(c.status, c.text).toBe(201)
  check = c.body
  read.push({ label: 'POST /api/checks/:check/attempts', status: c.status, text: c.text })
  renderings = readDb(db => (db.prepare('SELECT file FROM variants').all() as { file: string }[]).map(r => r.file.replace(/\.webp$/, '')))

  // Every GET route the trainee may call (tests/e2e/access-matrix.ts), with real ids of this
  // trainee's deck, watch, check, attempt, crew and person; the rest with a made-up id.
  const params: Record<string, string> = {
    deck: fx.deckId, watch: watch.id, check: check.checkId, attempt: check.attemptId, crew: fx.crewId, user: trainee.id, path: 'nothing-here',
  }
  const paths = Object.keys(MATRIX).filter(k => k.startsWith('GET ') && MATRIX[k]!.trainee !== 403)
    .map(k => k.slice(4).replace(/:([\w-]+)/g, (_, p: string) => params[p] ?? 'AAAAAAAAAAAAAAAAAAAAAA'))
  // The person page with its query, and the trainee's own pages as served (their server-rendered payloads).
  paths.push(`/api/people/${trainee.id}?deckId=${fx.deckId}&days=90`, '/', '/watch', '/checks', '/people/me', '/baseline', '/scan', '/settings')
  for (const path of paths) {
    const r = await trainee.client.get(path)
    read.push({ label: `GET ${path}`, status: r.status, text: r.text })
  }
})

describe('sighting pictures at per-sighting addresses (issue 14, item 1)', () => {
  it('serves every watch and check sighting at /images/s/<sighting id>.webp', () => {
    for (const s of [...watch.sightings, ...check.sightings]) expect(s.imageUrl).toBe(`/images/s/${s.id}.webp`)
    // The watch answer lists exactly the sightings stored for the watch, in their order.
    const stored = readDb(db => (db.prepare('SELECT id FROM sightings WHERE watch_id = ? ORDER BY position').all(watch.id) as { id: string }[]).map(r => r.id))
    expect(watch.sightings.map(s => s.id)).toEqual(stored)
    expect(check.sightings).toHaveLength(6)
  })

  it('no answer a trainee can read holds a rendering\'s content hash or hash address', () => {
    expect(renderings.length).toBeGreaterThan(100)
    // The walk read the trainee's own deck, pack, today, checks, people/me and more with 200.
    expect(read.filter(r => r.status === 200).length).toBeGreaterThanOrEqual(10)
    const hashes = new Set(renderings)
    for (const r of read) {
      // A SHA-256 in hex is 64 hex digits (FIPS 180-4); none may appear, rendering or not.
      const found = r.text.match(/[0-9a-f]{64}/gi) ?? []
      expect(found.filter(h => hashes.has(h.toLowerCase())), `${r.label} holds a rendering hash`).toEqual([])
      expect(found, `${r.label} holds a 64-digit hash`).toEqual([])
      expect(r.text, `${r.label} holds a hash image address`).not.toMatch(/\/images\/[0-9a-f]/i)
    }
  })

  it('answers 404 to the trainee on the content-hash route, even for the renderings of their own sightings', async () => {
    const files = readDb(db => db.prepare(`SELECT DISTINCT x.file FROM sightings s JOIN variants x ON x.id = s.variant_id
      WHERE s.user_id = ?`).all(trainee.id) as { file: string }[])
    expect(files.length).toBeGreaterThan(0)
    for (const f of files) {
      const r = await trainee.client.get(`/images/${f.file}`)
      expect(r.status, f.file).toBe(404)
      expect(r.body.message).toBe('No such image.')
    }
    // The deck's owner still gets them (the builder shows them).
    const owner = await signedIn('instructor@glint.demo')
    expect((await owner.get(`/images/${files[0]!.file}`)).status).toBe(200)
  })

  it('serves a sighting\'s picture to its trainee only: another trainee, a lead and the owner get the 404 of an unknown one', async () => {
    const first = watch.sightings[0]!
    const own = await trainee.client.get(first.imageUrl)
    expect(own.status).toBe(200)
    expect(own.headers.get('content-type')).toBe('image/webp')
    // RIFF....WEBP (RFC 9649 section 2.5, the WebP container's first bytes).
    expect(own.text.slice(0, 4)).toBe('RIFF')
    for (const s of [first, check.sightings[0]!]) {
      expect((await other.client.get(s.imageUrl)).status).toBe(404)
      expect((await (await signedIn('lead@glint.demo')).get(s.imageUrl)).status).toBe(404)
      expect((await (await signedIn('instructor@glint.demo')).get(s.imageUrl)).status).toBe(404)
      expect((await new Client().get(s.imageUrl)).status).toBe(401)
    }
    expect((await trainee.client.get(`/images/s/${'A'.repeat(21)}.webp`)).status).toBe(404)
    for (const bad of ['/images/s/short.webp', `/images/s/${first.id}.png`, '/images/s/..%2F..%2Fglint.sqlite']) {
      expect((await trainee.client.get(bad)).status, bad).toBe(400)
    }
  })
})
