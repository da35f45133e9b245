// server/utils/sql.ts: one SQL text asked for in two shapes gives each caller its own (a merge once
// let a plucked statement answer a caller that wanted rows: a signed-off check showed no signer).
import Database from 'better-sqlite3'
import { describe, expect, it } from 'vitest'
import { statement } from '../../server/utils/sql'

describe('statement()', () => {
  const db = new Database(':memory:')
  db.exec(`CREATE TABLE users (id TEXT PRIMARY KEY, name TEXT NOT NULL); INSERT INTO users VALUES ('a', 'Idris'), ('b', 'Maren')`)
  const sql = 'SELECT name FROM users WHERE id = ?'

  it('keeps rows, a single value and arrays apart for one SQL text, in any order of use', () => {
    expect(statement<string, [string]>(db, sql, 'pluck').get('a')).toBe('Idris')
    expect(statement<{ name: string }, [string]>(db, sql).get('a')).toEqual({ name: 'Idris' })
    expect(statement<[string], [string]>(db, sql, 'raw').get('b')).toEqual(['Maren'])
    expect(statement<string, [string]>(db, sql, 'pluck').get('b')).toBe('Maren')
    expect(statement<{ name: string }, [string]>(db, sql).all('b')).toEqual([{ name: 'Maren' }])
  })

  it('prepares a statement once per handle, text and shape', () => {
    expect(statement(db, sql)).toBe(statement(db, sql))
    expect(statement(db, sql, 'pluck')).not.toBe(statement(db, sql))
    const other = new Database(':memory:')
    other.exec('CREATE TABLE users (id TEXT PRIMARY KEY, name TEXT NOT NULL)')
    expect(statement(other, sql)).not.toBe(statement(db, sql))
    other.close()
  })
})
