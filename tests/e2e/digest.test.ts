// The weekly lead digest for a known week (fixed call times, a fixed "now") and the opt-out daily
// reminder, sent through the outbox by POST /api/digests/run and by the command; each once per period.
import { execFileSync } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { resolve } from 'node:path'
import Database from 'better-sqlite3'
import { beforeAll, describe, expect, it, inject } from 'vitest'
import { signedIn } from '../support/client'
import type { Client } from '../support/client'
import { DAY, createStatsFixture, fixtureSeries, insertCalls } from '../support/stats-fixture'
import type { FixtureCall, StatsFixture } from '../support/stats-fixture'

// A Monday: the digest covers the ISO week before it, 26 February to 3 March 2024 (ISO 8601 week 2024-W09).
const NOW = '2024-03-04T07:00:00Z'
const WEEK_END = Date.UTC(2024, 2, 4)
const WEEK_START = Date.UTC(2024, 1, 26)

let fx: StatsFixture
let admin: Client
const names: Record<string, string> = {}

beforeAll(async () => {
  fx = await createStatsFixture()
  admin = await signedIn('admin@glint.demo')
  for (const [k, p] of Object.entries(fx.trainees)) names[k] = (await p.client.get('/api/auth/me')).body.name
  const lat = Array.from({ length: 20 }, (_, i) => 700 + 50 * i)
  // t90 becomes ready: 20 right calls in the ten days before the week's end, few before its start.
  insertCalls(fx.deckId, fixtureSeries(fx.trainees.t90.id, fx.typeIds, lat, {}, WEEK_END))
  // t89 slips: ready at the week's start, then 20 wrong calls during the week.
  const wrong: FixtureCall[] = Array.from({ length: 20 }, (_, i) => ({
    userId: fx.trainees.t89.id, targetTypeId: fx.typeIds[i % 3]!, calledTypeId: fx.typeIds[(i + 1) % 3]!, aspect: i % 2 ? 'beam' : 'head-on',
    condition: 'haze', correct: false, grade: 'missed', latencyMs: 900, calledAt: WEEK_START + DAY + i * 3_600_000,
  }))
  insertCalls(fx.deckId, [...fixtureSeries(fx.trainees.t89.id, fx.typeIds, lat, {}, WEEK_START), ...wrong])
  // tmed last drilled on 1 February; tslow never before the week's end.
  insertCalls(fx.deckId, [{
    userId: fx.trainees.tmed.id, targetTypeId: fx.typeIds[0]!, calledTypeId: fx.typeIds[0]!, aspect: 'beam', condition: 'haze',
    correct: true, grade: 'sure', latencyMs: 1000, calledAt: Date.UTC(2024, 1, 1, 9),
  }])
})

// The command runs for seconds; a kept-alive socket the server closed meanwhile is retried once.
async function outbox(): Promise<{ to: string, subject: string, text: string }[]> {
  try {
    return (await admin.get('/api/outbox')).body
  }
  catch {
    return (await admin.get('/api/outbox')).body
  }
}

const section = (text: string, title: string) => {
  const lines = text.split('\n')
  const i = lines.findIndex(l => l.startsWith(title))
  const out: string[] = []
  for (let j = i + 1; j < lines.length && lines[j]!.startsWith('- '); j++) out.push(lines[j]!)
  return { head: lines[i], items: out }
}

