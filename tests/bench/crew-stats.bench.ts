// The crew table's request time for a crew of 50 trainees with a year of history (>= 500,000 calls).
// npx tsx tests/bench/crew-stats.bench.ts [--json]; builds the server with its own tag when missing.
import { spawn } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { applyMigrations, openDatabase } from '../../server/database/client'
import { quantile } from '../../shared/utils/statistics'
import { seededRng as rng } from '../../shared/utils/rng'
import { freePort, testEnv, waitForHealth } from '../support/global-setup'
import { ensureBuild } from './build'

const json = process.argv.includes('--json')
const log = (...a: unknown[]) => {
  if (!json) console.log(...a)
}

const TRAINEES = 50
const DAYS = 365
const CALLS_PER_WATCH = 30
const TYPES = 12
const ASPECTS = ['head-on', 'beam', 'plan', 'bow-quarter']
const CONDITIONS = ['backlit', 'sunlit', 'dark-cloud', 'white-cloud', 'haze', 'goggles']
const DAY = 86_400_000
const PASSWORD = 'bench lead pass phrase'

// Log-normal latencies (the usual shape of reaction times, common practice, no source).
function normal(r: () => number) {
  return Math.sqrt(-2 * Math.log(1 - r())) * Math.cos(2 * Math.PI * r())
}

async function seed(dbPath: string, nowMs: number) {
  const { db, sqlite } = openDatabase(dbPath)
  applyMigrations(db)
  sqlite.pragma('foreign_keys = OFF')
  const r = rng(20260301)
  const hash = await new Scrypt({}).make(PASSWORD)
  const id = (p: string, i: number) => `${p}${String(i).padStart(10, '0')}`
  let calls = 0
  sqlite.transaction(() => {
    sqlite.prepare('INSERT INTO crews (id, name) VALUES (?, ?)').run('crewbench01', 'Bench Crew')
    sqlite.prepare('INSERT INTO users (id, email, name, password_hash) VALUES (?, ?, ?, ?)').run('leadbench01', 'lead@bench.test', 'Bench Lead', hash)
    sqlite.prepare('INSERT INTO user_roles (user_id, role) VALUES (?, ?)').run('leadbench01', 'lead')
    sqlite.prepare('INSERT INTO memberships (crew_id, user_id) VALUES (?, ?)').run('crewbench01', 'leadbench01')
    sqlite.prepare('INSERT INTO decks (id, title, category, owner_id, status) VALUES (?, ?, ?, ?, ?)').run('deckbench01', 'Bench deck', 'aircraft', 'leadbench01', 'published')
    sqlite.prepare('INSERT INTO deck_crews (deck_id, crew_id) VALUES (?, ?)').run('deckbench01', 'crewbench01')
    const type = sqlite.prepare('INSERT INTO target_types (id, deck_id, name, category, affiliation, size_m, features) VALUES (?, ?, ?, ?, ?, ?, ?)')
    const view = sqlite.prepare('INSERT INTO views (id, target_type_id, aspect, source_sha, width, height) VALUES (?, ?, ?, ?, ?, ?)')
    for (let t = 0; t < TYPES; t++) {
      type.run(id('type', t), 'deckbench01', `Bench type ${t}`, 'aircraft', 'neutral', 20, '{}')
      for (const a of ASPECTS) view.run(id(`view${a}`, t), id('type', t), a, 'x', 100, 100)
    }
    const user = sqlite.prepare('INSERT INTO users (id, email, name, password_hash) VALUES (?, ?, ?, ?)')
    const role = sqlite.prepare('INSERT INTO user_roles (user_id, role) VALUES (?, ?)')
    const member = sqlite.prepare('INSERT INTO memberships (crew_id, user_id) VALUES (?, ?)')
    const track = sqlite.prepare('INSERT INTO tracks (id, user_id, deck_id, target_type_id, aspect, due) VALUES (?, ?, ?, ?, ?, ?)')
    const call = sqlite.prepare(`INSERT INTO calls (id, sighting_id, user_id, deck_id, target_type_id, called_type_id, aspect, condition,
      correct, grade, anticipation, latency_ms, called_at, received_at) VALUES (?, ?, ?, 'deckbench01', ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`)
    for (let u = 0; u < TRAINEES; u++) {
      const uid = id('user', u)
      user.run(uid, `trainee${u}@bench.test`, `Trainee ${u}`, hash)
      role.run(uid, 'trainee')
      member.run('crewbench01', uid)
      for (let t = 0; t < TYPES; t++) for (const a of ASPECTS) track.run(id(`trk${u}-${a}-`, t), uid, 'deckbench01', id('type', t), a, nowMs + (r() - 0.3) * 10 * DAY)
      const diligence = 0.9 + 0.1 * r()
      const skill = r()
      for (let d = DAYS; d >= 1; d--) {
        if (r() > diligence) continue
        const progress = 1 - d / DAYS
        const start = nowMs - d * DAY + 6 * 3600_000 + r() * 12 * 3600_000
        for (let k = 0; k < CALLS_PER_WATCH; k++) {
          const truth = Math.floor(r() * TYPES)
          const correct = r() < 0.7 + 0.2 * progress + 0.08 * skill
          const latency = Math.round(Math.min(5000, Math.max(180, Math.exp(Math.log(1400 - 500 * progress - 200 * skill) + 0.35 * normal(r)))))
          const grade = !correct ? 'missed' : latency <= 750 ? 'instant' : latency <= 1500 ? 'sure' : 'hesitant'
          const called = correct ? truth : (truth + 1 + Math.floor(r() * (TYPES - 1))) % TYPES
          const at = Math.round(start + k * 4000)
          call.run(id('call', calls), id('sig', calls), uid, id('type', truth), id('type', called), ASPECTS[Math.floor(r() * ASPECTS.length)],
            CONDITIONS[Math.floor(r() * CONDITIONS.length)], correct ? 1 : 0, grade, 0, latency, at, at + 50)
          calls++
        }
      }
    }
  })()
  // No ANALYZE: the app keeps no planner statistics (see DEVELOPERS.md, Benchmarks), so neither does this.
  sqlite.pragma('wal_checkpoint(TRUNCATE)')
  sqlite.close()
  return calls
}

