import { sql } from 'drizzle-orm'
import { applyMigrations, openDatabase } from '../database/client'
import type { GlintDb } from '../database/client'

export * as tables from '../database/schema'

let handle: ReturnType<typeof openDatabase> | undefined

// The one database handle of the server; migrations are applied on first use (and at start-up).
export function useDb(): GlintDb {
  if (!handle) {
    handle = openDatabase(useRuntimeConfig().databasePath)
    applyMigrations(handle.db)
  }
  return handle.db
}

// The health route's probe: throws when the database does not answer.
export function pingDatabase() {
  useDb().get(sql`select 1`)
}

export function useSqlite() {
  useDb()
  return handle!.sqlite
}
