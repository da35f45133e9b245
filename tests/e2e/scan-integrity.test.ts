// Scan passes cannot be made up (issue 14, item 4): the server starts each pass, rebuilds its
// scene from the seed it issued, scores only what the samples show, refuses what the drill cannot
// produce, and limits how many passes and tap baselines a person may send.
import { beforeAll, describe, expect, it } from 'vitest'
import { PRACTICE_SCAN_SETTINGS } from '../../shared/schemas/scan'
import { placeScanContacts } from '../../shared/utils/scan-scene'
import { crewIdOf, freshPerson, signedIn } from '../support/client'
import type { Client } from '../support/client'
import { drivePattern, seedWith, sendPass, startPass, track } from '../support/scan-pass'
import type { Report, Sample } from '../support/scan-pass'

// A drill like the one of the report: 10 contacts in a minute over a 30° sector.
const settings = {
  startBearing: 0, endBearing: 30, mode: 'surface', field: 'binoculars', stepDeg: 5, dwellMs: 1000,
  contactsPerMinute: 10, conditions: ['sunlit'], categories: ['aircraft', 'vessel'], lengthS: 60,
}
const practice = { ...PRACTICE_SCAN_SETTINGS, lengthS: 30 }

// Angular distance on the flat view of a field (small angles), written out here: bearing
// differences shrink by cos(position angle) away from the horizon (spherical geometry).
function apart(a: { bearing: number, positionAngle: number }, b: { bearing: number, positionAngle: number }) {
  const d = ((b.bearing - a.bearing + 540) % 360) - 180
  const cos = Math.cos(((a.positionAngle + b.positionAngle) / 2) * Math.PI / 180)
  return Math.hypot(d * cos, b.positionAngle - a.positionAngle)
}

let drillId = ''
let crewA = ''
beforeAll(async () => {
  crewA = await crewIdOf('lead@glint.demo')
  const instructor = await signedIn('instructor@glint.demo')
  drillId = (await instructor.post('/api/scan/drills', { title: 'Integrity arc', settings })).body.id
  await instructor.req('PUT', `/api/scan/drills/${drillId}/crews`, { crewIds: [crewA] })
})

