// Opens Glint's SQLite file with the settings the project relies on (see DEVELOPERS.md, Durability).
import { mkdirSync } from 'node:fs'
import { dirname, resolve } from 'node:path'
import Database from 'better-sqlite3'
import { drizzle } from 'drizzle-orm/better-sqlite3'
import { migrate } from 'drizzle-orm/better-sqlite3/migrator'
import * as schema from './schema'

export type GlintDb = ReturnType<typeof openDatabase>['db']

export function openDatabase(path: string) {
  const file = resolve(path)
  mkdirSync(dirname(file), { recursive: true })
  const sqlite = new Database(file)
  // WAL: readers never block the writer. synchronous=NORMAL in WAL mode keeps every committed
  // transaction across a process crash (only a power cut can lose the last commits).
  sqlite.pragma('journal_mode = WAL')
  sqlite.pragma('synchronous = NORMAL')
  sqlite.pragma('foreign_keys = ON')
  sqlite.pragma('busy_timeout = 5000')
  const db = drizzle(sqlite, { schema })
  return { sqlite, db }
}

export function migrationsFolder() {
  return resolve(process.env.GLINT_MIGRATIONS_DIR || 'drizzle')
}

export function applyMigrations(db: GlintDb) {
  migrate(db, { migrationsFolder: migrationsFolder() })
}

export function databasePath() {
  return process.env.NUXT_DATABASE_PATH || '.data/glint.sqlite'
}
