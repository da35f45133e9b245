// Issue 14, items 2 and 3, over HTTP. Item 2 (product.md, "Offline"): a call the server receives
// more than 30 s after it was made is marked offline by the server; the lead's crew table and its
// CSV show how many calls were offline; the crew's standard says whether they count toward
// readiness (default: no). Item 3 (product.md, "check": a fixed qualification test): a check's calls
// stay out of the crew table, the person page and the confusions, and show on the check pages.
import { parse } from 'csv-parse/sync'
import { beforeAll, describe, expect, it } from 'vitest'
import { csvPersonId, signedIn } from '../support/client'
import type { Client } from '../support/client'
import { drillTrainee, ensureWatchFixture, readDb, writeDb } from '../support/watch-fixture'
import type { WatchFixture } from '../support/watch-fixture'
import type { CrewStats } from '../../shared/types/stats'

let fx: WatchFixture
let lead: Client
let instructor: Client

const callBody = (choiceId: string, extra: Record<string, unknown> = {}) => ({ choiceId, latencyMs: 700, framesShown: 6, frameIntervalMs: 16.7, ...extra })
const answerOf = (sightingId: string) => readDb(db => (db.prepare('SELECT answer_choice_id AS a FROM sightings WHERE id = ?').get(sightingId) as { a: string }).a)
const rowOf = async (userId: string) => {
  const r = await lead.get<CrewStats>(`/api/crews/${fx.crewId}/stats?deckId=${fx.deckId}&days=30`)
  expect(r.status, r.text).toBe(200)
  return r.body.rows.find(x => x.userId === userId)!
}

beforeAll(async () => {
  fx = await ensureWatchFixture()
  lead = await signedIn('lead@glint.demo')
  instructor = await signedIn('instructor@glint.demo')
})

describe('calls graded offline (issue 14, item 2)', () => {
  it('are marked by the server from the call\'s own time, and counted in the crew table and its CSV', async () => {
    const t = await drillTrainee(fx.crewId)
    const w = await t.client.post('/api/watches', { deckId: fx.deckId })
    expect(w.status, w.text).toBe(200)
    const [a, b, c] = w.body.sightings as { id: string }[]
    // Issued an hour ago, so the calls' own times stand (they are clamped to [issuedAt, now]).
    writeDb(db => db.prepare('UPDATE sightings SET issued_at = ? WHERE watch_id = ?').run(Date.now() - 3_600_000, w.body.id))
    // Made five minutes before it arrived: offline. Ten seconds before: online (the limit is 30 s).
    expect((await t.client.post(`/api/sightings/${a!.id}/call`, callBody(answerOf(a!.id), { calledAt: Date.now() - 300_000 }))).status).toBe(200)
    expect((await t.client.post(`/api/sightings/${b!.id}/call`, callBody(answerOf(b!.id), { calledAt: Date.now() - 10_000 }))).status).toBe(200)
    expect((await t.client.post(`/api/sightings/${c!.id}/call`, callBody(answerOf(c!.id)))).status).toBe(200)
    const row = await rowOf(t.id)
    expect(row.calls).toBe(3)
    expect(row.offlineCalls).toBe(1)
    const csv = await lead.get(`/api/crews/${fx.crewId}/stats.csv?deckId=${fx.deckId}&days=30`)
    expect(csv.status).toBe(200)
    const rec = (parse(csv.text, { columns: true, bom: true }) as Record<string, string>[]).find(x => csvPersonId(x) === t.id)!
    expect(rec['Calls graded offline']).toBe('1')
    expect(rec.Calls).toBe('3')
  })

  it('count toward readiness only when the crew\'s standard says so (default: no), set by its lead', async () => {
    const crew = async () => (await lead.get(`/api/crews/${fx.crewId}`)).body.standard
    expect((await crew()).offlineCounts).toBe(false)
    const stats = await lead.get<CrewStats>(`/api/crews/${fx.crewId}/stats`)
    expect(stats.body.standard.offlineCounts).toBe(false)
    const bad = await lead.patch(`/api/crews/${fx.crewId}`, { offlineCounts: 'yes' })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/^offlineCounts: /)
    const t = await drillTrainee(fx.crewId)
    expect((await t.client.patch(`/api/crews/${fx.crewId}`, { offlineCounts: true })).status).toBe(403)
    expect((await crew()).offlineCounts).toBe(false)
    try {
      expect((await lead.patch(`/api/crews/${fx.crewId}`, { offlineCounts: true })).status).toBe(200)
      expect((await crew()).offlineCounts).toBe(true)
    }
    finally {
      expect((await lead.patch(`/api/crews/${fx.crewId}`, { offlineCounts: false })).status).toBe(200)
    }
    expect((await crew()).offlineCounts).toBe(false)
  })
})

describe('a check\'s calls (issue 14, item 3)', () => {
  it('stay out of the crew table, the person page and the confusions, and show on the check result', async () => {
    const t = await drillTrainee(fx.crewId)
    const defined = await instructor.post('/api/checks', {
      deckId: fx.deckId, title: 'Check calls apart (test)', sightingCount: 5, exposureMs: 500, conditions: ['sunlit'], aspects: ['beam'], passMark: 0.6,
    })
    expect(defined.status, defined.text).toBe(201)
    const crewConfusions = async () => (await lead.get(`/api/crews/${fx.crewId}/confusions?deckId=${fx.deckId}&days=30`)).body
    const deckConfusions = async () => (await instructor.get(`/api/decks/${fx.deckId}/confusions?days=30`)).body
    const before = { crew: await crewConfusions(), deck: await deckConfusions() }
    const issued = await t.client.post(`/api/checks/${defined.body.id}/attempts`)
    expect(issued.status, issued.text).toBe(201)
    // Every sighting called wrong: five confusions, if they were counted.
    for (const s of issued.body.sightings as { id: string, choices: { id: string }[] }[]) {
      const answer = answerOf(s.id)
      const r = await t.client.post(`/api/sightings/${s.id}/call`, callBody(s.choices.find(x => x.id !== answer)!.id))
      expect(r.status, r.text).toBe(200)
    }
    const row = await rowOf(t.id)
    expect({ calls: row.calls, offlineCalls: row.offlineCalls, accuracy: row.accuracy, lastWatchAt: row.lastWatchAt }).toEqual({ calls: 0, offlineCalls: 0, accuracy: null, lastWatchAt: null })
    expect(row.missing[0]).toMatch(/^no calls in the last \d+ days$/)
    const person = (await lead.get(`/api/people/${t.id}?days=30`)).body
    expect(person.summary.calls).toBe(0)
    expect(person.confusions).toEqual([])
    expect(person.byAspect).toEqual([])
    expect(await crewConfusions()).toEqual(before.crew)
    expect((await deckConfusions()).calls).toBe(before.deck.calls)
    // The check page shows them: five calls, none right.
    const result = await lead.get(`/api/checks/attempts/${issued.body.attemptId}`)
    expect(result.status).toBe(200)
    expect(result.body.right).toBe(0)
    expect(result.body.items.filter((i: { calledName: string | null }) => i.calledName !== null)).toHaveLength(5)
  })
})
