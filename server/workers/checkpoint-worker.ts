// The checkpoint thread (started by server/utils/checkpointer.ts): its own connection runs
// PRAGMA wal_checkpoint(PASSIVE), which never blocks the writer, every busyMs while the last round
// copied at least busyFrames pages (heavy writing), else every idleMs.
// Built to .output*/server/workers/checkpoint-worker.mjs (see build-worker.ts); under tsx it runs as is.
import { parentPort, workerData } from 'node:worker_threads'
import Database from 'better-sqlite3'

export interface CheckpointWorkerData {
  file: string
  busyMs: number
  idleMs: number
  busyFrames: number
}

/** What the thread posts: a failed round (SQLITE_BUSY and the like); the next round tries again. */
export interface CheckpointWorkerMessage {
  error: string
}

const port = parentPort
if (!port) throw new Error('checkpoint-worker.ts runs only as a worker thread')
const opts = workerData as CheckpointWorkerData
const db = new Database(opts.file, { fileMustExist: true })
db.pragma('busy_timeout = 1000')
const checkpoint = db.prepare<[], { checkpointed: number }>('PRAGMA wal_checkpoint(PASSIVE)')

let timer: NodeJS.Timeout
function round() {
  let copied = 0
  try {
    copied = checkpoint.get()?.checkpointed ?? 0
  }
  catch (error) {
    port!.postMessage({ error: error instanceof Error ? error.message : String(error) } satisfies CheckpointWorkerMessage)
  }
  timer = setTimeout(round, copied >= opts.busyFrames ? opts.busyMs : opts.idleMs)
}
timer = setTimeout(round, opts.idleMs)

port.on('message', (m: unknown) => {
  if (m !== 'stop') return
  clearTimeout(timer)
  db.close()
  port.close()
})
