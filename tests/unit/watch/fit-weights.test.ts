// The parameters a trainee's call is scheduled with (server/domain/crew-fits.ts weightsForCall) follow
// the trainee's crew as it is now: a trainee moved to another crew is scheduled with that crew's set
// at once (issue 18: "the scheduler then uses the fitted parameters for that crew's tracks").
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Database } from 'better-sqlite3'
import { default_w } from 'ts-fsrs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { applyMigrations, openDatabase } from '../../../server/database/client'
import { weightsForCall } from '../../../server/domain/crew-fits'

let dir: string
let sqlite: Database
// a set that differs from FSRS-6's defaults in its first stabilities (design values)
const fitted = default_w.map((w, i) => (i < 4 ? w / 4 : w))

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'glint-fit-weights-'))
  const opened = openDatabase(join(dir, 'g.sqlite'))
  applyMigrations(opened.db)
  sqlite = opened.sqlite
  sqlite.pragma('foreign_keys = OFF')
  sqlite.prepare('INSERT INTO deck_crews (deck_id, crew_id) VALUES (?, ?), (?, ?)').run('deck', 'crewA', 'deck', 'crewB')
  sqlite.prepare('INSERT INTO crew_fsrs_params (crew_id, status, adopted_weights) VALUES (?, \'done\', ?)').run('crewA', JSON.stringify(fitted))
  sqlite.prepare('INSERT INTO memberships (crew_id, user_id) VALUES (?, ?)').run('crewA', 'trainee')
})

afterAll(() => {
  sqlite?.close()
  rmSync(dir, { recursive: true, force: true })
})

describe('the parameters a call uses', () => {
  it('are those of the trainee\'s crew now, also right after the trainee moves to another crew', () => {
    expect(weightsForCall(sqlite, 'trainee', 'deck')).toEqual(fitted)
    // moved by a lead or an admin: out of crew A, into crew B (no fit of its own: the defaults)
    sqlite.prepare('DELETE FROM memberships WHERE crew_id = ? AND user_id = ?').run('crewA', 'trainee')
    sqlite.prepare('INSERT INTO memberships (crew_id, user_id) VALUES (?, ?)').run('crewB', 'trainee')
    expect(weightsForCall(sqlite, 'trainee', 'deck')).toBeUndefined()
    // and a deck taken away from the crew: no crew's set applies
    sqlite.prepare('DELETE FROM deck_crews WHERE crew_id = ?').run('crewB')
    expect(weightsForCall(sqlite, 'trainee', 'deck')).toBeUndefined()
  })
})
