// Group commit: writes that arrive in the same turn of the event loop share one SQLite transaction,
// so one COMMIT (the WAL write of every dirty page) serves many requests. Each write runs in its
// own savepoint: one that throws is rolled back alone and rejects alone. Every promise settles only
// after the shared COMMIT, so nothing is acknowledged before it is in the database; if the COMMIT
// itself fails, every write of the group is rejected and none is kept.
import type { Database } from 'better-sqlite3'
import { createError } from 'h3'

interface Job {
  fn: () => unknown
  resolve: (value: unknown) => void
  reject: (error: unknown) => void
}

interface Queue {
  jobs: Job[]
  scheduled: boolean
}

// Enough to carry a burst from every open connection; a longer queue waits for the next turn.
export const GROUP_COMMIT_MAX = 256

const queues = new WeakMap<Database, Queue>()

function flush(sqlite: Database, queue: Queue) {
  const jobs = queue.jobs.splice(0, GROUP_COMMIT_MAX)
  if (queue.jobs.length) setImmediate(() => flush(sqlite, queue))
  else queue.scheduled = false
  const outcomes: ({ ok: true, value: unknown } | { ok: false, error: unknown })[] = []
  try {
    sqlite.transaction(() => {
      for (const job of jobs) {
        try {
          // A nested better-sqlite3 transaction is a savepoint: a throw rolls back this job only.
          outcomes.push({ ok: true, value: sqlite.transaction(job.fn)() })
        }
        catch (error) {
          outcomes.push({ ok: false, error })
        }
      }
    }).immediate()
  }
  catch (error) {
    console.error('[group-commit] the shared commit failed; every write of the group is refused', error)
    const refused = createError({ statusCode: 503, message: 'The database could not store this just now; nothing was saved. Try again.' })
    for (const job of jobs) job.reject(refused)
    return
  }
  jobs.forEach((job, i) => {
    const o = outcomes[i]!
    if (o.ok) job.resolve(o.value)
    else job.reject(o.error)
  })
}

/**
 * Runs fn inside the next shared transaction on sqlite and resolves with its result after the
 * COMMIT. fn must be synchronous and only touch this database (it may open its own nested
 * transactions). Outside a request (scripts, tests) call fn inside sqlite.transaction directly.
 */
export function inGroupCommit<T>(sqlite: Database, fn: () => T): Promise<T> {
  let queue = queues.get(sqlite)
  if (!queue) {
    queue = { jobs: [], scheduled: false }
    queues.set(sqlite, queue)
  }
  const q = queue
  return new Promise<T>((resolve, reject) => {
    q.jobs.push({ fn, resolve: resolve as (v: unknown) => void, reject })
    if (!q.scheduled) {
      q.scheduled = true
      setImmediate(() => flush(sqlite, q))
    }
  })
}
