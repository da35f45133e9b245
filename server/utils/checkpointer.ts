// WAL checkpoints on a thread of their own, so the request thread never copies pages back into the
// database file (nor waits for its fsync) inside a COMMIT. A worker thread with its own connection
// runs PRAGMA wal_checkpoint(PASSIVE), which never blocks the writer: every CHECKPOINT_BUSY_MS
// while the last round copied at least CHECKPOINT_BUSY_FRAMES pages (heavy writing), else every
// CHECKPOINT_IDLE_MS, so that little is left for any checkpoint on the request thread and light
// writing costs few rounds (each one that copies ends with an fsync). The request connection keeps
// SQLite's automatic checkpoint, set higher, as the safety net should the thread fall behind or stop.
import { createRequire } from 'node:module'
import { join } from 'node:path'
import { Worker } from 'node:worker_threads'
import type { Database } from 'better-sqlite3'

export const CHECKPOINT_BUSY_MS = 10
export const CHECKPOINT_IDLE_MS = 100
export const CHECKPOINT_BUSY_FRAMES = 100
// Pages in the WAL (4 KB each) before a COMMIT on the request thread checkpoints by itself. Under a
// steady stream of commits SQLite rarely finds a moment to start the WAL over (it needs a write to
// begin with every frame copied), so the WAL grows to this size; the request thread's checkpoint
// then finds almost every frame already copied and only syncs, and the WAL starts over.
export const FALLBACK_AUTOCHECKPOINT_PAGES = 20_000

// Plain JavaScript: the built server has no bundled file for it, and it needs only the driver.
const THREAD = `
const { workerData, parentPort } = require('node:worker_threads')
const Database = require(workerData.driver)
const db = new Database(workerData.file, { fileMustExist: true })
db.pragma('busy_timeout = 1000')
const checkpoint = db.prepare('PRAGMA wal_checkpoint(PASSIVE)')
let timer
function round() {
  let copied = 0
  try { copied = checkpoint.get().checkpointed }
  catch (error) { parentPort.postMessage({ error: String(error && error.message || error) }) }
  timer = setTimeout(round, copied >= workerData.busyFrames ? workerData.busyMs : workerData.idleMs)
}
timer = setTimeout(round, workerData.idleMs)
parentPort.on('message', (m) => {
  if (m === 'stop') { clearTimeout(timer); db.close(); parentPort.close() }
})
`

// The driver as the running server resolves it: beside the built server's entry (.output/server),
// else from the working directory (nuxt dev). The bundler rewrites import.meta, so it cannot anchor this.
function driverPath() {
  for (const from of [process.argv[1], join(process.cwd(), 'package.json')]) {
    if (!from) continue
    try {
      return createRequire(from).resolve('better-sqlite3')
    }
    catch {
      // not resolvable from there; try the next place
    }
  }
  throw new Error('better-sqlite3 cannot be resolved for the checkpoint thread')
}

export interface Checkpointer {
  stop: () => Promise<void>
}

/** Starts the checkpoint thread for the open WAL database `sqlite` (a file, not :memory:). */
export function startCheckpointer(sqlite: Database, opts: { busyMs?: number, idleMs?: number, busyFrames?: number } = {}): Checkpointer {
  sqlite.pragma(`wal_autocheckpoint = ${FALLBACK_AUTOCHECKPOINT_PAGES}`)
  const worker = new Worker(THREAD, {
    eval: true,
    workerData: { driver: driverPath(), file: sqlite.name, busyMs: opts.busyMs ?? CHECKPOINT_BUSY_MS, idleMs: opts.idleMs ?? CHECKPOINT_IDLE_MS, busyFrames: opts.busyFrames ?? CHECKPOINT_BUSY_FRAMES },
  })
  let warned = false
  worker.on('message', (m: { error?: string }) => {
    // SQLITE_BUSY and the like: the next round tries again; the automatic checkpoint remains.
    if (m.error && !warned) {
      warned = true
      console.warn('[checkpointer] a checkpoint failed; retrying each round:', m.error)
    }
  })
  worker.on('error', (error) => {
    console.error('[checkpointer] the thread stopped; COMMITs checkpoint by themselves from now on', error)
    sqlite.pragma('wal_autocheckpoint = 1000')
  })
  worker.unref()
  return {
    stop: () => new Promise<void>((done) => {
      worker.once('exit', () => done())
      worker.postMessage('stop')
    }),
  }
}
