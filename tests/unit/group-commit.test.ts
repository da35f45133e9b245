// Group commit (server/utils/group-commit.ts) on a real SQLite file, watched from a second
// connection: nothing is acknowledged before its COMMIT, one failing write is rolled back alone
// (a nested better-sqlite3 transaction is a SAVEPOINT, sqlite.org/lang_savepoint.html), and a
// failed COMMIT refuses every write of its group.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { inGroupCommit } from '../../server/utils/group-commit'

let dir: string
let writer: Database.Database
let reader: Database.Database

beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'glint-group-commit-'))
  const file = join(dir, 'g.sqlite')
  writer = new Database(file)
  writer.pragma('journal_mode = WAL')
  writer.pragma('foreign_keys = ON')
  writer.exec('CREATE TABLE parent (id INTEGER PRIMARY KEY); CREATE TABLE t (id INTEGER PRIMARY KEY, v TEXT NOT NULL, p INTEGER REFERENCES parent (id))')
  writer.exec('INSERT INTO parent (id) VALUES (1)')
  reader = new Database(file, { readonly: true })
})

afterEach(() => {
  reader.close()
  writer.close()
  rmSync(dir, { recursive: true, force: true })
})

const insert = (v: string, p: number | null = null) => () => writer.prepare('INSERT INTO t (v, p) VALUES (?, ?)').run(v, p).lastInsertRowid
const stored = () => (reader.prepare('SELECT v FROM t ORDER BY id').pluck().all() as string[])

describe('group commit', () => {
  it('runs the writes of one turn in one transaction and acknowledges each only after the COMMIT', async () => {
    const seenInside: boolean[] = []
    const visibleToOthers: string[][] = []
    const jobs = ['a', 'b', 'c'].map(v => inGroupCommit(writer, () => {
      seenInside.push(writer.inTransaction)
      visibleToOthers.push(stored())
      return insert(v)()
    }))
    // Queued, not yet run: nothing is stored.
    expect(stored()).toEqual([])
    const ids = await Promise.all(jobs)
    expect(ids).toEqual([1, 2, 3])
    expect(seenInside).toEqual([true, true, true])
    // While the group ran, another connection saw none of it: the writes share one uncommitted transaction.
    expect(visibleToOthers).toEqual([[], [], []])
    expect(stored()).toEqual(['a', 'b', 'c'])
  })

  it('rolls back a write that throws, alone, and rejects only its promise', async () => {
    const results = await Promise.allSettled([
      inGroupCommit(writer, insert('kept 1')),
      inGroupCommit(writer, () => {
        insert('rolled back')()
        throw new Error('refused after writing')
      }),
      inGroupCommit(writer, insert('kept 2')),
    ])
    expect(results.map(r => r.status)).toEqual(['fulfilled', 'rejected', 'fulfilled'])
    expect((results[1] as PromiseRejectedResult).reason.message).toBe('refused after writing')
    expect(stored()).toEqual(['kept 1', 'kept 2'])
  })

  it('runs a group once when nothing throws, and again job by job when one does, keeping each write once', async () => {
    const runs = { a: 0, b: 0, bad: 0 }
    const counted = (k: keyof typeof runs, fn: () => unknown) => () => {
      runs[k]++
      return fn()
    }
    await Promise.all([inGroupCommit(writer, counted('a', insert('a'))), inGroupCommit(writer, counted('b', insert('b')))])
    expect(runs).toEqual({ a: 1, b: 1, bad: 0 })
    const results = await Promise.allSettled([
      inGroupCommit(writer, counted('a', insert('a2'))),
      inGroupCommit(writer, counted('bad', () => {
        insert('half-done')()
        throw new Error('refused')
      })),
      inGroupCommit(writer, counted('b', insert('b2'))),
    ])
    expect(results.map(r => r.status)).toEqual(['fulfilled', 'rejected', 'fulfilled'])
    // First run rolled back whole at the throw (b2 never ran); second run a savepoint each.
    expect(runs).toEqual({ a: 3, b: 2, bad: 2 })
    expect(stored()).toEqual(['a', 'b', 'a2', 'b2'])
  })

  it('refuses every write of the group with a 503 when the COMMIT itself fails, and keeps none', async () => {
    // A deferred foreign key is checked at COMMIT (sqlite.org/foreignkeys.html#fk_deferred).
    writer.pragma('defer_foreign_keys = ON')
    const errors = console.error
    console.error = () => {}
    try {
      const results = await Promise.allSettled([
        inGroupCommit(writer, insert('fine')),
        inGroupCommit(writer, insert('orphan', 99)),
      ])
      expect(results.map(r => r.status)).toEqual(['rejected', 'rejected'])
      for (const r of results) expect((r as PromiseRejectedResult).reason.statusCode).toBe(503)
    }
    finally {
      console.error = errors
    }
    expect(stored()).toEqual([])
    expect(writer.inTransaction).toBe(false)
  })

  it('keeps later turns apart: a write queued after a group settles commits on its own', async () => {
    await inGroupCommit(writer, insert('first'))
    const second = inGroupCommit(writer, insert('second'))
    expect(stored()).toEqual(['first'])
    await second
    expect(stored()).toEqual(['first', 'second'])
  })
})
