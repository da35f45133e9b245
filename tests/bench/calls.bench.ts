// POST /api/sightings/[id]/call under 50 signed-in trainees (autocannon, 50 connections, loopback),
// each request a different issued sighting, then resends of the same calls, beside GET /api/health
// measured in the same run.
// Run: npx tsx tests/bench/calls.bench.ts [--json]
import { spawn } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import autocannon from 'autocannon'
import Database from 'better-sqlite3'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { applyMigrations, openDatabase } from '../../server/database/client'
import { freePort, testEnv, waitForHealth } from '../support/global-setup'
import { ensureBuild } from './build'

const json = process.argv.includes('--json')
const TAG = 'bench'
const TRAINEES = 50
const CONNECTIONS = 50
const DECKS = 8
const TYPES_PER_DECK = 15
const PASSWORD = 'bench trainee phrase'
const log = (...a: unknown[]) => {
  if (!json) console.log(...a)
}

const id = () => randomBytes(16).toString('base64url')

// Trainees and decks written straight into the bench database: invented names, fake render files
// (the call route never reads an image).
async function prepareDb(path: string) {
  const { db, sqlite } = openDatabase(path)
  applyMigrations(db)
  const hash = await new Scrypt({}).make(PASSWORD)
  const crewId = id()
  const ownerId = id()
  const emails: string[] = []
  sqlite.transaction(() => {
    sqlite.prepare('INSERT INTO crews (id, name) VALUES (?, ?)').run(crewId, 'Bench Crew')
    sqlite.prepare('INSERT INTO users (id, email, name, password_hash) VALUES (?, ?, ?, ?)').run(ownerId, 'owner@bench.test', 'Bench Owner', hash)
    for (let d = 0; d < DECKS; d++) {
      const deckId = id()
      sqlite.prepare(`INSERT INTO decks (id, title, category, owner_id, status, new_per_day) VALUES (?, ?, 'aircraft', ?, 'published', 30)`)
        .run(deckId, `Bench deck ${d}`, ownerId)
      sqlite.prepare('INSERT INTO deck_crews (deck_id, crew_id) VALUES (?, ?)').run(deckId, crewId)
      for (let t = 0; t < TYPES_PER_DECK; t++) {
        const typeId = id()
        sqlite.prepare(`INSERT INTO target_types (id, deck_id, name, category, affiliation, size_m, features) VALUES (?, ?, ?, 'aircraft', 'neutral', ?, ?)`)
          .run(typeId, deckId, `Type ${d}-${t}`, 10 + t, JSON.stringify({ wings: t % 2 ? 'swept' : 'straight', engines: `${1 + (t % 4)}` }))
        for (const aspect of ['beam', 'head-on']) {
          const viewId = id()
          sqlite.prepare(`INSERT INTO views (id, target_type_id, aspect, source_sha, width, height) VALUES (?, ?, ?, ?, 320, 214)`).run(viewId, typeId, aspect, id())
          for (const condition of ['white-cloud', 'sunlit', 'backlit', 'haze']) {
            sqlite.prepare(`INSERT INTO variants (id, view_id, condition, width, height, bytes, contrast, file) VALUES (?, ?, ?, 320, 214, 1000, -0.8, ?)`)
              .run(id(), viewId, condition, `${randomBytes(32).toString('hex')}.webp`)
          }
        }
      }
    }
    for (let i = 0; i < TRAINEES; i++) {
      const userId = id()
      const email = `bench${i}@bench.test`
      emails.push(email)
      sqlite.prepare('INSERT INTO users (id, email, name, password_hash) VALUES (?, ?, ?, ?)').run(userId, email, `Bench trainee ${i}`, hash)
      sqlite.prepare(`INSERT INTO user_roles (user_id, role) VALUES (?, 'trainee')`).run(userId)
      sqlite.prepare('INSERT INTO memberships (crew_id, user_id) VALUES (?, ?)').run(crewId, userId)
    }
  })()
  sqlite.close()
  return emails
}

