// The checkpoint thread (server/utils/checkpointer.ts): committed pages reach the database file
// itself without the writing connection checkpointing (sqlite.org/wal.html#checkpointing), and the
// writer's own automatic checkpoint is raised to a fallback.
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { FALLBACK_AUTOCHECKPOINT_PAGES, startCheckpointer } from '../../server/utils/checkpointer'

let dir: string
let writer: Database.Database

beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'glint-checkpointer-'))
  writer = new Database(join(dir, 'c.sqlite'))
  writer.pragma('journal_mode = WAL')
  writer.exec('CREATE TABLE t (id INTEGER PRIMARY KEY, v TEXT NOT NULL)')
  // The schema into the database file, so that a copy of the file alone can be read.
  writer.pragma('wal_checkpoint(TRUNCATE)')
})

afterEach(() => {
  writer.close()
  rmSync(dir, { recursive: true, force: true })
})

// Rows found in a copy of the main database file alone (no -wal beside it): only what a checkpoint wrote there.
function rowsInDatabaseFile() {
  const copy = join(dir, 'copy.sqlite')
  copyFileSync(join(dir, 'c.sqlite'), copy)
  const db = new Database(copy, { readonly: true })
  try {
    return db.prepare('SELECT count(*) FROM t').pluck().get() as number
  }
  finally {
    db.close()
  }
}

describe('checkpoint thread', () => {
  it('copies committed pages into the database file while the writer never checkpoints', async () => {
    const checkpointer = startCheckpointer(writer, { busyMs: 5, idleMs: 20 })
    try {
      expect(writer.pragma('wal_autocheckpoint', { simple: true })).toBe(FALLBACK_AUTOCHECKPOINT_PAGES)
      const insert = writer.prepare('INSERT INTO t (v) VALUES (?)')
      writer.transaction(() => {
        for (let i = 0; i < 500; i++) insert.run(`row ${i} `.repeat(20))
      })()
      // The writer has not checkpointed (far below the fallback), so right after the commit the rows live in the WAL only.
      expect(rowsInDatabaseFile()).toBe(0)
      let found = 0
      for (let waited = 0; waited < 3000 && found < 500; waited += 20) {
        await new Promise(r => setTimeout(r, 20))
        found = rowsInDatabaseFile()
      }
      expect(found).toBe(500)
    }
    finally {
      await checkpointer.stop()
    }
  })

  it('stops its thread on request, leaving the database usable', async () => {
    const checkpointer = startCheckpointer(writer, { busyMs: 5, idleMs: 20 })
    await checkpointer.stop()
    writer.prepare('INSERT INTO t (v) VALUES (?)').run('after stop')
    expect(writer.prepare('SELECT v FROM t').pluck().all()).toEqual(['after stop'])
  })

  // A bug fix: stop() waited for an exit that had already happened, so a server closing after the
  // thread failed hung. A database file removed once open leaves the thread nothing to open (fileMustExist).
  it('stops at once when the thread has already failed', async () => {
    const gone = new Database(join(dir, 'gone.sqlite'))
    rmSync(join(dir, 'gone.sqlite'))
    const checkpointer = startCheckpointer(gone, { idleMs: 20 })
    try {
      for (let waited = 0; waited < 10_000 && gone.pragma('wal_autocheckpoint', { simple: true }) !== 1000; waited += 50) {
        await new Promise(r => setTimeout(r, 50))
      }
      const stopped = await Promise.race([checkpointer.stop().then(() => 'stopped'), new Promise(done => setTimeout(() => done('hung'), 2000))])
      expect(stopped).toBe('stopped')
      // The writer got its own automatic checkpoint back (SQLite's default, sqlite.org/pragma.html#pragma_wal_autocheckpoint).
      expect(gone.pragma('wal_autocheckpoint', { simple: true })).toBe(1000)
    }
    finally {
      gone.close()
    }
  })
})
