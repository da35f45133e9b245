// npm run db:backup -- FILE: a consistent online backup of the live database (SQLite backup API),
// safe while the server runs.
import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
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
const db = new Database(source, { readonly: true, fileMustExist: true })
db.pragma('busy_timeout = 5000')
const started = Date.now()
await db.backup(resolve(target))
const check = new Database(resolve(target), { readonly: true })
const ok = check.pragma('integrity_check', { simple: true })
check.close()
db.close()
console.log(`backup of ${source} written to ${resolve(target)} in ${Date.now() - started} ms (integrity: ${ok})`)
if (ok !== 'ok') process.exit(1)
