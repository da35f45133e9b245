// Upload to every rendering done, for 1600 x 1000 PNG silhouettes, through the built server's
// worker pool against a single-worker pool, and the server's peak resident memory.
// npx tsx tests/bench/upload-pipeline.bench.ts [--json]; builds the server with its own tag when missing.
import { spawn } from 'node:child_process'
import { createHash } from 'node:crypto'
import type { ChildProcess } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { availableParallelism, tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { applyMigrations, openDatabase } from '../../server/database/client'
import { encodePng } from '../../server/core/imaging/codecs'
import { DEMO_TARGET_TYPES } from '../../server/core/imaging/generate/catalogue'
import { drawSilhouette } from '../../server/core/imaging/generate/index'
import type { Aspect } from '../../shared/utils/conditions'
import { quantile } from '../../shared/utils/statistics'
import { freePort, testEnv, waitForHealth } from '../support/global-setup'
import { ensureBuild } from './build'

const json = process.argv.includes('--json')
const log = (...a: unknown[]) => {
  if (!json) console.log(...a)
}

const SINGLE_FILES = 7
const BATCH_FILES = 8
// Batches a server runs; the ratio compares their medians, as the machine's speed moves between runs.
const BATCHES = 3
const PASSWORD = 'bench instructor phrase'

// Distinct 1600 x 1000 pictures (look-alike types share some outlines, so repeats are skipped).
async function silhouettes(count: number) {
  const aspects: Aspect[] = ['beam', 'plan', 'head-on', 'belly', 'tail-on']
  const seen = new Set<string>()
  const out: Uint8Array[] = []
  for (const aspect of aspects) {
    for (const type of DEMO_TARGET_TYPES) {
      if (out.length === count) return out
      const png = await encodePng(drawSilhouette(type.params, aspect, { width: 1600, height: 1000 }))
      const key = createHash('sha256').update(png).digest('hex')
      if (!seen.has(key)) out.push(png)
      seen.add(key)
    }
  }
  return out
}

async function seed(dbPath: string) {
  const { db, sqlite } = openDatabase(dbPath)
  applyMigrations(db)
  const hash = await new Scrypt({}).make(PASSWORD)
  sqlite.prepare('INSERT INTO users (id, email, name, password_hash) VALUES (?, ?, ?, ?)').run('instrbench01', 'instructor@bench.test', 'Bench Instructor', hash)
  sqlite.prepare('INSERT INTO user_roles (user_id, role) VALUES (?, ?)').run('instrbench01', 'instructor')
  sqlite.prepare('INSERT INTO decks (id, title, category, owner_id) VALUES (?, ?, ?, ?)').run('deckbench01', 'Bench uploads', 'aircraft', 'instrbench01')
  for (const t of ['warm', 'single', ...Array.from({ length: BATCHES }, (_, i) => `batch${i}`)]) {
    sqlite.prepare('INSERT INTO target_types (id, deck_id, name, category, affiliation, size_m, features) VALUES (?, ?, ?, ?, ?, ?, ?)')
      .run(`type${t}bench`, 'deckbench01', `Bench ${t}`, 'aircraft', 'neutral', 20, '{}')
  }
  sqlite.close()
}

interface Server { base: string, cookie: string, child: ChildProcess, dir: string, dbPath: string }

async function startServer(entry: string, threads: number | null): Promise<Server> {
  const dir = mkdtempSync(join(tmpdir(), 'glint-bench-upload-'))
  const port = await freePort()
  const env = testEnv(dir, port)
  if (threads) env.GLINT_RENDER_THREADS = String(threads)
  await seed(env.NUXT_DATABASE_PATH!)
  // BENCH_NODE_ARGS passes flags to the server (e.g. --cpu-prof to profile it).
  const nodeArgs = (process.env.BENCH_NODE_ARGS ?? '').split(' ').filter(Boolean)
  const child = spawn(process.execPath, [...nodeArgs, entry], { env, stdio: ['ignore', 'ignore', 'inherit'] })
  const base = `http://127.0.0.1:${port}`
  await waitForHealth(base, child)
  const login = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'origin': base },
    body: JSON.stringify({ email: 'instructor@bench.test', password: PASSWORD }),
  })
  if (login.status !== 200) throw new Error(`sign-in failed: ${login.status}`)
  return { base, cookie: login.headers.getSetCookie().map(c => c.split(';')[0]).join('; '), child, dir, dbPath: env.NUXT_DATABASE_PATH! }
}

async function stopServer(s: Server) {
  s.child.kill('SIGTERM')
  await new Promise(r => s.child.once('exit', r))
  rmSync(s.dir, { recursive: true, force: true })
}

