// Uploads of views over HTTP: valid PNG, JPEG and WebP become 18 renderings each; the hostile set
// is refused and leaves nothing behind; images are served only to those who may see the deck.
import { readFileSync, readdirSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import Database from 'better-sqlite3'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import { decodeWebp } from '../../server/core/imaging/codecs'
import { CONDITIONS } from '../../shared/utils/conditions'
import { Client, crewIdOf, freshPerson, signedIn } from '../support/client'

const FIXTURES = fileURLToPath(new URL('../fixtures/images', import.meta.url))
const fixture = (name: string) => new Uint8Array(readFileSync(join(FIXTURES, name)))
const MIME: Record<string, string> = { png: 'image/png', jpg: 'image/jpeg', webp: 'image/webp', svg: 'image/svg+xml', txt: 'text/plain' }

function form(targetTypeId: string, aspect: string, files: { name: string, bytes: Uint8Array, type?: string }[]) {
  const f = new FormData()
  f.set('targetTypeId', targetTypeId)
  f.set('aspect', aspect)
  for (const file of files) f.append('files', new Blob([file.bytes], { type: file.type ?? MIME[file.name.split('.').pop()!] ?? 'application/octet-stream' }), file.name)
  return f
}

async function settle(c: Client, jobId: string) {
  const until = Date.now() + 60_000
  const seen: number[] = []
  while (Date.now() < until) {
    const r = await c.get(`/api/jobs/${jobId}`)
    expect(r.status).toBe(200)
    seen.push(r.body.progress)
    if (r.body.state === 'done' || r.body.state === 'failed') return { ...r.body, seen }
    await new Promise(ok => setTimeout(ok, 100))
  }
  throw new Error(`job ${jobId} did not finish`)
}

function renderFiles() {
  try {
    return readdirSync(join(inject('uploadsDir'), 'renders')).sort()
  }
  catch {
    return []
  }
}

function rowsFor(typeId: string) {
  const db = new Database(inject('dbPath'), { readonly: true })
  const views = (db.prepare('select count(*) as n from views where target_type_id = ?').get(typeId) as { n: number }).n
  const variants = (db.prepare('select count(*) as n from variants x join views v on v.id = x.view_id where v.target_type_id = ?').get(typeId) as { n: number }).n
  db.close()
  return { views, variants }
}

let owner: Client
let deckId = ''
let typeId = ''
let otherTypeId = ''

beforeAll(async () => {
  owner = (await freshPerson('instructor', await crewIdOf('lead@glint.demo'))).client
  deckId = (await owner.post('/api/decks', { title: `Upload trial ${Date.now()}`, category: 'aircraft' })).body.id
  typeId = (await owner.post(`/api/decks/${deckId}/target-types`, { name: 'Corrow', affiliation: 'neutral', sizeM: 11 })).body.id
  otherTypeId = (await owner.post(`/api/decks/${deckId}/target-types`, { name: 'Pellin', affiliation: 'hostile', sizeM: 15 })).body.id
})

describe('uploading views', () => {
  it('turns a valid PNG, JPEG and WebP into done jobs with 18 WebP renderings each, of the stated size', async () => {
    const r = await owner.post(`/api/decks/${deckId}/views`, form(typeId, 'plan', [
      { name: 'plan.png', bytes: fixture('valid.png') },
      { name: 'beam.jpg', bytes: fixture('valid.jpg') },
      { name: 'head.webp', bytes: fixture('valid.webp') },
    ]))
    expect(r.status).toBe(202)
    expect(r.body.jobs).toHaveLength(3)
    for (const job of r.body.jobs) {
      const done = await settle(owner, job.id)
      expect(done.state, done.message).toBe('done')
      expect(done.progress).toBe(1)
      expect(done.seen.every((p: number, i: number) => i === 0 || p >= done.seen[i - 1])).toBe(true)
    }
    const detail = (await owner.get(`/api/decks/${deckId}/builder`)).body
    const type = detail.targetTypes.find((t: { id: string }) => t.id === typeId)
    expect(type.views).toHaveLength(3)
    for (const view of type.views) {
      expect(view.variants).toHaveLength(18)
      expect(view.variants.map((v: { condition: string }) => v.condition).sort()).toEqual(CONDITIONS.flatMap(c => [c, c, c]).sort())
      for (const v of view.variants) {
        const img = await owner.req('GET', v.url)
        expect(img.status).toBe(200)
        expect(img.headers.get('content-type')).toBe('image/webp')
        expect(img.headers.get('x-content-type-options')).toBe('nosniff')
        expect(img.headers.get('cache-control')).toBe('private, max-age=31536000, immutable')
        const bytes = new Uint8Array(await (await fetch(inject('baseUrl') + v.url, { headers: { cookie: owner.cookieHeader() } })).arrayBuffer())
        // Decoded again by the @jsquash WebP decoder (libwebp): the stated size is the real one.
        const decoded = await decodeWebp(bytes)
        expect([decoded.width, decoded.height]).toEqual([v.width, v.height])
        expect([320, 640, 1080]).toContain(Math.max(v.width, v.height))
        expect(v.bytes).toBe(bytes.byteLength)
      }
    }
  })

  it('refuses each file of the hostile set with its 4xx or a failed job, leaving no view, variant or file', async () => {
    const cases: { name: string, status: number | 'failed-job' }[] = [
      { name: 'drawing.svg', status: 415 },
      { name: 'notes.txt', status: 415 },
      { name: 'empty.png', status: 400 },
      { name: 'huge-header.png', status: 422 },
      { name: 'truncated.png', status: 422 },
      { name: 'corrupt.jpg', status: 'failed-job' },
    ]
    for (const c of cases) {
      const files = renderFiles()
      const rows = rowsFor(otherTypeId)
      const r = await owner.post(`/api/decks/${deckId}/views`, form(otherTypeId, 'beam', [{ name: c.name, bytes: fixture(c.name) }]))
      if (c.status === 'failed-job') {
        expect(r.status, c.name).toBe(202)
        const job = await settle(owner, r.body.jobs[0].id)
        expect(job.state, c.name).toBe('failed')
        expect(job.message).toMatch(/could not be decoded/)
      }
      else {
        expect(r.status, `${c.name}: ${r.text}`).toBe(c.status)
        expect(r.body.message.length).toBeGreaterThan(10)
      }
      expect(rowsFor(otherTypeId), c.name).toEqual(rows)
      expect(renderFiles(), c.name).toEqual(files)
    }
    expect(rowsFor(otherTypeId)).toEqual({ views: 0, variants: 0 })
  })

  it('takes the good files of a mixed upload and gives each refused file a failed job with its reason', async () => {
    const r = await owner.post(`/api/decks/${deckId}/views`, form(otherTypeId, 'beam', [
      { name: 'drawing.svg', bytes: fixture('drawing.svg') },
      { name: 'side.png', bytes: fixture('valid-vessel.png') },
    ]))
    expect(r.status).toBe(202)
    const [svg, png] = await Promise.all(r.body.jobs.map((j: { id: string }) => settle(owner, j.id)))
    expect(svg.state).toBe('failed')
    expect(svg.message).toMatch(/SVG/)
    expect(png.state).toBe('done')
    expect(rowsFor(otherTypeId)).toEqual({ views: 1, variants: 18 })
  })

  it('refuses the same picture twice for one target type, leaving nothing behind', async () => {
    const files = renderFiles()
    const r = await owner.post(`/api/decks/${deckId}/views`, form(otherTypeId, 'beam', [{ name: 'again.png', bytes: fixture('valid-vessel.png') }]))
    expect(r.status).toBe(202)
    const job = await settle(owner, r.body.jobs[0].id)
    expect(job.state).toBe('failed')
    expect(job.message).toMatch(/already/)
    expect(renderFiles()).toEqual(files)
    expect(rowsFor(otherTypeId)).toEqual({ views: 1, variants: 18 })
  })

  it('bounds the upload: more than 20 files or a file over 15 MB is refused with 413', async () => {
    const many = Array.from({ length: 21 }, (_, i) => ({ name: `f${i}.png`, bytes: fixture('valid.png') }))
    expect((await owner.post(`/api/decks/${deckId}/views`, form(typeId, 'plan', many))).status).toBe(413)
    const big = new Uint8Array(15 * 1024 * 1024 + 10)
    big.set(fixture('valid.png'))
    const r = await owner.post(`/api/decks/${deckId}/views`, form(typeId, 'plan', [{ name: 'big.png', bytes: big }]))
    expect(r.status).toBe(413)
    expect(r.body.message).toMatch(/15 MB/)
  })

  it('refuses missing fields, an unknown aspect and a target type of another deck with 4xx', async () => {
    const png = [{ name: 'a.png', bytes: fixture('valid.png') }]
    expect((await owner.post(`/api/decks/${deckId}/views`, form(typeId, 'sideways', png))).status).toBe(400)
    expect((await owner.post(`/api/decks/${deckId}/views`, form(typeId, 'plan', []))).status).toBe(400)
    const demo = (await owner.get('/api/decks')).body.find((d: { title: string }) => d.title === 'Coastal air picture')
    const demoType = (await owner.get(`/api/decks/${demo.id}`)).body.targetTypes[0].id
    expect((await owner.post(`/api/decks/${deckId}/views`, form(demoType, 'plan', png))).status).toBe(404)
  })

  it('a trainee or a lead cannot upload (403); a job is shown only to its uploader', async () => {
    const png = [{ name: 'a.png', bytes: fixture('valid.png') }]
    for (const who of ['trainee@glint.demo', 'lead@glint.demo']) {
      const c = await signedIn(who)
      expect((await c.post(`/api/decks/${deckId}/views`, form(typeId, 'plan', png))).status).toBe(403)
    }
    const r = await owner.post(`/api/decks/${deckId}/views`, form(otherTypeId, 'beam', [{ name: 'd.svg', bytes: fixture('drawing.svg') }, { name: 'v.webp', bytes: fixture('valid.webp') }]))
    const other = await signedIn('instructor@glint.demo')
    expect((await other.get(`/api/jobs/${r.body.jobs[0].id}`)).status).toBe(404)
    await Promise.all(r.body.jobs.map((j: { id: string }) => settle(owner, j.id)))
  })
})

describe('serving images', () => {
  let url = ''
  beforeAll(async () => {
    const detail = (await owner.get(`/api/decks/${deckId}`)).body
    url = detail.targetTypes.find((t: { id: string }) => t.id === typeId).views[0].variants[0].url
  })

  it('refuses an image without a session (401), a traversal or malformed name (400), an unknown one (404)', async () => {
    expect((await new Client().get(url)).status).toBe(401)
    for (const bad of ['/images/..%2F..%2Fetc%2Fpasswd', '/images/%2e%2e%2fglint.sqlite', '/images/abc.webp', `/images/${'A'.repeat(64)}.webp`, `/images/${'a'.repeat(64)}.png`]) {
      expect((await owner.get(bad)).status, bad).toBe(400)
    }
    expect((await owner.get(`/images/${'0'.repeat(64)}.webp`)).status).toBe(404)
  })

  it('serves a draft deck\'s images to its owner only, not to a trainee of the crew (404)', async () => {
    expect((await owner.get(url)).status).toBe(200)
    expect((await (await signedIn('trainee@glint.demo')).get(url)).status).toBe(404)
  })
})