// User + system CPU of a process in ms, from /proc/<pid>/stat (clock ticks, 100 a second on Linux).
function serverCpuMs(pid: number): number {
  const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ')
  return (Number(fields[11]) + Number(fields[12])) * 10
}

function cookieOf(res: Response) {
  return res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

// Resolves with autocannon's result and the wall time from the start to the last response:
// autocannon ends a run of a fixed amount only on its next one-second tick, so its own duration
// (and the wall time to its callback) is rounded up to whole seconds.
function run(opts: autocannon.Options): Promise<autocannon.Result & { seconds: number }> {
  return new Promise((ok, fail) => {
    const t0 = performance.now()
    let last = t0
    const instance = autocannon(opts, (err, result) => (err ? fail(err) : ok({ ...result, seconds: (last - t0) / 1000 })))
    instance.on('response', () => {
      last = performance.now()
    })
  })
}

const entry = ensureBuild(TAG, { quiet: json })
const dir = mkdtempSync(join(tmpdir(), 'glint-bench-calls-'))
const port = await freePort()
const env = testEnv(dir, port)
const emails = await prepareDb(env.NUXT_DATABASE_PATH!)
// BENCH_NODE_ARGS passes flags to the server (e.g. --cpu-prof to profile the handler).
const nodeArgs = (process.env.BENCH_NODE_ARGS ?? '').split(' ').filter(Boolean)
const child = spawn(process.execPath, [...nodeArgs, entry], { env, stdio: ['ignore', 'ignore', 'inherit'] })
const base = `http://127.0.0.1:${port}`
try {
  await waitForHealth(base, child)
  const headers = { 'origin': base, 'content-type': 'application/json' }
  const cookies = await Promise.all(emails.map(async (email) => {
    const r = await fetch(`${base}/api/auth/login`, { method: 'POST', headers, body: JSON.stringify({ email, password: PASSWORD }) })
    if (r.status !== 200) throw new Error(`login ${email}: ${r.status}`)
    return cookieOf(r)
  }))
  const deckIds = (new Database(env.NUXT_DATABASE_PATH!, { readonly: true }).prepare('SELECT id FROM decks').all() as { id: string }[]).map(d => d.id)
  const pairs: { cookie: string, sightingId: string, choiceId: string }[] = []
  for (const [i, cookie] of cookies.entries()) {
    for (const deckId of deckIds) {
      const r = await fetch(`${base}/api/watches`, { method: 'POST', headers: { ...headers, cookie }, body: JSON.stringify({ deckId }) })
      if (r.status !== 200) throw new Error(`watch for trainee ${i}: ${r.status} ${await r.text()}`)
      const w = await r.json() as { sightings: { id: string, choices: { id: string }[] }[] }
      for (const s of w.sightings) pairs.push({ cookie, sightingId: s.id, choiceId: s.choices[0]!.id })
    }
  }
  // The answers from the database, so that most calls are right, as in a real watch.
  const ro = new Database(env.NUXT_DATABASE_PATH!, { readonly: true })
  const answerOf = ro.prepare('SELECT answer_choice_id AS a FROM sightings WHERE id = ?')
  for (const p of pairs) {
    if (Math.random() < 0.85) p.choiceId = (answerOf.get(p.sightingId) as { a: string }).a
  }
  ro.close()
  // Interleave trainees, so that concurrent requests come from different people.
  pairs.sort(() => Math.random() - 0.5)
  const warm = pairs.splice(0, 1000)
  log(`${pairs.length} sightings issued to ${TRAINEES} trainees; warming up with ${warm.length}`)

  const callRequests = (list: typeof pairs) => {
    let next = 0
    return [{
      method: 'POST' as const,
      setupRequest: (req: autocannon.Request) => {
        const p = list[next++ % list.length]!
        return {
          ...req,
          path: `/api/sightings/${p.sightingId}/call`,
          headers: { ...headers, cookie: p.cookie },
          body: JSON.stringify({ choiceId: p.choiceId, latencyMs: 300 + Math.floor(Math.random() * 1500), framesShown: 30, frameIntervalMs: 16.7 }),
        }
      },
    }]
  }
  await run({ url: base, connections: CONNECTIONS, amount: warm.length, requests: callRequests(warm) })
  const cpu0 = serverCpuMs(child.pid!)
  const calls = await run({ url: base, connections: CONNECTIONS, amount: pairs.length, requests: callRequests(pairs) })
  const callsSeconds = calls.seconds
  const cpu1 = serverCpuMs(child.pid!)
  // The same route answering resends of those calls: the same gate, body and validation, two
  // indexed reads and the stored result, no write. The ceiling for any call on this stack and machine.
  const resends = await run({ url: base, connections: CONNECTIONS, amount: pairs.length, requests: callRequests(pairs) })
  const cpu1r = serverCpuMs(child.pid!)
  const trivial = await run({ url: `${base}/api/health`, connections: CONNECTIONS, duration: 5 })
  const cpu2 = serverCpuMs(child.pid!)
  // The server's own CPU time a request (user + system, every thread): less noisy than a rate,
  // since the load generator shares the two cores.
  const cpuPerCallUs = Math.round((cpu1 - cpu0) * 1000 / calls.requests.total)
  const cpuPerTrivialUs = Math.round((cpu2 - cpu1r) * 1000 / trivial.requests.total)
  const cpuPerResendUs = Math.round((cpu1r - cpu1) * 1000 / resends.requests.total)
  const resendsPerSec = Math.round(resends.requests.total / resends.seconds)

  const stored = (new Database(env.NUXT_DATABASE_PATH!, { readonly: true }).prepare('SELECT count(*) AS n FROM calls').get() as { n: number }).n
  const callsPerSec = Math.round(calls.requests.total / callsSeconds)
  const trivialPerSec = Math.round(trivial.requests.total / trivial.seconds)
  const figures = {
    name: 'calls',
    callsPerSec,
    p50Ms: calls.latency.p50,
    p99Ms: calls.latency.p99,
    ratioToTrivial: Math.round((callsPerSec / trivialPerSec) * 1000) / 1000,
    resendsPerSec,
    resendRatioToTrivial: Math.round((resendsPerSec / trivialPerSec) * 1000) / 1000,
    cpuPerCallUs,
    cpuPerResendUs,
    cpuPerTrivialUs,
  }
  if (json) console.log(JSON.stringify(figures))
  else {
    console.log(`calls: ${calls.requests.total} in ${callsSeconds.toFixed(2)} s (${calls.non2xx} not 2xx, ${calls.errors} errors); ${stored} calls stored`)
    console.log(`callsPerSec ${callsPerSec}  p50Ms ${calls.latency.p50}  p90Ms ${calls.latency.p90}  p99Ms ${calls.latency.p99}  max ${calls.latency.max} ms`)
    console.log(`resends of the same calls (no write): ${resendsPerSec}/s  p50Ms ${resends.latency.p50}  p99Ms ${resends.latency.p99}  (${resends.non2xx} not 2xx); ratio to trivial ${figures.resendRatioToTrivial}`)
    console.log(`trivial GET /api/health: ${trivialPerSec}/s  p50Ms ${trivial.latency.p50}  p99Ms ${trivial.latency.p99}`)
    console.log(`server CPU a request: call ${cpuPerCallUs} us, resend ${cpuPerResendUs} us, trivial ${cpuPerTrivialUs} us`)
    console.log(`ratioToTrivial ${figures.ratioToTrivial}  (targets: >= 1500 calls/s, p99 < 25 ms, ratio >= 0.4)`)
  }
}
finally {
  child.kill('SIGTERM')
  await new Promise(r => child.once('exit', r))
  rmSync(dir, { recursive: true, force: true })
}
