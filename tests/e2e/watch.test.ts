// The watch over real HTTP: issuing, what a sighting may not tell, grading at the boundaries,
// resends, other trainees, bad input, re-shows, the pack and the tap baseline.
import { beforeAll, describe, expect, it } from 'vitest'
import { Client } from '../support/client'
import { drillTrainee, ensureWatchFixture, publishedDecks, readDb, writeDb } from '../support/watch-fixture'
import type { WatchFixture } from '../support/watch-fixture'
import type { CallResult, IssuedSighting, IssuedWatch, WatchPack } from '../../shared/types/watch'

let fx: WatchFixture

interface SightingRow { id: string, target_type_id: string, answer_choice_id: string, position: number, track_id: string, reshow_of: string | null, issued_at: number }

const sightingRows = (watchId: string) => readDb(db => db.prepare('SELECT * FROM sightings WHERE watch_id = ? ORDER BY position, issued_at').all(watchId) as SightingRow[])
const callRows = (sightingId: string) => readDb(db => db.prepare('SELECT * FROM calls WHERE sighting_id = ?').all(sightingId) as Record<string, unknown>[])
interface TrackRowT { id: string, reps: number, due: number, stability: number }
const trackRow = (trackId: string) => readDb(db => db.prepare('SELECT * FROM tracks WHERE id = ?').get(trackId) as TrackRowT)
const answerOf = (sightingId: string) => readDb(db => db.prepare('SELECT answer_choice_id AS a FROM sightings WHERE id = ?').get(sightingId) as { a: string }).a

async function newWatch() {
  const t = await drillTrainee(fx.crewId)
  const r = await t.client.post<IssuedWatch>('/api/watches', { deckId: fx.deckId })
  expect(r.status, r.text).toBe(200)
  return { ...t, watch: r.body }
}

const call = (c: Client, id: string, body: unknown) => c.post<CallResult>(`/api/sightings/${id}/call`, body)
const goodCall = (choiceId: string | null, latencyMs: number | null) => ({ choiceId, latencyMs, framesShown: 30, frameIntervalMs: 16.7 })
const wrongChoice = (s: IssuedSighting) => s.choices.find(c => c.id !== answerOf(s.id))!.id

beforeAll(async () => {
  fx = await ensureWatchFixture()
})

