// npm run db:backup -- FILE: a consistent online backup of the live database, safe while the
// server runs and finishing however fast it writes.
//
// VACUUM INTO copies the database as of one read transaction (SQLite docs, "VACUUM INTO"): under
// WAL that snapshot never blocks the server's writer nor restarts. The stepwise backup API
// restarts on every change a writer on another connection makes, so under steady calls it never
// finished. The copy is written beside FILE, checked, flushed and only then renamed onto FILE.
import { closeSync, existsSync, fsyncSync, openSync, renameSync, rmSync } from 'node:fs'
import { basename, dirname, join, resolve } from 'node:path'
import Database from 'better-sqlite3'
import { databasePath } from '../database/client'

const target = process.argv[2]
if (!target) {
  console.error('usage: npm run db:backup -- FILE')
  process.exit(2)
}
const source = resolve(databasePath())
if (!existsSync(source)) {
  console.error(`no database at ${source}`)
  process.exit(1)
}
const file = resolve(target)
const partial = join(dirname(file), `.${basename(file)}.partial-${process.pid}`)
const started = Date.now()
let ok: unknown
try {
  const db = new Database(source, { readonly: true, fileMustExist: true })
  db.pragma('busy_timeout = 5000')
  try {
    db.prepare('VACUUM INTO ?').run(partial)
  }
  finally {
    db.close()
  }
  const check = new Database(partial, { readonly: true })
  ok = check.pragma('integrity_check', { simple: true })
  check.close()
  if (ok === 'ok') {
    // The copy reaches the disk before it takes FILE's name (VACUUM INTO itself does not sync).
    const fd = openSync(partial, 'r')
    fsyncSync(fd)
    closeSync(fd)
    renameSync(partial, file)
  }
}
catch (error) {
  ok = `failed: ${(error as Error).message}`
}
finally {
  rmSync(partial, { force: true })
}
if (ok === 'ok') console.log(`backup of ${source} written to ${file} in ${Date.now() - started} ms (integrity: ok)`)
else console.error(`backup of ${source} not written (integrity: ${ok})`)
process.exitCode = ok === 'ok' ? 0 : 1
