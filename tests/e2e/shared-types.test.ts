// A target type shared between an instructor's decks (issue 17, item 5: "a type defined once, used in
// several decks, its views uploaded once"). Each deck keeps its own row (tracks, calls and sightings
// name it); the rows of one definition change together. Everything here goes through the API of the
// built server and is read back from its database.
import { readFileSync } from 'node:fs'
import { beforeAll, describe, expect, it } from 'vitest'
import { crewIdOf, signedIn } from '../support/client'
import type { Client } from '../support/client'
import { directPerson, readDb } from '../support/watch-fixture'

let owner: { id: string, client: Client }
let crewId = ''
const tag = Date.now().toString(36)

interface TypeRow { id: string, deckId: string, definitionId: string, name: string, category: string, affiliation: string, sizeM: number, features: string, updatedAt: number }
const typeRow = (id: string) => readDb(db => db.prepare(`SELECT id, deck_id AS deckId, definition_id AS definitionId, name, category, affiliation,
  size_m AS sizeM, features, updated_at AS updatedAt FROM target_types WHERE id = ?`).get(id) as TypeRow)
const viewsOf = (typeId: string) => readDb(db => db.prepare('SELECT id, aspect, source_sha AS sourceSha FROM views WHERE target_type_id = ? ORDER BY aspect, source_sha').all(typeId) as { id: string, aspect: string, sourceSha: string }[])
const filesOfType = (typeId: string) => readDb(db => db.prepare('SELECT x.file FROM variants x JOIN views v ON v.id = x.view_id WHERE v.target_type_id = ? ORDER BY x.file').pluck().all(typeId) as string[])
const auditRows = (action: string, subjectId: string) => readDb(db => db.prepare('SELECT actor_id AS actorId, detail FROM audit_log WHERE action = ? AND subject_id = ?').all(action, subjectId) as { actorId: string, detail: string }[])

async function newDeck(title: string, category = 'aircraft') {
  const r = await owner.client.post('/api/decks', { title: `${title} ${tag}`, category })
  expect(r.status, r.text).toBe(201)
  return r.body.id as string
}

async function newType(deckId: string, name: string) {
  const r = await owner.client.post(`/api/decks/${deckId}/target-types`, { name, affiliation: 'hostile', sizeM: 18, features: { wings: 'Swept, mid-set' } })
  expect(r.status, r.text).toBe(201)
  return r.body.id as string
}

// Uploads one picture as a view and waits for its job.
async function upload(deckId: string, typeId: string, aspect: string, file: string, mime: string) {
  const f = new FormData()
  f.set('targetTypeId', typeId)
  f.set('aspect', aspect)
  f.append('files', new Blob([readFileSync(`tests/fixtures/images/${file}`)], { type: mime }), file)
  const r = await owner.client.post(`/api/decks/${deckId}/views`, f)
  expect(r.status, r.text).toBe(202)
  const until = Date.now() + 60_000
  while (Date.now() < until) {
    const job = await owner.client.get(`/api/jobs/${r.body.jobs[0].id}`)
    if (job.body.state === 'done') return job.body.viewId as string
    if (job.body.state === 'failed') throw new Error(job.body.message)
    await new Promise(ok => setTimeout(ok, 100))
  }
  throw new Error('the upload did not finish')
}

beforeAll(async () => {
  crewId = await crewIdOf('lead@glint.demo')
  owner = await directPerson(['instructor'], crewId)
})