async function main() {
  const entry = ensureBuild(process.env.GLINT_BUILD_TAG || 'bench', { quiet: json })
  const dir = mkdtempSync(join(tmpdir(), 'glint-bench-stats-'))
  const port = await freePort()
  const env = testEnv(dir, port)
  const nowMs = Date.now()
  const t0 = Date.now()
  const calls = await seed(env.NUXT_DATABASE_PATH!, nowMs)
  log(`seeded ${calls} calls for ${TRAINEES} trainees over ${DAYS} days in ${Date.now() - t0} ms`)

  const child = spawn(process.execPath, [entry], { env, stdio: ['ignore', 'ignore', 'inherit'] })
  const base = `http://127.0.0.1:${port}`
  try {
    await waitForHealth(base, child)
    const login = await fetch(`${base}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'origin': base },
      body: JSON.stringify({ email: 'lead@bench.test', password: PASSWORD }),
    })
    if (login.status !== 200) throw new Error(`sign-in failed: ${login.status}`)
    const cookie = login.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
    const url = `${base}/api/crews/crewbench01/stats`
    const once = async () => {
      const started = performance.now()
      const r = await fetch(url, { headers: { cookie } })
      const body = await r.json() as { rows: unknown[] }
      if (r.status !== 200 || body.rows.length !== TRAINEES) throw new Error(`stats answered ${r.status}`)
      return performance.now() - started
    }
    for (let i = 0; i < 5; i++) await once()
    const times: number[] = []
    for (let i = 0; i < 30; i++) times.push(await once())
    const medianMs = Math.round(quantile(times, 0.5) * 10) / 10
    const p90Ms = Math.round(quantile(times, 0.9) * 10) / 10
    if (json) console.log(JSON.stringify({ name: 'crew-stats', medianMs, p90Ms, calls, trainees: TRAINEES }))
    else console.log(`GET /api/crews/[id]/stats, ${TRAINEES} trainees, ${calls} calls: median ${medianMs} ms, p90 ${p90Ms} ms over 30 runs (target: median < 100 ms)`)
  }
  finally {
    child.kill('SIGTERM')
    await new Promise(r => child.once('exit', r))
    rmSync(dir, { recursive: true, force: true })
  }
}

await main()
