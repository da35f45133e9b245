// WAL checkpoints on a thread of their own (server/workers/checkpoint-worker.ts), so the request
// thread never copies pages back into the database file (nor waits for its fsync) inside a COMMIT. A worker thread with its own connection
// runs PRAGMA wal_checkpoint(PASSIVE), which never blocks the writer: every CHECKPOINT_BUSY_MS
// while the last round copied at least CHECKPOINT_BUSY_FRAMES pages (heavy writing), else every
// CHECKPOINT_IDLE_MS, so that little is left for any checkpoint on the request thread and light
// writing costs few rounds (each one that copies ends with an fsync). The request connection keeps
// SQLite's automatic checkpoint, set higher, as the safety net should the thread fall behind or stop.
import { resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import { Worker } from 'node:worker_threads'
import type { Database } from 'better-sqlite3'
import type { CheckpointWorkerData, CheckpointWorkerMessage } from '../workers/checkpoint-worker'
import { builtWorker } from './worker-file'

export const CHECKPOINT_BUSY_MS = 10
export const CHECKPOINT_IDLE_MS = 100
export const CHECKPOINT_BUSY_FRAMES = 100
// Pages in the WAL (4 KB each) before a COMMIT on the request thread checkpoints by itself. Under a
// steady stream of commits SQLite rarely finds a moment to start the WAL over (it needs a write to
// begin with every frame copied), so the WAL grows to this size; the request thread's checkpoint
// then finds almost every frame already copied and only syncs, and the WAL starts over.
export const FALLBACK_AUTOCHECKPOINT_PAGES = 20_000

// From the sources (tests, scripts) the TypeScript module runs through tsx's loader: a worker thread
// on Node 20 does not apply `--import tsx` to its own entry file.
function fromSources() {
  const file = pathToFileURL(resolve('server/workers/checkpoint-worker.ts')).href
  return `import('tsx/esm/api').then(tsx => tsx.tsImport(${JSON.stringify(file)}, ${JSON.stringify(file)}))`
}

export interface Checkpointer {
  stop: () => Promise<void>
}

/** Starts the checkpoint thread for the open WAL database `sqlite` (a file, not :memory:). */
export function startCheckpointer(sqlite: Database, opts: { busyMs?: number, idleMs?: number, busyFrames?: number } = {}): Checkpointer {
  sqlite.pragma(`wal_autocheckpoint = ${FALLBACK_AUTOCHECKPOINT_PAGES}`)
  const workerData: CheckpointWorkerData = {
    file: sqlite.name, busyMs: opts.busyMs ?? CHECKPOINT_BUSY_MS, idleMs: opts.idleMs ?? CHECKPOINT_IDLE_MS, busyFrames: opts.busyFrames ?? CHECKPOINT_BUSY_FRAMES,
  }
  const built = builtWorker('checkpoint-worker')
  const worker = built ? new Worker(built, { workerData }) : new Worker(fromSources(), { eval: true, workerData })
  let exited = false
  let stopping = false
  let warned = false
  worker.on('message', (m: CheckpointWorkerMessage) => {
    // SQLITE_BUSY and the like: the next round tries again; the automatic checkpoint remains.
    if (m.error && !warned) {
      warned = true
      console.warn('[checkpointer] a checkpoint failed; retrying each round:', m.error)
    }
  })
  worker.on('error', (error) => {
    console.error('[checkpointer] the thread failed', error)
  })
  // An end not asked for (a throw, or a module that failed to load): COMMITs checkpoint by themselves again.
  worker.once('exit', () => {
    exited = true
    if (stopping || !sqlite.open) return
    console.error('[checkpointer] the thread stopped; COMMITs checkpoint by themselves from now on')
    sqlite.pragma('wal_autocheckpoint = 1000')
  })
  worker.unref()
  return {
    // A thread that already stopped (it failed) has nothing left to end.
    stop: () => new Promise<void>((done) => {
      if (exited) return done()
      stopping = true
      worker.once('exit', () => done())
      worker.postMessage('stop')
    }),
  }
}
