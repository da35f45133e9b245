import { applyMigrations, databasePath, openDatabase } from '../database/client'

const { db, sqlite } = openDatabase(databasePath())
applyMigrations(db)
console.log(`migrations applied to ${databasePath()}`)
sqlite.close()
