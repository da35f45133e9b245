// The instructor's daily work (issue 17): nothing lost by one click (a removed view waits in the
// deck's trash, restorable, purged after its retention period), drafts shown to nobody but their
// instructors, checks with a due date that are editable until taken and retired afterwards.
import { existsSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { beforeAll, describe, expect, inject, it } from 'vitest'
import { crewIdOf, signedIn } from '../support/client'
import type { Client } from '../support/client'
import { directPerson, ensureWatchDeck, readDb, writeDb } from '../support/watch-fixture'

let crewId = ''
let owner: { id: string, client: Client }
let deckId = ''
let types: { id: string, name: string }[] = []
const DAY = 86_400_000
// Issue 17 item 4 asks for "a retention period"; 30 days is a design value (common practice of trash folders, no source).
const RETENTION_DAYS = 30

const viewsOf = (typeId: string) => readDb(db => db.prepare('SELECT id, aspect FROM views WHERE target_type_id = ? ORDER BY aspect').all(typeId) as { id: string, aspect: string }[])
const filesOf = (viewId: string) => readDb(db => db.prepare('SELECT file FROM variants WHERE view_id = ? ORDER BY condition').pluck().all(viewId) as string[])
const auditOf = (action: string, subjectId: string) => readDb(db => db.prepare('SELECT actor_id AS actorId FROM audit_log WHERE action = ? AND subject_id = ?').all(action, subjectId) as { actorId: string }[])
const onDisk = (file: string) => existsSync(join(inject('uploadsDir'), 'renders', file))

beforeAll(async () => {
  crewId = await crewIdOf('lead@glint.demo')
  owner = await directPerson(['instructor'], crewId)
  const fx = await ensureWatchDeck({ title: `Daily work deck ${Date.now().toString(36)}`, crewId, ownerId: owner.id, tint: 7 })
  deckId = fx.deckId
  types = fx.types
})

describe('a removed view waits in the trash (issue 17, item 4)', () => {
  it('leaves the deck, is listed in the trash with its retention, and comes back whole on restore', async () => {
    const [view] = viewsOf(types[0]!.id)
    const files = filesOf(view!.id)
    expect(files.length).toBe(6)
    const removed = await owner.client.del(`/api/views/${view!.id}`)
    expect(removed.status, removed.text).toBe(200)
    expect(removed.body.restorableUntil - Date.now()).toBeGreaterThan((RETENTION_DAYS - 1) * DAY)
    // Gone from the deck and from what a watch can show; its files are kept for the restore.
    expect(viewsOf(types[0]!.id).map(v => v.id)).not.toContain(view!.id)
    expect(filesOf(view!.id)).toEqual([])
    for (const f of files) expect(onDisk(f), f).toBe(true)
    const trash = await owner.client.get(`/api/decks/${deckId}/trash`)
    expect(trash.status).toBe(200)
    expect(trash.body.retentionDays).toBe(RETENTION_DAYS)
    expect(trash.body.views).toEqual([expect.objectContaining({ id: view!.id, typeName: types[0]!.name, aspect: view!.aspect })])
    // Another instructor of the same crew can neither list nor restore it.
    const other = await directPerson(['instructor'], crewId)
    expect((await other.client.get(`/api/decks/${deckId}/trash`)).status).toBeOneOf([403, 404])
    expect((await other.client.post(`/api/views/${view!.id}/restore`)).status).toBeOneOf([403, 404])

    const restored = await owner.client.post(`/api/views/${view!.id}/restore`)
    expect(restored.status, restored.text).toBe(200)
    expect(filesOf(view!.id)).toEqual(files)
    expect((await owner.client.get(`/api/decks/${deckId}/trash`)).body.views).toEqual([])
    expect(auditOf('view.remove', view!.id)).toEqual([{ actorId: owner.id }])
    expect(auditOf('view.restore', view!.id)).toEqual([{ actorId: owner.id }])
    // A second restore has nothing to put back: a sentence, not a 500.
    const again = await owner.client.post(`/api/views/${view!.id}/restore`)
    expect(again.status).toBe(404)
    expect(again.body.message).toMatch(/kept for 30 days/)
  })

  it('purges a view removed longer ago than the retention period, with its files', async () => {
    const [, view] = viewsOf(types[1]!.id)
    const files = filesOf(view!.id)
    expect((await owner.client.del(`/api/views/${view!.id}`)).status).toBe(200)
    writeDb(db => db.prepare('UPDATE removed_views SET removed_at = ? WHERE id = ?').run(Date.now() - (RETENTION_DAYS + 1) * DAY, view!.id))
    const trash = await owner.client.get(`/api/decks/${deckId}/trash`)
    expect(trash.body.views.map((v: { id: string }) => v.id)).not.toContain(view!.id)
    expect(readDb(db => db.prepare('SELECT count(*) FROM removed_views WHERE id = ?').pluck().get(view!.id))).toBe(0)
    for (const f of files) expect(onDisk(f), f).toBe(false)
    expect((await owner.client.post(`/api/views/${view!.id}/restore`)).status).toBe(404)
  })
})

describe('a draft deck is shown to nobody but its instructors (issue 17, item 8)', () => {
  let draftId = ''
  let lead: Client
  beforeAll(async () => {
    lead = await signedIn('lead@glint.demo')
    const made = await owner.client.post('/api/decks', { title: `Unfinished draft ${Date.now().toString(36)}`, category: 'aircraft' })
    draftId = made.body.id
    expect((await owner.client.req('PUT', `/api/decks/${draftId}/crews`, { crewIds: [crewId] })).status).toBe(200)
  })

  it('is not in the lead\'s deck filter of the crew table, and the crew\'s readiness is not held back by it', async () => {
    const stats = await lead.get(`/api/crews/${crewId}/stats`)
    expect(stats.status).toBe(200)
    expect(stats.body.decks.map((d: { id: string }) => d.id)).not.toContain(draftId)
    expect((await lead.get(`/api/crews/${crewId}/stats?deckId=${draftId}`)).status).toBe(404)
  })

  it('takes no check: 409 with a sentence, nothing stored', async () => {
    const r = await owner.client.post('/api/checks', {
      deckId: draftId, title: 'On a draft', sightingCount: 5, exposureMs: 500, conditions: ['sunlit'], aspects: ['beam'], passMark: 0.6,
    })
    expect(r.status).toBe(409)
    expect(r.body.message).toMatch(/draft; publish it before defining a check/)
    expect(readDb(db => db.prepare('SELECT count(*) FROM checks WHERE deck_id = ?').pluck().get(draftId))).toBe(0)
  })
})

describe('checks: a due date, editable until taken, retired afterwards, audited (issue 17, item 7)', () => {
  const body = (over: Record<string, unknown> = {}) => ({
    deckId, title: `Daily check ${Date.now().toString(36)}`, sightingCount: 5, exposureMs: 500, conditions: ['sunlit'], aspects: ['beam'], passMark: 0.6, ...over,
  })
  // ISO 8601 calendar dates, as <input type="date"> sends them (HTML, "valid date string").
  const isoDay = (offsetDays: number) => new Date(Date.now() + offsetDays * DAY).toISOString().slice(0, 10)
  const row = (id: string) => readDb(db => db.prepare('SELECT title, due_at AS dueAt, retired_at AS retiredAt FROM checks WHERE id = ?').get(id) as { title: string, dueAt: number | null, retiredAt: number | null })

  it('stores a due date as the end of that UTC day, refuses a past or malformed one with a sentence, and audits the creation', async () => {
    const due = isoDay(7)
    const r = await owner.client.post('/api/checks', body({ dueDate: due }))
    expect(r.status, r.text).toBe(201)
    expect(r.body.dueDate).toBe(due)
    expect(row(r.body.id).dueAt).toBe(Date.parse(`${due}T23:59:59.999Z`))
    expect(auditOf('check.create', r.body.id)).toEqual([{ actorId: owner.id }])
    const before = readDb(db => db.prepare('SELECT count(*) FROM checks').pluck().get())
    const past = await owner.client.post('/api/checks', body({ dueDate: isoDay(-2) }))
    expect(past.status).toBe(400)
    expect(past.body.message).toBe('dueDate: That day is past; choose a due date from today on.')
    const malformed = await owner.client.post('/api/checks', body({ dueDate: '31/12/2026' }))
    expect(malformed.status).toBe(400)
    expect(malformed.body.message).toMatch(/^dueDate: Give the due date as a date \(YYYY-MM-DD\)/)
    expect(readDb(db => db.prepare('SELECT count(*) FROM checks').pluck().get())).toBe(before)
  })

  it('changes freely until taken; once taken only its due date moves, it cannot be deleted, and it retires with its results kept', async () => {
    const made = (await owner.client.post('/api/checks', body())).body
    const renamed = await owner.client.patch(`/api/checks/${made.id}`, { title: 'Renamed before anyone took it', passMark: 0.7 })
    expect(renamed.status, renamed.text).toBe(200)
    expect(row(made.id).title).toBe('Renamed before anyone took it')
    expect(auditOf('check.update', made.id)).toEqual([{ actorId: owner.id }])

    const trainee = await directPerson(['trainee'], crewId)
    const started = await trainee.client.post(`/api/checks/${made.id}/attempts`)
    expect(started.status, started.text).toBe(201)
    const late = await owner.client.patch(`/api/checks/${made.id}`, { title: 'Changed after it was taken' })
    expect(late.status).toBe(409)
    expect(late.body.message).toMatch(/only its due date can change/)
    expect(row(made.id).title).toBe('Renamed before anyone took it')
    const moved = await owner.client.patch(`/api/checks/${made.id}`, { dueDate: isoDay(3) })
    expect(moved.status, moved.text).toBe(200)
    expect(row(made.id).dueAt).toBe(Date.parse(`${isoDay(3)}T23:59:59.999Z`))
    const del = await owner.client.del(`/api/checks/${made.id}`)
    expect(del.status).toBe(409)
    expect(del.body.message).toMatch(/retire it instead/)

    // Only its own instructor retires it.
    const other = await directPerson(['instructor'], crewId)
    expect((await other.client.post(`/api/checks/${made.id}/retire`)).status).toBe(403)
    const retired = await owner.client.post(`/api/checks/${made.id}/retire`)
    expect(retired.status, retired.text).toBe(200)
    expect(row(made.id).retiredAt).toBeGreaterThan(Date.now() - 60_000)
    expect(auditOf('check.retire', made.id)).toEqual([{ actorId: owner.id }])
    expect((await owner.client.post(`/api/checks/${made.id}/retire`)).status).toBe(409)
    expect((await owner.client.patch(`/api/checks/${made.id}`, { dueDate: null })).status).toBe(409)

    // No longer offered to a trainee who has not taken it; the one who did still sees it and its attempt.
    const newcomer = await directPerson(['trainee'], crewId)
    const refused = await newcomer.client.post(`/api/checks/${made.id}/attempts`)
    expect(refused.status).toBe(409)
    expect(refused.body.message).toMatch(/retired/)
    expect((await newcomer.client.get('/api/checks')).body.toTake.map((c: { id: string }) => c.id)).not.toContain(made.id)
    const mine = (await trainee.client.get('/api/checks')).body.toTake.find((c: { id: string }) => c.id === made.id)
    expect(mine).toMatchObject({ status: 'running', attemptId: started.body.attemptId })
    expect(readDb(db => db.prepare('SELECT count(*) FROM check_attempts WHERE check_id = ?').pluck().get(made.id))).toBe(1)
  })
})

describe('from confusions to teaching (issue 17, item 6)', () => {
  it('puts the worst pair side by side at the aspect where it is confused most, with features and a picture', async () => {
    const instructor = await signedIn('instructor@glint.demo')
    const deck = readDb(db => db.prepare(`SELECT d.id FROM decks d JOIN users u ON u.id = d.owner_id WHERE u.email = 'instructor@glint.demo' AND d.status = 'published' ORDER BY d.title`).pluck().get()) as string
    const r = await instructor.get(`/api/decks/${deck}/confusions?days=365`)
    expect(r.status, r.text).toBe(200)
    expect(r.body.sideBySide.length).toBeGreaterThan(0)
    // The oracle, straight from the calls table: the most frequent (type, called type, aspect) among
    // wrong drill calls of the deck by its crews' members in the period.
    const top = readDb(db => db.prepare(`SELECT target_type_id AS t, called_type_id AS c, aspect, count(*) AS n FROM calls
      WHERE deck_id = ? AND kind = 'watch' AND called_type_id IS NOT NULL AND called_type_id <> target_type_id AND called_at >= ?
      AND user_id IN (SELECT m.user_id FROM memberships m JOIN deck_crews dc ON dc.crew_id = m.crew_id WHERE dc.deck_id = ?)
      GROUP BY 1, 2, 3 ORDER BY n DESC`).all(deck, Date.now() - 365 * DAY, deck) as { t: string, c: string, aspect: string, n: number }[])
    const first = r.body.sideBySide[0]
    expect(first.count).toBe(top[0]!.n)
    const tied = top.filter(x => x.n === top[0]!.n)
    expect(tied.some(x => x.t === first.truth.id && x.c === first.called.id && x.aspect === first.aspect)).toBe(true)
    for (const side of [first.truth, first.called]) {
      const stored = readDb(db => db.prepare('SELECT name, features FROM target_types WHERE id = ?').get(side.id) as { name: string, features: string })
      expect(side.name).toBe(stored.name)
      expect(side.features).toEqual(JSON.parse(stored.features))
      expect(side.imageUrl).toMatch(/^\/images\/[a-f0-9]{64}\.webp$/)
      expect((await instructor.get(side.imageUrl)).status).toBe(200)
    }
  })

  it('makes a check that shows only the chosen target types, and refuses a list outside the deck or of one type', async () => {
    const pair = [types[2]!.id, types[3]!.id]
    const made = await owner.client.post('/api/checks', {
      deckId, title: 'Two look-alikes only', sightingCount: 6, exposureMs: 500, conditions: ['sunlit', 'haze'], aspects: ['beam'], passMark: 0.8, targetTypeIds: pair,
    })
    expect(made.status, made.text).toBe(201)
    expect(made.body.targetTypeIds).toEqual(pair)
    const trainee = await directPerson(['trainee'], crewId)
    const issued = await trainee.client.post(`/api/checks/${made.body.id}/attempts`)
    expect(issued.status, issued.text).toBe(201)
    const shown = readDb(db => db.prepare('SELECT DISTINCT target_type_id FROM sightings WHERE watch_id = ?').pluck().all(issued.body.id) as string[])
    expect(shown.length).toBeGreaterThan(0)
    for (const t of shown) expect(pair).toContain(t)
    const foreign = await owner.client.post('/api/checks', {
      deckId, title: 'Foreign type', sightingCount: 6, exposureMs: 500, conditions: ['sunlit'], aspects: ['beam'], passMark: 0.8, targetTypeIds: [types[0]!.id, 'x'.repeat(21)],
    })
    expect(foreign.status).toBe(400)
    expect(foreign.body.message).toBe('targetTypeIds: Choose target types of this deck.')
    const one = await owner.client.post('/api/checks', {
      deckId, title: 'One type', sightingCount: 6, exposureMs: 500, conditions: ['sunlit'], aspects: ['beam'], passMark: 0.8, targetTypeIds: [types[0]!.id, types[0]!.id],
    })
    expect(one.status).toBe(400)
    expect(one.body.message).toMatch(/^targetTypeIds: Choose at least two target types/)
  })
})

describe('the same picture uploaded again while its view waits in the trash', () => {
  it('is refused with a sentence that points to the removed views, and the removed view comes back from there', async () => {
    const upload = async () => {
      const f = new FormData()
      f.set('targetTypeId', types[4]!.id)
      f.set('aspect', 'plan')
      f.append('files', new Blob([readFileSync('tests/fixtures/images/valid.png')], { type: 'image/png' }), 'valid.png')
      const r = await owner.client.post(`/api/decks/${deckId}/views`, f)
      expect(r.status, r.text).toBe(202)
      const until = Date.now() + 60_000
      while (Date.now() < until) {
        const job = await owner.client.get(`/api/jobs/${r.body.jobs[0].id}`)
        if (job.body.state === 'done' || job.body.state === 'failed') return job.body as { state: string, message: string | null, viewId: string | null }
        await new Promise(ok => setTimeout(ok, 100))
      }
      throw new Error('the upload did not finish')
    }
    const first = await upload()
    expect(first.state, first.message ?? '').toBe('done')
    expect((await owner.client.del(`/api/views/${first.viewId}`)).status).toBe(200)
    const again = await upload()
    expect(again.state).toBe('failed')
    expect(again.message).toMatch(/waits in the deck's removed views \(put it back from there\)/)
    expect((await owner.client.post(`/api/views/${first.viewId}/restore`)).status).toBe(200)
    expect(viewsOf(types[4]!.id).map(v => v.id)).toContain(first.viewId)
  })
})

describe('the instructor\'s library of target types (issue 17, item 5)', () => {
  it('links a type with its views into another own deck, sharing the renderings, and removing the linked row keeps the original\'s files', async () => {
    const source = types[5]!
    const target = (await owner.client.post('/api/decks', { title: `Library target ${Date.now().toString(36)}`, category: 'aircraft' })).body.id as string
    const library = await owner.client.get('/api/target-types/library')
    expect(library.status).toBe(200)
    expect(library.body).toContainEqual(expect.objectContaining({ id: source.id, name: source.name, views: viewsOf(source.id).length, decks: [expect.objectContaining({ id: deckId })] }))
    const linked = await owner.client.post(`/api/decks/${target}/type-links`, { targetTypeId: source.id })
    expect(linked.status, linked.text).toBe(201)
    const linkId = linked.body.id as string
    const row = (id: string) => readDb(db => db.prepare('SELECT deck_id AS deckId, definition_id AS definitionId, name, features, size_m AS sizeM FROM target_types WHERE id = ?').get(id) as { deckId: string, definitionId: string, name: string, features: string, sizeM: number })
    expect(row(linkId)).toEqual({ ...row(source.id), deckId: target })
    const filesOfType = (typeId: string) => readDb(db => db.prepare(`SELECT x.file FROM variants x JOIN views v ON v.id = x.view_id WHERE v.target_type_id = ? ORDER BY x.file`).pluck().all(typeId) as string[])
    const originals = filesOfType(source.id)
    expect(originals.length).toBeGreaterThan(0)
    expect(filesOfType(linkId)).toEqual(originals)
    expect(viewsOf(linkId).map(v => v.aspect)).toEqual(viewsOf(source.id).map(v => v.aspect))
    expect(auditOf('target-type.link', linkId)).toEqual([{ actorId: owner.id }])
    // Once is enough: the same type again, or into its own deck, is refused with a sentence.
    const twice = await owner.client.post(`/api/decks/${target}/type-links`, { targetTypeId: source.id })
    expect(twice.status).toBe(409)
    expect(twice.body.message).toBe('targetTypeId: This target type is already in this deck.')
    expect((await owner.client.post(`/api/decks/${deckId}/type-links`, { targetTypeId: source.id })).status).toBe(409)
    // Another instructor cannot link it into a deck of their own.
    const other = await directPerson(['instructor'], crewId)
    const theirs = (await other.client.post('/api/decks', { title: `Other library ${Date.now().toString(36)}`, category: 'aircraft' })).body.id as string
    expect((await other.client.post(`/api/decks/${theirs}/type-links`, { targetTypeId: source.id })).status).toBeOneOf([403, 404])
    // The linked row goes; the original keeps its renderings on disk.
    expect((await owner.client.del(`/api/target-types/${linkId}`)).status).toBe(200)
    for (const f of originals) expect(onDisk(f), f).toBe(true)
    expect(filesOfType(source.id)).toEqual(originals)
  })
})
