// Migration 0010 (shared target type definitions, issue 17 item 5) on a database that already holds
// target types: SQLite adds a NOT NULL column only with a non-null default (sqlite.org/lang_altertable.html,
// "ADD COLUMN"), so the migration backfills every existing row as its own definition, and a row
// inserted later without a definition becomes its own by the trigger.
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import { drizzle } from 'drizzle-orm/better-sqlite3'
import { migrate } from 'drizzle-orm/better-sqlite3/migrator'
import { afterAll, describe, expect, it } from 'vitest'

const dir = mkdtempSync(join(tmpdir(), 'glint-0010-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))

describe('migration 0010_shared_type_definitions', () => {
  it('makes each existing target type its own definition, and a row inserted without one too', () => {
    // The migrations before 0010: the same folder with its journal cut before it.
    const before = join(dir, 'before')
    cpSync('drizzle', before, { recursive: true })
    const journalPath = join(before, 'meta', '_journal.json')
    const journal = JSON.parse(readFileSync(journalPath, 'utf8')) as { entries: { tag: string }[] }
    const at = journal.entries.findIndex(e => e.tag === '0010_shared_type_definitions')
    expect(at).toBeGreaterThan(0)
    writeFileSync(journalPath, JSON.stringify({ ...journal, entries: journal.entries.slice(0, at) }))

    const sqlite = new Database(join(dir, 'glint.sqlite'))
    sqlite.pragma('foreign_keys = ON')
    const db = drizzle(sqlite)
    migrate(db, { migrationsFolder: before })
    sqlite.prepare(`INSERT INTO users (id, email, name, password_hash) VALUES ('u1', 'a@b.test', 'A', 'x')`).run()
    sqlite.prepare(`INSERT INTO decks (id, title, category, owner_id) VALUES ('d1', 'One', 'aircraft', 'u1'), ('d2', 'Two', 'aircraft', 'u1')`).run()
    const type = sqlite.prepare(`INSERT INTO target_types (id, deck_id, name, category, affiliation, size_m, features) VALUES (?, ?, ?, 'aircraft', 'hostile', 20, '{}')`)
    type.run('t1', 'd1', 'Alpha')
    type.run('t2', 'd2', 'Alpha')
    sqlite.prepare(`INSERT INTO views (id, target_type_id, aspect, source_sha, width, height) VALUES ('v1', 't1', 'beam', 'aa', 320, 214)`).run()

    migrate(db, { migrationsFolder: 'drizzle' })
    const rows = () => sqlite.prepare('SELECT id, definition_id AS definitionId FROM target_types ORDER BY id').all()
    // Two rows of the same name in two decks were copies before: they stay apart (nothing is guessed).
    expect(rows()).toEqual([{ id: 't1', definitionId: 't1' }, { id: 't2', definitionId: 't2' }])
    // Nothing else moved: the view still names its row.
    expect(sqlite.prepare('SELECT target_type_id FROM views WHERE id = ?').pluck().get('v1')).toBe('t1')
    // Inserted without a definition (raw SQL, as test fixtures do): its own. With one: as given.
    type.run('t3', 'd2', 'Bravo')
    sqlite.prepare(`INSERT INTO target_types (id, deck_id, name, category, affiliation, size_m, features, definition_id) VALUES ('t4', 'd1', 'Bravo', 'aircraft', 'hostile', 20, '{}', 't3')`).run()
    expect(rows()).toEqual([{ id: 't1', definitionId: 't1' }, { id: 't2', definitionId: 't2' }, { id: 't3', definitionId: 't3' }, { id: 't4', definitionId: 't3' }])
    sqlite.close()
  })
})
