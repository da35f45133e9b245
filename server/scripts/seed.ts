// npm run db:seed: the invented demo scenario. Idempotent: a second run changes nothing.
import { resolve } from 'node:path'
import { applyMigrations, databasePath, openDatabase } from '../database/client'
import { seedDecks } from '../seed/decks'
import { seedHistory } from '../seed/history'
import { seedPeople } from '../seed/people'
import { seedScan } from '../seed/scan'

const started = Date.now()
const { db, sqlite } = openDatabase(databasePath())
applyMigrations(db)
const people = await seedPeople(db)
const ctx = { crewIds: people.crewIds, uploadsDir: resolve(process.env.NUXT_UPLOADS_DIR || 'uploads') }
const decks = await seedDecks(db, ctx)
const history = await seedHistory(db, ctx)
const scan = await seedScan(db, ctx)
console.log(`demo seed: ${people.created} people, ${decks.created} decks, ${history.created} history rows, ${scan.created} scan drills created in ${Date.now() - started} ms`)
sqlite.close()
