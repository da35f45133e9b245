// The server's side of the phone's offline sync (DEVELOPERS.md, "Phone and offline"): a resend
// after a lost response counts once, the first call to arrive stands, calls keep their own time,
// the 36 h rule, voided sightings. Rules of the project's design (api.md), checked over HTTP.
import { describe, expect, it } from 'vitest'
import { crewIdOf, freshPerson } from '../support/client'
import { readDb, writeDb } from '../support/watch-fixture'
import type { CallResult, IssuedWatch, WatchPack } from '../../shared/types/watch'

async function openWatch() {
  const p = await freshPerson('trainee', await crewIdOf('trainee@glint.demo'))
  const w = await p.client.post<IssuedWatch>('/api/watches', {})
  expect(w.status).toBe(200)
  expect(w.body.sightings.length).toBeGreaterThanOrEqual(4)
  const pack = await p.client.get<WatchPack>(`/api/watches/${w.body.id}/pack`)
  return { ...p, watch: w.body, pack: pack.body }
}

const callsOf = (sightingId: string) => readDb(db => db.prepare('SELECT called_at AS calledAt, choice_id AS choiceId FROM calls WHERE sighting_id = ?').all(sightingId) as { calledAt: number, choiceId: string }[])

describe('offline sync rules', () => {
  it('a resend after a lost response gets the first answer byte for byte and counts once; the call keeps its own time', async () => {
    const { client, pack } = await openWatch()
    const s = pack.sightings[0]!
    // Issued an hour ago, called (offline) five minutes ago: the call's own time is inside [issuedAt, now].
    writeDb(db => db.prepare('UPDATE sightings SET issued_at = ? WHERE id = ?').run(Date.now() - 3_600_000, s.id))
    const calledAt = Date.now() - 300_000
    const body = { choiceId: s.answer.choiceId, latencyMs: 700, framesShown: 30, frameIntervalMs: 16.7, calledAt }
    const first = await client.post(`/api/sightings/${s.id}/call`, body)
    const again = await client.post(`/api/sightings/${s.id}/call`, body)
    expect(first.status).toBe(200)
    expect(again.status).toBe(200)
    expect(again.text).toBe(first.text)
    const rows = callsOf(s.id)
    expect(rows).toHaveLength(1)
    expect(rows[0]!.calledAt).toBe(calledAt)
  })

  it('a sighting answered on two devices: the first call to reach the server stands, the other gets it back', async () => {
    const { client, pack } = await openWatch()
    const s = pack.sightings[1]!
    const wrong = s.choices.find(c => c.id !== s.answer.choiceId)!
    const a = await client.post<CallResult>(`/api/sightings/${s.id}/call`, { choiceId: wrong.id, latencyMs: 900, framesShown: 30, frameIntervalMs: 16.7 })
    const b = await client.post<CallResult>(`/api/sightings/${s.id}/call`, { choiceId: s.answer.choiceId, latencyMs: 500, framesShown: 30, frameIntervalMs: 16.7 })
    expect(b.status).toBe(200)
    expect(b.body.calledChoiceId).toBe(wrong.id)
    expect(b.body.grade).toBe(a.body.grade)
    expect(callsOf(s.id).map(c => c.choiceId)).toEqual([wrong.id])
  })

  it('a call more than 36 h after issue is refused with 409 and a reason, and changes nothing', async () => {
    const { client, pack } = await openWatch()
    const s = pack.sightings[2]!
    writeDb(db => db.prepare('UPDATE sightings SET issued_at = ? WHERE id = ?').run(Date.now() - 37 * 3_600_000, s.id))
    const r = await client.post(`/api/sightings/${s.id}/call`, { choiceId: s.answer.choiceId, latencyMs: 600, framesShown: 30, frameIntervalMs: 16.7 })
    expect(r.status).toBe(409)
    expect(r.body.message).toMatch(/36 hours/)
    expect(callsOf(s.id)).toHaveLength(0)
  })

  it('a voided sighting refuses its call (409 voided) and comes back later in the same watch as a copy', async () => {
    const { client, pack, watch } = await openWatch()
    const s = pack.sightings[3]!
    const v = await client.post<{ sightingId: string, voidedAt: number, appended: { id: string, choices: { id: string }[] }[] }>(`/api/sightings/${s.id}/void`)
    expect(v.status).toBe(200)
    expect(v.body.appended).toHaveLength(1)
    const copy = v.body.appended[0]!
    expect(copy.id).not.toBe(s.id)
    // Fresh choice ids on the copy.
    expect(copy.choices.some(c => s.choices.some(o => o.id === c.id))).toBe(false)
    // A resend of the void returns the same copy.
    const again = await client.post<{ appended: { id: string }[] }>(`/api/sightings/${s.id}/void`)
    expect(again.body.appended.map(x => x.id)).toEqual([copy.id])

    const r = await client.post(`/api/sightings/${s.id}/call`, { choiceId: s.answer.choiceId, latencyMs: 600, framesShown: 30, frameIntervalMs: 16.7 })
    expect(r.status).toBe(409)
    expect(r.body.message).toMatch(/voided/)
    expect(callsOf(s.id)).toHaveLength(0)

    // The same watch is issued again with the copy uncalled and the voided one counted as done.
    const re = await client.post<IssuedWatch>('/api/watches', {})
    expect(re.body.id).toBe(watch.id)
    expect(re.body.sightings.find(x => x.id === s.id)?.called).toBe(true)
    expect(re.body.sightings.find(x => x.id === copy.id)?.called).toBe(false)

    // A called sighting cannot be voided.
    const called = pack.sightings[0]!
    await client.post(`/api/sightings/${called.id}/call`, { choiceId: called.answer.choiceId, latencyMs: 600, framesShown: 30, frameIntervalMs: 16.7 })
    expect((await client.post(`/api/sightings/${called.id}/void`)).status).toBe(409)
  })
})