describe('a target type shared between decks (issue 17, item 5)', () => {
  let deckA = ''
  let deckB = ''
  let typeA = ''
  let typeB = ''
  let perView = 0

  it('is linked into a second deck: one definition, its views\' renderings shared, nothing rendered again', async () => {
    deckA = await newDeck('Shared source')
    deckB = await newDeck('Shared user')
    typeA = await newType(deckA, 'Kestrel Mk 2')
    // A new target type is its own definition.
    expect(typeRow(typeA).definitionId).toBe(typeA)
    await upload(deckA, typeA, 'beam', 'valid.png', 'image/png')
    const jobsBefore = readDb(db => db.prepare('SELECT count(*) FROM jobs WHERE user_id = ?').pluck().get(owner.id) as number)

    const library = await owner.client.get('/api/target-types/library')
    expect(library.status).toBe(200)
    expect(library.body).toContainEqual({ id: typeA, definitionId: typeA, name: 'Kestrel Mk 2', category: 'aircraft', views: 1, decks: [{ id: deckA, title: `Shared source ${tag}` }] })

    const linked = await owner.client.post(`/api/decks/${deckB}/type-links`, { targetTypeId: typeA })
    expect(linked.status, linked.text).toBe(201)
    typeB = linked.body.id
    expect(typeB).not.toBe(typeA)
    const { id: _a, deckId: _da, updatedAt: _ua, ...fieldsA } = typeRow(typeA)
    const { id: _b, deckId: dB, updatedAt: _ub, ...fieldsB } = typeRow(typeB)
    expect(dB).toBe(deckB)
    expect(fieldsB).toEqual(fieldsA)
    // Its own view rows, naming the same six files; no upload job was made for them.
    expect(viewsOf(typeB).map(v => v.sourceSha)).toEqual(viewsOf(typeA).map(v => v.sourceSha))
    expect(viewsOf(typeB)[0]!.id).not.toBe(viewsOf(typeA)[0]!.id)
    expect(filesOfType(typeB)).toEqual(filesOfType(typeA))
    // Renderings under each of the glossary's six conditions (product.md), at one or more widths.
    perView = filesOfType(typeA).length
    expect(perView % 6).toBe(0)
    expect(readDb(db => db.prepare('SELECT count(DISTINCT x.condition) FROM variants x JOIN views v ON v.id = x.view_id WHERE v.target_type_id = ?').pluck().get(typeB))).toBe(6)
    expect(readDb(db => db.prepare('SELECT count(*) FROM jobs WHERE user_id = ?').pluck().get(owner.id))).toBe(jobsBefore)
    expect(auditRows('target-type.link', typeB).map(r => r.actorId)).toEqual([owner.id])

    // The library now lists one definition used in two decks.
    const after = (await owner.client.get('/api/target-types/library')).body as { definitionId: string, decks: { id: string }[] }[]
    const entry = after.filter(e => e.definitionId === typeA)
    expect(entry).toHaveLength(1)
    expect(entry[0]!.decks.map(d => d.id).sort()).toEqual([deckA, deckB].sort())
    // The builder of each deck names the other.
    const builderB = (await owner.client.get(`/api/decks/${deckB}/builder`)).body
    expect(builderB.targetTypes.find((t: { id: string }) => t.id === typeB).sharedWith).toEqual([{ id: deckA, title: `Shared source ${tag}` }])
    // Twice in one deck, or into its own deck, is refused with a sentence.
    for (const target of [deckB, deckA]) {
      const again = await owner.client.post(`/api/decks/${target}/type-links`, { targetTypeId: typeA })
      expect(again.status).toBe(409)
      expect(again.body.message).toBe('targetTypeId: This target type is already in this deck.')
    }
  })

  it('takes an edit in one deck to every deck\'s row, in one change audited once with the decks', async () => {
    const patch = { name: 'Kestrel Mk 3', affiliation: 'friendly', sizeM: 21.5, features: { wings: 'Straight, high-set', tail: 'T-tail' } }
    const r = await owner.client.patch(`/api/target-types/${typeB}`, patch)
    expect(r.status, r.text).toBe(200)
    for (const id of [typeA, typeB]) {
      const row = typeRow(id)
      expect({ name: row.name, affiliation: row.affiliation, sizeM: row.sizeM, features: JSON.parse(row.features) }).toEqual(patch)
    }
    const audits = auditRows('target-type.update', typeB)
    expect(audits).toHaveLength(1)
    expect(JSON.parse(audits[0]!.detail).deckIds.sort()).toEqual([deckA, deckB].sort())
    expect(auditRows('target-type.update', typeA)).toEqual([])
    // The admin's audit log names the decks by their titles (issue 17, item 1: readable fields, names for ids).
    const admin = await signedIn('admin@glint.demo')
    const log = await admin.get('/api/admin/audit?action=target-type.update&size=100')
    expect(log.status).toBe(200)
    const entry = log.body.find((e: { subjectId: string }) => e.subjectId === typeB)
    const titles = readDb(db => db.prepare('SELECT id, title FROM decks WHERE id IN (?, ?)').all(deckA, deckB) as { id: string, title: string }[])
    expect(entry.names).toMatchObject(Object.fromEntries(titles.map(t => [t.id, t.title])))
  })

  it('adds a view uploaded in one deck to every linked row once rendered, sharing its files', async () => {
    const viewId = await upload(deckB, typeB, 'head-on', 'valid.jpg', 'image/jpeg')
    const headOn = (typeId: string) => viewsOf(typeId).filter(v => v.aspect === 'head-on')
    expect(headOn(typeB).map(v => v.id)).toEqual([viewId])
    expect(headOn(typeA)).toHaveLength(1)
    expect(headOn(typeA)[0]!.sourceSha).toBe(headOn(typeB)[0]!.sourceSha)
    expect(filesOfType(typeA)).toEqual(filesOfType(typeB))
    expect(filesOfType(typeA)).toHaveLength(2 * perView)
  })

  it('refuses a rename that clashes in any linked deck with a 409 naming that deck, and changes nothing', async () => {
    await newType(deckA, 'Osprey Trainer')
    const before = [typeRow(typeA), typeRow(typeB)]
    const clash = await owner.client.patch(`/api/target-types/${typeB}`, { name: 'Osprey Trainer', sizeM: 30 })
    expect(clash.status).toBe(409)
    expect(clash.body.message).toBe(`name: "Shared source ${tag}" shares this target type and already has a target type named "Osprey Trainer". Nothing was changed.`)
    expect([typeRow(typeA), typeRow(typeB)]).toEqual(before)
    // In its own deck, the sentence it always had.
    const own = await owner.client.patch(`/api/target-types/${typeA}`, { name: 'Osprey Trainer' })
    expect(own.status).toBe(409)
    expect(own.body.message).toBe('A target type of that name is already in this deck.')
    expect([typeRow(typeA), typeRow(typeB)]).toEqual(before)
  })

  it('removes a view from this deck only, or from every deck, and puts it back where it was removed', async () => {
    const beamOf = (typeId: string) => viewsOf(typeId).find(v => v.aspect === 'beam')
    // This deck only: the other deck keeps it.
    const onlyHere = await owner.client.del(`/api/views/${beamOf(typeB)!.id}`)
    expect(onlyHere.status, onlyHere.text).toBe(200)
    expect(onlyHere.body.decks).toBe(1)
    expect(beamOf(typeB)).toBeUndefined()
    expect(beamOf(typeA)).toBeDefined()
    expect((await owner.client.post(`/api/views/${onlyHere.body.id}/restore`)).status).toBe(200)
    expect(beamOf(typeB)).toBeDefined()

    // Everywhere: both go, each to its deck's trash; putting back one puts back both.
    const filesBefore = [filesOfType(typeA), filesOfType(typeB)]
    const viewA = beamOf(typeA)!.id
    const viewB = beamOf(typeB)!.id
    const bad = await owner.client.del(`/api/views/${viewA}?everywhere=sometimes`)
    expect(bad.status).toBe(400)
    expect(beamOf(typeA)).toBeDefined()
    const everywhere = await owner.client.del(`/api/views/${viewA}?everywhere=true`)
    expect(everywhere.status, everywhere.text).toBe(200)
    expect(everywhere.body.decks).toBe(2)
    expect([beamOf(typeA), beamOf(typeB)]).toEqual([undefined, undefined])
    const trashA = (await owner.client.get(`/api/decks/${deckA}/trash`)).body.views
    const trashB = (await owner.client.get(`/api/decks/${deckB}/trash`)).body.views
    expect(trashA).toEqual([expect.objectContaining({ id: viewA, decks: 2 })])
    expect(trashB).toEqual([expect.objectContaining({ id: viewB, decks: 2 })])
    expect(auditRows('view.remove', viewA)).toHaveLength(1)
    const restored = await owner.client.post(`/api/views/${viewB}/restore`)
    expect(restored.status, restored.text).toBe(200)
    expect(restored.body.decks).toBe(2)
    expect([beamOf(typeA)?.id, beamOf(typeB)?.id]).toEqual([viewA, viewB])
    expect([filesOfType(typeA), filesOfType(typeB)]).toEqual(filesBefore)
    expect((await owner.client.get(`/api/decks/${deckA}/trash`)).body.views).toEqual([])
  })

  it('lets a deck stop sharing: its row becomes its own definition, and edits no longer cross', async () => {
    const deckC = await newDeck('Shared third')
    const typeC = (await owner.client.post(`/api/decks/${deckC}/type-links`, { targetTypeId: typeB })).body.id as string
    expect(typeRow(typeC).definitionId).toBe(typeA)
    // The row whose id is the definition's stops sharing: the two others stay linked to each other.
    const r = await owner.client.post(`/api/target-types/${typeA}/unlink`)
    expect(r.status, r.text).toBe(200)
    expect(typeRow(typeA).definitionId).toBe(typeA)
    expect(typeRow(typeB).definitionId).toBe(typeRow(typeC).definitionId)
    expect(typeRow(typeB).definitionId).not.toBe(typeA)
    expect((await owner.client.post(`/api/target-types/${typeA}/unlink`)).status).toBe(409)
    const viewsA = viewsOf(typeA)
    const resize = await owner.client.patch(`/api/target-types/${typeC}`, { sizeM: 40 })
    expect(resize.status, resize.text).toBe(200)
    expect([typeRow(typeA).sizeM, typeRow(typeB).sizeM, typeRow(typeC).sizeM]).toEqual([21.5, 40, 40])
    // A view uploaded to the unlinked row stays in its deck.
    await upload(deckA, typeA, 'plan', 'valid.webp', 'image/webp')
    expect(viewsOf(typeA)).toHaveLength(viewsA.length + 1)
    expect(viewsOf(typeB).some(v => v.aspect === 'plan')).toBe(false)
    // A row that is not the definition's own stops sharing too; then each row is its own definition again.
    expect((await owner.client.post(`/api/target-types/${typeC}/unlink`)).status).toBe(200)
    expect([typeRow(typeB).definitionId, typeRow(typeC).definitionId].sort()).toEqual([typeB, typeC].sort())
    expect((await owner.client.get(`/api/decks/${deckB}/builder`)).body.targetTypes.find((t: { id: string }) => t.id === typeB).sharedWith).toEqual([])
    expect(auditRows('target-type.unlink', typeC).map(a => a.actorId)).toEqual([owner.id])
  })

  it('refuses a category that a linked deck does not hold, naming that deck, and changes nothing', async () => {
    const mixed = await newDeck('Shared mixed', 'mixed')
    const typeM = (await owner.client.post(`/api/decks/${mixed}/type-links`, { targetTypeId: typeB })).body.id as string
    const before = [typeRow(typeB), typeRow(typeM)]
    const r = await owner.client.patch(`/api/target-types/${typeM}`, { category: 'vessel', features: { hull: 'Long, low' } })
    expect(r.status).toBe(409)
    expect(r.body.message).toBe(`category: "Shared user ${tag}" shares this target type and is a deck of aircraft; stop sharing it there first. Nothing was changed.`)
    expect([typeRow(typeB), typeRow(typeM)]).toEqual(before)
  })

  it('keeps another instructor out of the library and the links', async () => {
    const other = await directPerson(['instructor'], crewId)
    const theirs = (await other.client.post('/api/decks', { title: `Other library ${tag}`, category: 'aircraft' })).body.id as string
    expect((await other.client.post(`/api/decks/${theirs}/type-links`, { targetTypeId: typeB })).status).toBeOneOf([403, 404])
    expect((await other.client.post(`/api/target-types/${typeB}/unlink`)).status).toBeOneOf([403, 404])
    const library = (await other.client.get('/api/target-types/library')).body as { id: string }[]
    expect(library.map(e => e.id)).not.toContain(typeB)
  })
})
