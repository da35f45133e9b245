// Scan drills over HTTP: drill CRUD and its checks, passes scored by the server, who may read them.
import { beforeAll, describe, expect, it } from 'vitest'
import { median } from 'simple-statistics'
import { PRACTICE_SCAN_SETTINGS } from '../../shared/schemas/scan'
import { crewIdOf, freshPerson, signedIn } from '../support/client'
import type { Client } from '../support/client'
import { seedWith, sendPass, startPass, track } from '../support/scan-pass'

const settings = {
  startBearing: 0, endBearing: 30, mode: 'surface', field: 'binoculars', stepDeg: 5, dwellMs: 1000,
  contactsPerMinute: 2, conditions: ['sunlit'], categories: ['aircraft', 'vessel'], lengthS: 30,
}

// The practice sector cut to 30 s, as /scan?length=30 starts it.
const practice = { ...PRACTICE_SCAN_SETTINGS, lengthS: 30 }

describe('scan drills', () => {
  let instructor: Client
  let crewA = ''
  let crewB = ''
  let drillId = ''

  beforeAll(async () => {
    instructor = await signedIn('instructor@glint.demo')
    crewA = await crewIdOf('lead@glint.demo')
    crewB = await crewIdOf('lead2@glint.demo')
  })

  it('an instructor creates, edits and assigns a drill; a trainee of the crew then sees it', async () => {
    const r = await instructor.post('/api/scan/drills', { title: 'Test arc north', settings })
    expect(r.status).toBe(201)
    drillId = r.body.id
    expect(r.body.settings).toEqual(settings)
    expect(r.body.crewIds).toEqual([])

    const trainee = await signedIn('trainee@glint.demo')
    expect((await trainee.get('/api/scan/drills')).body.some((d: any) => d.id === drillId)).toBe(false)

    const p = await instructor.patch(`/api/scan/drills/${drillId}`, { title: 'Test arc north, 30 s', settings: { ...settings, stepDeg: 4 } })
    expect(p.status).toBe(200)
    expect(p.body.title).toBe('Test arc north, 30 s')
    expect(p.body.settings.stepDeg).toBe(4)

    const a = await instructor.req('PUT', `/api/scan/drills/${drillId}/crews`, { crewIds: [crewA] })
    expect(a.status).toBe(200)
    expect(a.body.crewIds).toEqual([crewA])
    const seen = (await trainee.get('/api/scan/drills')).body.find((d: any) => d.id === drillId)
    expect(seen?.title).toBe('Test arc north, 30 s')
    // trainee5 is in the other crew.
    const other = await signedIn('trainee5@glint.demo')
    expect((await other.get('/api/scan/drills')).body.some((d: any) => d.id === drillId)).toBe(false)
  })

  it('refuses bad settings with a 400 and a sentence', async () => {
    for (const [patch, field] of [
      [{ stepDeg: 0 }, 'stepDeg'], [{ stepDeg: 25 }, 'stepDeg'], [{ dwellMs: 100 }, 'dwellMs'], [{ lengthS: 5 }, 'lengthS'],
      [{ lengthS: 700 }, 'lengthS'], [{ contactsPerMinute: 20 }, 'contactsPerMinute'], [{ conditions: ['moonlit'] }, 'conditions'],
      [{ conditions: [] }, 'conditions'], [{ categories: [] }, 'categories'], [{ field: 'telescope' }, 'field'], [{ mode: 'air' }, 'mode'],
      [{ startBearing: 400 }, 'startBearing'],
    ] as const) {
      const r = await instructor.post('/api/scan/drills', { title: 'Bad', settings: { ...settings, ...patch } })
      expect(r.status, JSON.stringify(patch)).toBe(400)
      expect(r.body.message).toContain(field)
    }
    expect((await instructor.post('/api/scan/drills', { title: '', settings })).status).toBe(400)
    expect((await instructor.patch(`/api/scan/drills/${drillId}`, { settings: { ...settings, dwellMs: 5000 } })).status).toBe(400)
    expect((await instructor.patch('/api/scan/drills/AAAAAAAAAAAAAAAAAAAAAA', { title: 'Nowhere' })).status).toBe(404)
  })

  it('a trainee and a lead cannot create or change drills (403)', async () => {
    for (const email of ['trainee@glint.demo', 'lead@glint.demo']) {
      const c = await signedIn(email)
      expect((await c.post('/api/scan/drills', { title: 'Mine', settings })).status).toBe(403)
      expect((await c.patch(`/api/scan/drills/${drillId}`, { title: 'Mine' })).status).toBe(403)
      expect((await c.req('PUT', `/api/scan/drills/${drillId}/crews`, { crewIds: [crewA] })).status).toBe(403)
    }
  })

  it('an instructor assigns only to own crews and changes only own drills', async () => {
    const other = await freshPerson('instructor', crewA)
    // The fresh instructor is in crew A only: crew B is not theirs.
    const mine = await other.client.post('/api/scan/drills', { title: 'Fresh drill', settings })
    expect(mine.status).toBe(201)
    expect((await other.client.req('PUT', `/api/scan/drills/${mine.body.id}/crews`, { crewIds: [crewB] })).status).toBe(403)
    expect((await other.client.req('PUT', `/api/scan/drills/${mine.body.id}/crews`, { crewIds: [crewA] })).status).toBe(200)
    // The demo instructor's drill is assigned to crew A, so the fresh one sees it but may not change it.
    expect((await other.client.patch(`/api/scan/drills/${drillId}`, { title: 'Taken over' })).status).toBe(403)
    const admin = await signedIn('admin@glint.demo')
    const all = await admin.get('/api/scan/drills')
    expect(all.body.some((d: any) => d.id === mine.body.id) && all.body.some((d: any) => d.id === drillId)).toBe(true)
  })
})