// Posts the files in one request and waits until every job is done; returns the elapsed time.
async function upload(s: Server, typeId: string, files: Uint8Array[]) {
  const form = new FormData()
  form.set('targetTypeId', typeId)
  form.set('aspect', 'plan')
  files.forEach((f, i) => form.append('files', new Blob([f], { type: 'image/png' }), `bench-${i}.png`))
  const started = Date.now()
  const r = await fetch(`${s.base}/api/decks/deckbench01/views`, { method: 'POST', headers: { cookie: s.cookie, origin: s.base }, body: form })
  if (r.status !== 202) throw new Error(`upload answered ${r.status}: ${await r.text()}`)
  const { jobs } = await r.json() as { jobs: { id: string }[] }
  // The end is the server's own time of the last job's completion (its row's updated_at, same
  // clock), so the polling only has to notice that the jobs are done and can stay light: each
  // poll is a request the server answers on the cores the workers need.
  for (const { id } of jobs) {
    for (;;) {
      const job = await (await fetch(`${s.base}/api/jobs/${id}`, { headers: { cookie: s.cookie } })).json() as { state: string, message?: string }
      if (job.state === 'failed') throw new Error(`job failed: ${job.message}`)
      if (job.state === 'done') break
      await new Promise(ok => setTimeout(ok, 100))
    }
  }
  const db = new Database(s.dbPath, { readonly: true })
  try {
    const ids = JSON.stringify(jobs.map(j => j.id))
    const done = db.prepare('SELECT max(updated_at) FROM jobs WHERE id IN (SELECT value FROM json_each(?))').pluck().get(ids) as number
    return done - started
  }
  finally {
    db.close()
  }
}

function statusMb(pid: number, field: 'VmHWM' | 'VmRSS') {
  const status = readFileSync(`/proc/${pid}/status`, 'utf8')
  const kb = Number(status.match(new RegExp(`${field}:\\s+(\\d+) kB`))?.[1] ?? 0)
  return Math.round(kb / 1024)
}
const peakRssMb = (pid: number) => statusMb(pid, 'VmHWM')
const rssMb = (pid: number) => statusMb(pid, 'VmRSS')

async function measure(entry: string, threads: number | null, images: { warm: Uint8Array[], single: Uint8Array[], batch: Uint8Array[] }) {
  const s = await startServer(entry, threads)
  try {
    const idleRssMb = rssMb(s.child.pid!)
    // Warm-up: every worker thread compiles its codecs and its render code reaches the optimising JIT.
    await upload(s, 'typewarmbench', images.warm)
    const perFile: number[] = []
    for (const f of images.single) perFile.push(await upload(s, 'typesinglebench', [f]))
    const batches: number[] = []
    for (let i = 0; i < BATCHES; i++) batches.push(await upload(s, `typebatch${i}bench`, images.batch))
    return { perFile, batches, batchMs: quantile(batches, 0.5), idleRssMb, peakRssMb: peakRssMb(s.child.pid!) }
  }
  finally {
    await stopServer(s)
  }
}

async function main() {
  const entry = ensureBuild(process.env.GLINT_BUILD_TAG || 'bench-upload', { quiet: json, needs: ['server/workers/render-worker.mjs'] })
  const cores = availableParallelism()
  const warmFiles = 3 * cores
  const all = await silhouettes(warmFiles + SINGLE_FILES + BATCH_FILES)
  const images = {
    warm: all.slice(0, warmFiles),
    single: all.slice(warmFiles, warmFiles + SINGLE_FILES),
    batch: all.slice(warmFiles + SINGLE_FILES),
  }
  const pool = await measure(entry, null, images)
  const single = await measure(entry, 1, images)
  const medianMs = Math.round(quantile(pool.perFile, 0.5))
  const poolRatio = Math.round(single.batchMs / pool.batchMs * 100) / 100
  if (json) {
    console.log(JSON.stringify({ name: 'upload-pipeline', medianMs, poolRatio, peakRssMb: pool.peakRssMb, batchFiles: BATCH_FILES, poolBatchMs: Math.round(pool.batchMs), singleBatchMs: Math.round(single.batchMs), singlePeakRssMb: single.peakRssMb, idleRssMb: pool.idleRssMb, cores }))
  }
  else {
    log(`1600 x 1000 PNG, upload to all 18 renderings done, one file at a time: median ${medianMs} ms over ${SINGLE_FILES} files (pool of ${cores}; target <= 1500 ms)`)
    log(`  per file: ${pool.perFile.map(t => Math.round(t)).join(', ')} ms`)
    log(`batch of ${BATCH_FILES} files, median of ${BATCHES}: pool ${Math.round(pool.batchMs)} ms, single worker ${Math.round(single.batchMs)} ms, ratio ${poolRatio} (target >= 1.7)`)
    log(`  batches: pool ${pool.batches.map(t => Math.round(t)).join(', ')} ms; single worker ${single.batches.map(t => Math.round(t)).join(', ')} ms`)
    log(`peak resident memory of the server process (VmHWM): pool ${pool.peakRssMb} MB, single worker ${single.peakRssMb} MB, idle server before uploads ${pool.idleRssMb} MB (target < 400 MB)`)
  }
}

await main()
