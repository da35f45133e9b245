// npm run db:seed: the invented demo scenario. Idempotent: a second run changes nothing.
import { applyMigrations, databasePath, openDatabase } from '../database/client'
import { seedPeople } from '../seed/people'

const { db, sqlite } = openDatabase(databasePath())
applyMigrations(db)
const people = await seedPeople(db)
console.log(`demo people: ${people.created} created`)
sqlite.close()