describe('scan passes', () => {
  let drillId = ''
  let crewA = ''
  let crewB = ''
  beforeAll(async () => {
    crewA = await crewIdOf('lead@glint.demo')
    crewB = await crewIdOf('lead2@glint.demo')
    const instructor = await signedIn('instructor@glint.demo')
    const r = await instructor.post('/api/scan/drills', { title: 'Pass test arc', settings })
    drillId = r.body.id
    await instructor.req('PUT', `/api/scan/drills/${drillId}/crews`, { crewIds: [crewA, crewB] })
  })

  it('scores a hand-made track on the server: one 9° step with a 7° field leaves a gap (common practice, no source); a sent score is ignored', async () => {
    const t = await freshPerson('trainee', crewA)
    const start = await startPass(t.client, { drillId })
    expect(start.settings).toEqual(settings)
    // 3.5 → 12.5 is a 9° step: fields [0, 7] and [9, 16] leave 7°–9° unseen; then 5° steps.
    const r = await sendPass(t.client, start, track([3.5, 12.5, 17.5, 22.5, 27.5]), [], {
      score: { coverage: 1, gaps: [], contactsFound: 9 },
      coverage: 1,
    })
    expect(r.status).toBe(201)
    const s = r.body.score
    expect(s.gaps).toHaveLength(1)
    expect(s.gaps[0].fromBearing).toBeCloseTo(7, 6)
    expect(s.gaps[0].toBearing).toBeCloseTo(9, 6)
    expect(s.coverage).toBeCloseTo(1 - 2 / 30, 6)
    expect(r.body.coverage).toBeCloseTo(1 - 2 / 30, 6)
    expect(s.sweeping).toBe(false)
    expect(s.pauseCount).toBe(5)
    expect(s.contactsFound).toBe(0)

    const mine = await t.client.get('/api/scan/passes')
    expect(mine.status).toBe(200)
    expect(mine.body).toHaveLength(1)
    expect(mine.body[0].id).toBe(r.body.id)
  })

  it('counts a contact reported inside a pause whose field held it (7° field, common practice, no source)', async () => {
    const t = await freshPerson('trainee', crewA)
    // A practice scene whose contact shows by 1.5 s within 2° of 13.5° (the third pause of the track).
    const { seed, contact } = seedWith(practice, c => c.shownAtMs <= 1500 && Math.abs(c.bearing - 13.5) < 2 && c.positionAngle < 2)
    const start = await startPass(t.client, { drillId: null, lengthS: 30, seed })
    expect(start.seed).toBe(seed)
    // The field holds 13.5° from 2 s to 3 s; the tap at 2.5 s.
    const r = await sendPass(t.client, start, track([3.5, 8.5, 13.5, 18.5]), [
      { contactId: contact.id, tapAtMs: 2500, reportedAtMs: 5000, category: contact.category, bearing: 16, positionAngle: 0, closing: 'closing' },
    ])
    expect(r.status).toBe(201)
    expect(r.body.contactsFound).toBe(1)
    expect(r.body.score.medianDetectMs).toBe(2500 - contact.shownAtMs)
    expect(r.body.score.medianReportMs).toBe(2500)
    expect(r.body.score.medianBearingErrorDeg).toBeCloseTo(Math.abs(16 - contact.bearing), 9)
  })

  it('scores a pass that moves without pausing as sweeping', async () => {
    const t = await freshPerson('trainee', crewA)
    const samples = Array.from({ length: 61 }, (_, k) => ({ tMs: k * 50, bearing: k * 0.5, positionAngle: -0.7 }))
    const r = await sendPass(t.client, await startPass(t.client, { drillId }), samples)
    expect(r.status).toBe(201)
    expect(r.body.score.sweeping).toBe(true)
    expect(r.body.score.coverage).toBe(0)
  })

  it('refuses a malformed pass with a 400', async () => {
    const c = await signedIn('trainee2@glint.demo')
    const start = await startPass(c, { drillId })
    const base = { startId: start.id, samples: track([3.5, 8.5]), reports: [] }
    expect((await c.post('/api/scan/passes', { ...base, samples: [] })).status).toBe(400)
    // Past the sample bound: refused by the schema (400), or earlier by the body cap (413).
    const tooMany = await c.post('/api/scan/passes', { ...base, samples: Array.from({ length: 15_026 }, (_, k) => ({ tMs: k, bearing: 1, positionAngle: 0 })) })
    expect([400, 413]).toContain(tooMany.status)
    expect((await c.post('/api/scan/passes', { ...base, samples: [{ tMs: 0, bearing: 500, positionAngle: 0 }, { tMs: 1, bearing: 1, positionAngle: 0 }] })).status).toBe(400)
    // A pass of 30 s cannot run for 10 minutes.
    expect((await c.post('/api/scan/passes', { ...base, samples: [{ tMs: 0, bearing: 1, positionAngle: 0 }, { tMs: 600_000, bearing: 1, positionAngle: 0 }] })).status).toBe(400)
    expect((await c.post('/api/scan/passes', { ...base, reports: [{ contactId: null, tapAtMs: 10, reportedAtMs: 5, category: 'vessel', bearing: 1, positionAngle: 0, closing: 'closing' }] })).status).toBe(400)
    const noDrill = await c.post('/api/scan/passes/start', { drillId: 'AAAAAAAAAAAAAAAAAAAAAA' })
    expect(noDrill.status).toBe(404)
    expect(noDrill.body.message).toMatch(/No such scan drill/)
  })

  it('lets the own lead read the passes, and refuses another crew\'s lead and trainees (403)', async () => {
    const t = await freshPerson('trainee', crewA)
    expect((await sendPass(t.client, await startPass(t.client, { drillId }), track([3.5, 8.5, 13.5]))).status).toBe(201)
    const lead = await signedIn('lead@glint.demo')
    const own = await lead.get(`/api/scan/passes?userId=${t.id}`)
    expect(own.status).toBe(200)
    expect(own.body).toHaveLength(1)
    const lead2 = await signedIn('lead2@glint.demo')
    expect((await lead2.get(`/api/scan/passes?userId=${t.id}`)).status).toBe(403)
    const trainee = await signedIn('trainee2@glint.demo')
    expect((await trainee.get(`/api/scan/passes?userId=${t.id}`)).status).toBe(403)
    expect((await (await signedIn('admin@glint.demo')).get(`/api/scan/passes?userId=${t.id}`)).status).toBe(200)
  })

  it('GET /api/crews/[id]/scan matches the stored passes (medians by simple-statistics)', async () => {
    const t = await freshPerson('trainee', crewB)
    const { seed, contact } = seedWith(practice, c => c.shownAtMs <= 1500 && Math.abs(c.bearing - 13.5) < 2 && c.positionAngle < 2)
    const passes = [
      { body: { drillId: null, lengthS: 30, seed }, samples: track([3.5, 8.5, 13.5, 18.5, 23.5, 28.5]), reports: [{ contactId: contact.id, tapAtMs: 2700, reportedAtMs: 4000, category: contact.category, bearing: 14, positionAngle: 0, closing: 'unknown' as const }] },
      { body: { drillId }, samples: track([3.5, 12.5, 17.5, 22.5, 27.5]), reports: [] },
      { body: { drillId }, samples: Array.from({ length: 61 }, (_, k) => ({ tMs: k * 50, bearing: k * 0.5, positionAngle: -0.7 })), reports: [] },
    ]
    // Started together, sent in order once each has run its time.
    const starts = await Promise.all(passes.map(p => startPass(t.client, p.body)))
    for (const [i, p] of passes.entries()) {
      expect((await sendPass(t.client, starts[i]!, p.samples, p.reports)).status).toBe(201)
    }
    const stored = (await t.client.get('/api/scan/passes')).body as any[]
    expect(stored).toHaveLength(3)

    const lead2 = await signedIn('lead2@glint.demo')
    const r = await lead2.get(`/api/crews/${crewB}/scan`)
    expect(r.status).toBe(200)
    const row = r.body.find((x: any) => x.userId === t.id)
    expect(row.passes).toBe(3)
    expect(row.medianCoverage).toBeCloseTo(median(stored.map(p => p.coverage)), 9)
    expect(row.medianGaps).toBe(median(stored.map(p => p.score.gaps.length)))
    expect(row.sweepingShare).toBeCloseTo(stored.filter(p => p.score.sweeping).length / 3, 9)
    const shown = stored.reduce((n, p) => n + p.contactsShown, 0)
    expect(row.contactsFoundShare).toBeCloseTo(stored.reduce((n, p) => n + p.contactsFound, 0) / shown, 9)
    expect(row.medianDetectMs).toBe(2700 - contact.shownAtMs)
    // The newest pass is the sweep.
    expect(row.latest.coverage).toBe(stored[0].coverage)
    expect(row.latest.sweeping).toBe(true)

    expect((await (await signedIn('lead@glint.demo')).get(`/api/crews/${crewB}/scan`)).status).toBe(403)
    expect((await (await signedIn('trainee5@glint.demo')).get(`/api/crews/${crewB}/scan`)).status).toBe(403)
  })
})