describe('a made-up scan pass', () => {
  let t: { client: Client, id: string }
  beforeAll(async () => {
    t = await freshPerson('trainee', crewA)
  })

  it('the forged pass of the report (coverage 1, 10 of 10 contacts, 150 ms) is refused: the server never issued its scene', async () => {
    const contacts = Array.from({ length: 10 }, (_, k) => ({
      id: `c${k + 1}`, bearing: 3.5, positionAngle: 0, shownAtMs: 1000 + k * 2000, goneAtMs: 9000 + k * 2000,
      category: 'vessel', rangeM: 12_000, sizeM: 20, condition: 'sunlit',
    }))
    const r = await t.client.post('/api/scan/passes', {
      drillId, seed: 7, settings,
      samples: [{ tMs: 0, bearing: 3.5, positionAngle: -0.7 }, { tMs: 30_000, bearing: 3.5, positionAngle: -0.7 }],
      contacts,
      reports: contacts.map(c => ({ contactId: c.id, tapAtMs: c.shownAtMs + 150, reportedAtMs: c.shownAtMs + 900, category: 'vessel', bearing: 3.5, positionAngle: 0, closing: 'closing' })),
      score: { coverage: 1, contactsFound: 10, medianDetectMs: 150 },
    })
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/Start the pass first/)
    expect((await t.client.get('/api/scan/passes')).body).toEqual([])
  })

  it('on a real start, the same forgery is scored by what its samples show, against the scene of the issued seed', async () => {
    const start = await startPass(t.client, { drillId, lengthS: 30 })
    const scene = placeScanContacts(start.settings, start.seed)
    // The field held on 3.5° for 3 s; a report of every contact of the scene, 150 ms after it shows
    // when that falls in those 3 s, else at the end, one after another.
    const samples: Sample[] = [{ tMs: 0, bearing: 3.5, positionAngle: -0.7 }, { tMs: 1500, bearing: 3.5, positionAngle: -0.7 }, { tMs: 3000, bearing: 3.5, positionAngle: -0.7 }]
    let at = 0
    const reports: Report[] = scene.map((c) => {
      const tap = Math.max(at, Math.min(c.shownAtMs + 150, 2900))
      at = tap + 10
      return { contactId: c.id, tapAtMs: tap, reportedAtMs: tap + 10, category: c.category, bearing: c.bearing, positionAngle: c.positionAngle, closing: 'closing' }
    })
    const forged = scene.map(c => ({ ...c, bearing: 3.5, positionAngle: 0, shownAtMs: 100 }))
    const r = await sendPass(t.client, start, samples, reports, { contacts: forged, score: { coverage: 1, contactsFound: scene.length } })
    expect(r.status).toBe(201)
    // A 7° field held on 3.5° sees 0°–7° of the 30° sector (common practice, no source).
    expect(r.body.coverage).toBeCloseTo(7 / 30, 9)
    // Found: the contacts that showed at least 100 ms before their tap (responses under 100 ms are
    // anticipations, Whelan 2008) and lay inside the field (3.5° + 0.5° edge), here computed apart.
    const expected = scene.filter((c, i) => reports[i]!.tapAtMs >= c.shownAtMs + 100 && reports[i]!.tapAtMs <= c.goneAtMs
      && apart({ bearing: 3.5, positionAngle: -0.7 }, c) <= 4)
    expect(r.body.contactsFound).toBe(expected.length)
    expect(r.body.contactsFound).toBeLessThan(scene.length)
    expect(r.body.contactsShown).toBe(scene.filter(c => c.shownAtMs <= 3000).length)
  })

  it('refuses what the drill cannot produce with a 400 that names it, and stores nothing', async () => {
    const start = await startPass(t.client, { drillId, lengthS: 30 })
    const scene = placeScanContacts(start.settings, start.seed)
    const send = (samples: Sample[], reports: Report[] = []) => t.client.post('/api/scan/passes', { startId: start.id, samples, reports })
    const hold = (tMs: number, bearing = 3.5, positionAngle = -0.7) => ({ tMs, bearing, positionAngle })
    const tap = (contactId: string | null, tapAtMs: number, reportedAtMs: number): Report =>
      ({ contactId, tapAtMs, reportedAtMs, category: 'vessel', bearing: 3.5, positionAngle: 0, closing: 'unknown' })
    const cases: [string, Promise<{ status: number, body: any }>, RegExp][] = [
      ['times out of order', send([hold(0), hold(900), hold(400), hold(1200)]), /times go backwards/],
      ['a time past the pass length', send([hold(0), hold(31_500)]), /past the pass's length of 30 s/],
      // 100° in 40 ms: the page moves the field by steps of at most 20° every 125 ms.
      ['a turn no person can make', send([hold(0), hold(500), hold(510, 28.5), hold(520), hold(530, 28.5), hold(540)]), /turns 100° within 250 ms/],
      // 11.5° every 25 ms, 460° a second.
      ['a fast shake kept up', send(Array.from({ length: 40 }, (_, k) => hold(k * 25, k % 2 ? 15 : 3.5))), /no lookout turns faster than 360° a second/],
      ['a pause outside the sector', send([hold(0), hold(1000, 200), hold(2000, 200)]), /outside the drill's sector 000°–030°/],
      ['a field far above the horizon', send([hold(0), hold(1000, 3.5, 40)]), /position angle/],
      ['a report of a contact not in the scene', send([hold(0), hold(1000)], [tap(`c${scene.length + 1}`, 500, 700)]), /not a contact of this pass's scene/],
      ['a tap after the last sample', send([hold(0), hold(1000)], [tap(null, 1500, 1600)]), /after the last sample/],
      ['a tap while the report before was still open', send([hold(0), hold(3000)], [tap(null, 500, 1500), tap(null, 1000, 1200)]), /before report 1 was sent/],
      ['more samples than a phone takes', send(Array.from({ length: 30 * 25 + 26 }, (_, k) => hold(k * 2))), /holds at most 775 samples/],
      ['a pass claiming more time than since its start', send([hold(0), hold(25_000)]), /started only \d+\.\d s ago/],
    ]
    for (const [what, pending, message] of cases) {
      const r = await pending
      expect(r.status, what).toBe(400)
      expect(r.body.message, what).toMatch(message)
    }
    // A seed the server never issued, another person's start, a chosen seed for an assigned drill.
    const other = await signedIn('trainee@glint.demo')
    const stolen = await other.post('/api/scan/passes', { startId: start.id, samples: [hold(0), hold(1000)], reports: [] })
    expect(stolen.status).toBe(400)
    expect(stolen.body.message).toMatch(/never started for you/)
    expect((await t.client.post('/api/scan/passes', { startId: 'AAAAAAAAAAAAAAAAAAAAAA', samples: [hold(0), hold(1000)], reports: [] })).body.message).toMatch(/never started for you/)
    const chosen = await t.client.post('/api/scan/passes/start', { drillId, seed: 7 })
    expect(chosen.status).toBe(400)
    expect(chosen.body.message).toMatch(/practice sector only/)
    expect((await t.client.get('/api/scan/passes')).body).toHaveLength(1)
  })

  it('a pass is stored once: sending the same start again answers 409', async () => {
    const start = await startPass(t.client, { drillId })
    const samples = track([3.5, 8.5])
    expect((await sendPass(t.client, start, samples)).status).toBe(201)
    const again = await t.client.post('/api/scan/passes', { startId: start.id, samples, reports: [] })
    expect(again.status).toBe(409)
    expect(again.body.message).toMatch(/already sent/)
  })
})

describe('a real pass, driven by the planned scan pattern', () => {
  it('scores as before: the plan\'s coverage and pauses, and the contact its pause held (7° field, 5° steps, common practice, no source)', async () => {
    const t = await freshPerson('trainee', crewA)
    const { samples, pauses } = drivePattern(practice)
    // A practice scene whose contact shows in the first 2 s, low on the horizon band, past the first pauses.
    const { seed, contact } = seedWith(practice, c => c.shownAtMs <= 2000 && c.positionAngle < 1.5 && c.bearing > 15)
    // The first pause whose field (3.5° wide each side, 0.5° edge) holds the contact after it shows.
    const pause = pauses.find(p => p.toMs >= contact.shownAtMs + 400 && apart(p, contact) <= 3.5)!
    const tapAtMs = Math.max(pause.fromMs, contact.shownAtMs + 100) + 200
    const start = await startPass(t.client, { drillId: null, lengthS: 30, seed })
    const r = await sendPass(t.client, start, samples, [
      { contactId: contact.id, tapAtMs, reportedAtMs: tapAtMs + 10, category: contact.category, bearing: pause.bearing, positionAngle: 0, closing: 'unknown' },
    ])
    expect(r.status).toBe(201)
    // 0°–90° with a 7° field in 5° steps: 18 pauses, ceil((90 − 7) / 5) + 1, cover the whole sector.
    expect(r.body.score.pauseCount).toBe(18)
    expect(r.body.coverage).toBe(1)
    expect(r.body.score.sweeping).toBe(false)
    expect(r.body.contactsFound).toBe(1)
    expect(r.body.score.medianDetectMs).toBe(tapAtMs - contact.shownAtMs)
  }, 60_000)
})

describe('rate limits on drill results (60 a person in 10 minutes, design value)', () => {
  it('answers 429 with a sentence to the 61st scan pass request, starts and sends alike', async () => {
    const t = await freshPerson('trainee', crewA)
    const statuses: number[] = []
    // One start, then sends of a pass the server refuses: each request counts.
    const start = await t.client.post('/api/scan/passes/start', { drillId: null, lengthS: 30 })
    statuses.push(start.status)
    for (let i = 0; i < 29; i++) statuses.push((await t.client.post('/api/scan/passes/start', { drillId: null })).status)
    for (let i = 0; i < 30; i++) {
      statuses.push((await t.client.post('/api/scan/passes', { startId: start.body.id, samples: [{ tMs: 5, bearing: 3.5, positionAngle: 0 }, { tMs: 1, bearing: 3.5, positionAngle: 0 }], reports: [] })).status)
    }
    expect(statuses.slice(0, 30).every(s => s === 201)).toBe(true)
    expect(statuses.slice(30).every(s => s === 400)).toBe(true)
    const r = await t.client.post('/api/scan/passes/start', { drillId: null })
    expect(r.status).toBe(429)
    expect(r.body.message).toMatch(/^Too many scan passes\. Try again in \d+ (seconds|minutes)\.$/)
    expect((await t.client.post('/api/scan/passes', { startId: start.body.id, samples: track([3.5]), reports: [] })).status).toBe(429)
  })

  it('answers 429 with a sentence to the 61st tap baseline, and keeps the 60 before it', async () => {
    const t = await freshPerson('trainee', crewA)
    const statuses: number[] = []
    for (let i = 0; i < 61; i++) statuses.push((await t.client.post('/api/baseline', { simpleMs: 250 + i, choiceMs: 420, trials: 20 })).status)
    expect(statuses.slice(0, 60).every(s => s === 201)).toBe(true)
    expect(statuses[60]).toBe(429)
    const r = await t.client.post('/api/baseline', { simpleMs: 250, choiceMs: 420, trials: 20 })
    expect(r.body.message).toMatch(/^Too many tap baselines\. Try again in \d+ (seconds|minutes)\.$/)
    expect((await t.client.get('/api/baseline/me')).body.baseline.simpleMs).toBe(309)
  })
})