describe('POST /api/watches', () => {
  it('issues the whole watch at once, new tracks up to the deck limit, and the same watch again while open', async () => {
    const { client, watch } = await newWatch()
    // Ids are 128 random bits in base64url (DEVELOPERS.md): 22 characters, nothing guessable.
    expect(watch.id).toMatch(/^[\w-]{21}$/)
    // 6 types x 2 aspects = 12 new tracks; the deck's newPerDay (default 10, product.md) caps the watch.
    expect(watch.sightings).toHaveLength(10)
    for (const s of watch.sightings) {
      expect(s.choices).toHaveLength(4)
      expect(new Set(s.choices.map(c => c.label)).size).toBe(4)
      // New tracks: until the call, at most 4 s (product.md, exposure ladder).
      expect(s.untilCall).toBe(true)
      expect(s.exposureMs).toBe(4000)
      expect(s.windowMs).toBeGreaterThanOrEqual(s.exposureMs)
    }
    const again = await client.post<IssuedWatch>('/api/watches', { deckId: fx.deckId })
    expect(again.body.id).toBe(watch.id)
    expect(again.body.sightings.map(s => s.id)).toEqual(watch.sightings.map(s => s.id))
    const today = await client.get('/api/watches/today')
    const mine = today.body.decks.find((d: { deckId: string }) => d.deckId === fx.deckId)
    expect(mine.openWatchId).toBe(watch.id)
    expect(mine.openLeft).toBe(10)
  })

  it('keeps the queue rules: no target type twice in a row (product.md, the watch)', async () => {
    const { watch } = await newWatch()
    const rows = sightingRows(watch.id!)
    expect(rows.map(r => r.id)).toEqual(watch.sightings.map(s => s.id))
    for (let i = 1; i < rows.length; i++) expect(rows[i]!.target_type_id).not.toBe(rows[i - 1]!.target_type_id)
  })

  it('sends nothing that tells the answer: no type id or name in any field or URL, opaque choice ids', async () => {
    const { client, watch } = await newWatch()
    const decks = publishedDecks(fx.crewId)
    const ids = decks.flatMap(d => d.types.map(t => t.id))
    const names = decks.flatMap(d => d.types.map(t => t.name.toLowerCase()))
    const labels = new Set(watch.sightings.flatMap(s => s.choices.map(c => c.label)))
    const strings: { path: string, value: string }[] = []
    const walk = (v: unknown, path: string) => {
      if (typeof v === 'string') strings.push({ path, value: v })
      else if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${path}[${i}]`))
      else if (v && typeof v === 'object') {
        for (const [k, x] of Object.entries(v)) {
          // Introductions name their type by design (product.md glossary: "the type named"); the sightings may not.
          if (path === '' && k === 'introductions') continue
          strings.push({ path: `${path}.${k}(key)`, value: k })
          walk(x, `${path}.${k}`)
        }
      }
    }
    walk(watch, '')
    expect(strings.length).toBeGreaterThan(50)
    for (const { path, value } of strings) {
      for (const id of ids) expect(value.includes(id), `${path} holds a type id`).toBe(false)
      // Names appear only as choice labels, where every choice has one.
      if (/\.label$/.test(path)) continue
      for (const n of names) expect(value.toLowerCase().includes(n), `${path} holds a type name`).toBe(false)
    }
    const keys = strings.filter(s => s.path.endsWith('(key)')).map(s => s.value)
    for (const k of ['answer', 'answerChoiceId', 'correct', 'targetTypeId', 'typeId', 'name']) expect(keys).not.toContain(k)
    for (const s of watch.sightings) {
      // api.md: sighting images at per-sighting addresses, never the rendering's content hash.
      expect(s.imageUrl).toBe(`/images/s/${s.id}.webp`)
      expect(s.maskUrl).toMatch(/^\/masks\/noise-\d\.webp$/)
      for (const c of s.choices) {
        expect(c.id).toMatch(/^[\w-]{22}$/)
        expect(labels.has(c.label)).toBe(true)
      }
    }
    // The images load, as the phone will fetch them.
    const img = await client.get(watch.sightings[0]!.imageUrl)
    expect(img.status).toBe(200)
    expect(img.headers.get('content-type')).toMatch(/image\/webp/)
    const mask = await client.get(watch.sightings[0]!.maskUrl)
    expect(mask.status).toBe(200)
  })

  it('does not correlate the order of choices with the answer (Pearson chi-square, 3 df, p = 0.001: 16.27)', async () => {
    const counts = [0, 0, 0, 0]
    for (let k = 0; k < 8; k++) {
      const { watch } = await newWatch()
      for (const s of watch.sightings) counts[s.choices.findIndex(c => c.id === answerOf(s.id))]! += 1
    }
    const n = counts.reduce((a, b) => a + b, 0)
    expect(n).toBe(80)
    const chi2 = counts.reduce((a, c) => a + (c - n / 4) ** 2 / (n / 4), 0)
    expect(chi2, `answer positions ${counts.join(', ')}`).toBeLessThan(16.27)
  })

  it('refuses a deck not assigned to the trainee, and other roles', async () => {
    const t = await drillTrainee(fx.crewId)
    expect((await t.client.post('/api/watches', { deckId: 'AAAAAAAAAAAAAAAAAAAAAA' })).status).toBe(404)
    expect((await t.client.post('/api/watches', { deckId: 12 })).status).toBe(400)
    const lead = await new Client().login('lead@glint.demo')
    expect((await lead.post('/api/watches', {})).status).toBe(403)
  })
})

describe('POST /api/sightings/[id]/call', () => {
  it('grades at the boundaries (product.md glossary; 150 ms floor: Thorpe, Fize & Marlot 1996)', async () => {
    // Deck defaults: hesitation 1500 ms, window 5000 ms (a new track's window is at least its 4 s exposure).
    const cases: [number, string, boolean][] = [
      [149, 'missed', true], [150, 'instant', false], [750, 'instant', false], [751, 'sure', false],
      [1500, 'sure', false], [1501, 'hesitant', false], [5000, 'hesitant', false], [5001, 'missed', false],
    ]
    const { client, watch } = await newWatch()
    const sightings = watch.sightings.slice(0, cases.length)
    for (const [i, [latency, grade, anticipation]] of cases.entries()) {
      const s = sightings[i]!
      expect(s.windowMs).toBe(5000)
      const r = await call(client, s.id, goodCall(answerOf(s.id), latency))
      expect(r.status, r.text).toBe(200)
      expect(r.body.grade, `${latency} ms`).toBe(grade)
      expect(r.body.anticipation).toBe(anticipation)
      expect(r.body.correct).toBe(true)
      const stored = callRows(s.id)[0]!
      expect(stored.grade).toBe(grade)
      expect(stored.anticipation).toBe(anticipation ? 1 : 0)
    }
  })

  it('a wrong call is missed, reveals the answer, stores FSRS before and after, and re-shows the track three sightings later', async () => {
    const { client, watch } = await newWatch()
    const s = watch.sightings[0]!
    const r = await call(client, s.id, goodCall(wrongChoice(s), 900))
    expect(r.body.grade).toBe('missed')
    expect(r.body.correct).toBe(false)
    const row = sightingRows(watch.id!).find(x => x.id === s.id)!
    expect(r.body.answer.choiceId).toBe(row.answer_choice_id)
    expect(r.body.answer.id).toBe(row.target_type_id)
    expect(fx.types.map(t => t.name)).toContain(r.body.answer.name)
    expect(Object.keys(r.body.answer.features).length).toBeGreaterThan(0)
    const stored = callRows(s.id)[0]!
    const before = JSON.parse(stored.before as string)
    const after = JSON.parse(stored.after as string)
    expect(before.reps).toBe(0)
    expect(after.reps).toBe(1)
    const track = trackRow(row.track_id)
    expect(track.reps).toBe(1)
    expect(track.due).toBe(after.due)
    expect(track.stability).toBeCloseTo(after.stability, 9)

    expect(r.body.appended).toHaveLength(1)
    const re = r.body.appended![0]!
    const rows = sightingRows(watch.id!)
    const reRow = rows.find(x => x.id === re.id)!
    expect(reRow.reshow_of).toBe(s.id)
    expect(reRow.track_id).toBe(row.track_id)
    // The same names as the missed sighting, under new choice ids (the call reads no crew history).
    expect(re.choices.map(c => c.label).sort()).toEqual(s.choices.map(c => c.label).sort())
    expect(re.choices.some(c => s.choices.some(o => o.id === c.id))).toBe(false)
    // A later POST /api/watches includes it, at least three other sightings after the missed one (product.md).
    const again = await client.post<IssuedWatch>('/api/watches', { deckId: fx.deckId })
    const open = again.body.sightings.filter(x => !x.called).map(x => x.id)
    expect(open.indexOf(re.id)).toBeGreaterThanOrEqual(3)
    expect(again.body.sightings.find(x => x.id === re.id)!.exposureMs).toBeLessThan(4000)
    const types = new Map(rows.map(x => [x.id, x.target_type_id]))
    for (let i = 1; i < open.length; i++) expect(types.get(open[i]!)).not.toBe(types.get(open[i - 1]!))
  })

  it('a resend returns the first result and counts once, sent one after the other or at the same time', async () => {
    const { client, watch } = await newWatch()
    const [a, b] = watch.sightings
    const first = await call(client, a!.id, goodCall(answerOf(a!.id), 600))
    const second = await call(client, a!.id, goodCall(wrongChoice(a!), 2000))
    expect(second.status).toBe(200)
    expect(second.body).toEqual(first.body)
    expect(callRows(a!.id)).toHaveLength(1)
    const [x, y] = await Promise.all([call(client, b!.id, goodCall(wrongChoice(b!), 700)), call(client, b!.id, goodCall(wrongChoice(b!), 700))])
    expect(x.body).toEqual(y.body)
    expect(callRows(b!.id)).toHaveLength(1)
    expect(trackRow(sightingRows(watch.id!).find(r => r.id === b!.id)!.track_id).reps).toBe(1)
    // One re-show only for the missed one.
    expect(sightingRows(watch.id!).filter(r => r.reshow_of === b!.id)).toHaveLength(1)
  })

  it('stores calls under time-ordered ids: UUIDv7 (RFC 9562, section 5.7), in the order of the calls', async () => {
    const { client, watch } = await newWatch()
    const t0 = Date.now()
    const ids: string[] = []
    for (const s of watch.sightings.slice(0, 3)) {
      await call(client, s.id, goodCall(answerOf(s.id), 800))
      ids.push(callRows(s.id)[0]!.id as string)
    }
    for (const id of ids) {
      // Version 7 in the 13th hex digit, the variant bits 10 in the 17th (RFC 9562, sections 4.1, 4.2).
      expect(id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-7[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/)
      // The first 48 bits: Unix time in milliseconds.
      const ms = Number.parseInt(id.replaceAll('-', '').slice(0, 12), 16)
      expect(ms).toBeGreaterThanOrEqual(t0)
      expect(ms).toBeLessThanOrEqual(Date.now())
    }
    expect([...ids].sort()).toEqual(ids)
  })

  it('refuses another trainee\'s call on my sighting, and changes nothing', async () => {
    const mine = await newWatch()
    const other = await drillTrainee(fx.crewId)
    const s = mine.watch.sightings[0]!
    const trackBefore = trackRow(sightingRows(mine.watch.id!)[0]!.track_id)
    const r = await call(other.client, s.id, goodCall(answerOf(s.id), 600))
    expect(r.status).toBe(404)
    expect(JSON.stringify(r.body)).not.toContain(answerOf(s.id))
    expect(callRows(s.id)).toHaveLength(0)
    expect(trackRow(trackBefore.id)).toEqual(trackBefore)
    expect((await other.client.get(`/api/watches/${mine.watch.id}/pack`)).status).toBe(404)
    expect((await call(mine.client, 'AAAAAAAAAAAAAAAAAAAAAA', goodCall(null, null))).status).toBe(404)
  })

  it('answers 400 to bad calls and changes nothing', async () => {
    const { client, watch } = await newWatch()
    const s = watch.sightings[0]!
    const answer = answerOf(s.id)
    const bad: unknown[] = [
      {},
      { ...goodCall(answer, -1) },
      { ...goodCall(answer, 600), latencyMs: '600' },
      { ...goodCall(answer, 600), latencyMs: 600.5 },
      { ...goodCall(answer, 600), latencyMs: 1e12 },
      { ...goodCall(answer, 600), framesShown: 5000 },
      { ...goodCall(answer, 600), framesShown: -3 },
      { ...goodCall(answer, 600), frameIntervalMs: 1 },
      { ...goodCall(answer, 600), frameIntervalMs: 'fast' },
      { ...goodCall(answer, 600), choiceId: 42 },
      { ...goodCall(answer, 600), extra: true },
      { ...goodCall(answer, 600), choiceId: 'BBBBBBBBBBBBBBBBBBBBBB' },
      { latencyMs: 600, framesShown: 30, frameIntervalMs: 16.7 },
      [1, 2, 3],
      '{"choiceId": "',
    ]
    for (const body of bad) {
      const r = typeof body === 'string'
        ? await client.req('POST', `/api/sightings/${s.id}/call`, body, { 'content-type': 'application/json' })
        : await call(client, s.id, body)
      expect(r.status, JSON.stringify(body)).toBe(400)
      expect(typeof r.body.message).toBe('string')
    }
    expect(callRows(s.id)).toHaveLength(0)
    expect(trackRow(sightingRows(watch.id!)[0]!.track_id).reps).toBe(0)
  })

  it('bounds the call time: never in the future, never before issue, refused 36 h after', async () => {
    const { client, watch } = await newWatch()
    const [a, b, c] = watch.sightings
    const issuedAt = sightingRows(watch.id!)[0]!.issued_at
    const before = Date.now()
    await call(client, a!.id, { ...goodCall(answerOf(a!.id), 600), calledAt: Date.now() + 3_600_000 })
    expect(callRows(a!.id)[0]!.called_at as number).toBeLessThanOrEqual(Date.now())
    expect(callRows(a!.id)[0]!.called_at as number).toBeGreaterThanOrEqual(before)
    await call(client, b!.id, { ...goodCall(answerOf(b!.id), 600), calledAt: issuedAt - 86_400_000 })
    expect(callRows(b!.id)[0]!.called_at).toBe(issuedAt)
    // A sighting issued two days ago: the call's time is past the 36 h limit.
    writeDb(db => db.prepare('UPDATE sightings SET issued_at = ? WHERE id = ?').run(Date.now() - 48 * 3_600_000, c!.id))
    const late = await call(client, c!.id, goodCall(answerOf(c!.id), 600))
    expect(late.status).toBe(409)
    expect(callRows(c!.id)).toHaveLength(0)
  })
})

describe('GET /api/watches/[id]/pack', () => {
  it('holds every sighting with its answer and features, for the trainee it was issued to; never a check', async () => {
    const { client, watch, id } = await newWatch()
    const r = await client.get<WatchPack>(`/api/watches/${watch.id}/pack`)
    expect(r.status).toBe(200)
    const rows = new Map(sightingRows(watch.id!).map(x => [x.id, x]))
    expect(r.body.sightings.map(s => s.id)).toEqual(watch.sightings.map(s => s.id))
    for (const s of r.body.sightings) {
      expect(s.answer.choiceId).toBe(rows.get(s.id)!.answer_choice_id)
      expect(s.answer.id).toBe(rows.get(s.id)!.target_type_id)
      expect(s.choices.map(c => c.id)).toContain(s.answer.choiceId)
    }
    expect(r.body.names.map(n => n.name).sort()).toEqual(fx.types.map(t => t.name).sort())
    const checkId = 'CCCCCCCCCCCCCCCCCCCCCC' + Math.random().toString(36).slice(2, 8)
    writeDb(db => db.prepare(`INSERT INTO watches (id, user_id, deck_id, kind, day, status) VALUES (?, ?, ?, 'check', '2025-01-01', 'open')`).run(checkId, id, fx.deckId))
    expect((await client.get(`/api/watches/${checkId}/pack`)).status).toBe(403)
  })
})

describe('tap baseline', () => {
  it('stores a baseline and reads the latest back; refuses impossible values', async () => {
    const t = await drillTrainee(fx.crewId)
    expect((await t.client.get('/api/baseline/me')).body.baseline).toBeNull()
    const r = await t.client.post('/api/baseline', { simpleMs: 262.4, choiceMs: 431, trials: 20 })
    expect(r.status).toBe(201)
    const me = await t.client.get('/api/baseline/me')
    expect(me.body.baseline).toMatchObject({ simpleMs: 262, choiceMs: 431, trials: 20 })
    for (const body of [{}, { simpleMs: -5, choiceMs: 400, trials: 20 }, { simpleMs: 250, choiceMs: 'x', trials: 20 }, { simpleMs: 250, choiceMs: 400, trials: 2 }]) {
      expect((await t.client.post('/api/baseline', body)).status).toBe(400)
    }
    expect(readDb(db => db.prepare('SELECT count(*) AS n FROM tap_baselines WHERE user_id = ?').get(t.id) as { n: number }).n).toBe(1)
  })
})
