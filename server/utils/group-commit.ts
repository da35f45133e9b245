// Group commit: writes that arrive in the same turn of the event loop share one SQLite transaction,
// so one COMMIT (the WAL write of every dirty page) serves many requests. A write that throws is
// rolled back alone and rejects alone: the group first runs without savepoints (a savepoint copies
// every page it touches into the sub-journal), and if any write throws, the whole transaction is
// rolled back and the group runs again with a savepoint per write. Every promise settles only
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

type Outcome = { ok: true, value: unknown } | { ok: false, error: unknown }

class JobThrew extends Error {}

// Every job of the group in one transaction; a job that throws rolls back all of them (JobThrew).
function runTogether(sqlite: Database, jobs: Job[]): Outcome[] {
  return sqlite.transaction(() => jobs.map((job): Outcome => {
    try {
      return { ok: true, value: job.fn() }
    }
    catch (error) {
      throw new JobThrew('a write of the group threw', { cause: error })
    }
  })).immediate()
}

// Every job in its own savepoint (a nested better-sqlite3 transaction): a throw rolls back that job only.
function runEachInSavepoint(sqlite: Database, jobs: Job[]): Outcome[] {
  return sqlite.transaction(() => jobs.map((job): Outcome => {
    try {
      return { ok: true, value: sqlite.transaction(job.fn)() }
    }
    catch (error) {
      return { ok: false, error }
    }
  })).immediate()
}

function flush(sqlite: Database, queue: Queue) {
  const jobs = queue.jobs.splice(0, GROUP_COMMIT_MAX)
  if (queue.jobs.length) setImmediate(() => flush(sqlite, queue))
  else queue.scheduled = false
  let outcomes: Outcome[]
  try {
    try {
      outcomes = runTogether(sqlite, jobs)
    }
    catch (error) {
      if (!(error instanceof JobThrew)) throw error
      outcomes = runEachInSavepoint(sqlite, jobs)
    }
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
 * Runs a write all or nothing: in its own IMMEDIATE transaction, or inside the caller's when one
 * is open (a group commit's job, which the group rolls back alone on a throw). A nested savepoint
 * would copy every page the write touches into the sub-journal once more. Domain writes use this
 * instead of sqlite.transaction, so they read the same whether or not a group commit runs them.
 */
export function allOrNothing<T>(sqlite: Database, fn: () => T): T {
  return sqlite.inTransaction ? fn() : sqlite.transaction(fn).immediate()
}

/**
 * Runs fn inside the next shared transaction on sqlite and resolves with its result after the
 * COMMIT. fn must be synchronous and only touch this database (it may open its own nested
 * transactions); it may run twice, when another job of its group throws (the first run is rolled
 * back). Outside a request (scripts, tests) call fn inside sqlite.transaction directly.
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