describe('weekly digest to leads', () => {
  it('names who became ready, who slipped and who has not drilled in the known week, once', async () => {
    const run = await admin.post('/api/digests/run', { kind: 'weekly', now: NOW })
    expect(run.status).toBe(200)
    expect(run.body).toMatchObject({ kind: 'weekly', period: '2024-W09' })
    expect(run.body.sent).toBeGreaterThanOrEqual(1)
    const mails = (await admin.get('/api/outbox')).body.filter((m: { to: string, subject: string }) => m.to === fx.lead.email && m.subject.startsWith('Glint weekly digest'))
    expect(mails).toHaveLength(1)
    const { subject, text } = mails[0]
    // weekEnd is exclusive: the mail names 26 February to 3 March 2024.
    expect(subject).toBe(`Glint weekly digest: ${fx.crewName}, 26 February 2024 to 3 March 2024`)
    expect(text).toContain('Ready now: 1 of 4.')
    const became = section(text, 'Became ready')
    expect(became.head).toBe('Became ready (1)')
    expect(became.items[0]).toMatch(new RegExp(`^- ${names.t90} \\(accuracy 100%\\)$`))
    const slipped = section(text, 'Slipped')
    expect(slipped.items).toHaveLength(1)
    // Now: 14 right of the good days still in the 14-day window + 20 wrong = 14/34 = 41 %; a week ago 100 %.
    expect(slipped.items[0]).toBe(`- ${names.t89} (accuracy 41%, was 100%)`)
    const idle = section(text, 'Not drilled this week')
    expect(idle.items).toEqual([`- ${names.tmed} (last call 1 February 2024)`, `- ${names.tslow} (no calls yet)`].sort((a, b) => a.localeCompare(b, 'en')))
    expect(text).toContain(`/crews/${fx.crewId}`)
    expect(text).toMatch(/Never look at or near the sun/)

    const again = await admin.post('/api/digests/run', { kind: 'weekly', now: NOW })
    expect(again.body.sent).toBe(0)
    expect(again.body.alreadySent).toBeGreaterThanOrEqual(1)
    expect((await admin.get('/api/outbox')).body.filter((m: { to: string, subject: string }) => m.to === fx.lead.email && m.subject.startsWith('Glint weekly digest'))).toHaveLength(1)
  })

  it('is the admin\'s to trigger, and a fixed "now" must be a date', async () => {
    expect((await fx.lead.client.post('/api/digests/run', { kind: 'weekly' })).status).toBe(403)
    const bad = await admin.post('/api/digests/run', { kind: 'weekly', now: 'next tuesday' })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/ISO 8601/)
    expect((await admin.post('/api/digests/run', { kind: 'monthly' })).status).toBe(400)
  })
})

describe('daily reminder to trainees, by the command', () => {
  it('reminds a trainee with tracks due, not one who opted out, once a day', async () => {
    // t89 gets a due track too, then opts out on their progress page (PATCH /api/auth/me).
    const db = new Database(inject('dbPath'))
    db.prepare('INSERT INTO tracks (id, user_id, deck_id, target_type_id, aspect, due) VALUES (?, ?, ?, ?, ?, ?)')
      .run(randomBytes(16).toString('base64url'), fx.trainees.t89.id, fx.deckId, fx.typeIds[0], 'beam', Date.now() - DAY)
    db.close()
    expect((await fx.trainees.t89.client.patch('/api/auth/me', { remindersOptOut: true })).status).toBe(200)

    const now = new Date().toISOString()
    const cmd = () => JSON.parse(execFileSync(process.execPath, [resolve('node_modules/tsx/dist/cli.mjs'), 'server/scripts/digests.ts', '--daily', '--now', now], {
      env: inject('serverEnv'), encoding: 'utf8',
    }).trim().split('\n').pop()!)
    const first = cmd()
    expect(first).toMatchObject({ kind: 'daily', period: now.slice(0, 10) })
    const mails = await outbox()
    const mine = mails.filter(m => m.to === fx.trainees.t90.email && /due today/.test(m.subject))
    expect(mine).toHaveLength(1)
    expect(mine[0]!.subject).toBe('Glint: 2 tracks due today')
    expect(mine[0]!.text).toContain('2 tracks are due')
    expect(mails.filter(m => m.to === fx.trainees.t89.email && /due today/.test(m.subject))).toHaveLength(0)

    const second = cmd()
    expect(second.sent).toBe(0)
    expect((await outbox()).filter(m => m.to === fx.trainees.t90.email && /due today/.test(m.subject))).toHaveLength(1)
  })
})
