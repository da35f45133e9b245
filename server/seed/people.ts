// The invented demo scenario: a coastal watch unit with two stations. All names are invented.
import { eq } from 'drizzle-orm'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import type { GlintDb } from '../database/client'
import * as t from '../database/schema'
import { newId } from '../utils/ids'
import type { Role } from '../../shared/types/roles'

export const DEMO_PASSWORD = 'harbour-lantern-42'

export const DEMO_CREWS = ['Skerrow Point Station', 'Vellan Ness Station'] as const

// Each crew's readiness standard, as its lead set it (invented): Skerrow Point asks every target
// type and aspect once in five weeks; Vellan Ness keeps the defaults (twice in 14 days).
const DEMO_STANDARDS: Record<string, { minAccuracy: number, minCallsPerTrack: number, windowDays: number }> = {
  'Skerrow Point Station': { minAccuracy: 0.85, minCallsPerTrack: 1, windowDays: 35 },
}

export const DEMO_PEOPLE: { email: string, name: string, roles: Role[], crews: number[] }[] = [
  { email: 'admin@glint.demo', name: 'Orla Brenwick', roles: ['admin'], crews: [] },
  { email: 'instructor@glint.demo', name: 'Tamsin Quarrie', roles: ['instructor'], crews: [0, 1] },
  { email: 'lead@glint.demo', name: 'Idris Colquhane', roles: ['lead'], crews: [0] },
  { email: 'lead2@glint.demo', name: 'Maren Astley-Voss', roles: ['lead'], crews: [1] },
  { email: 'trainee@glint.demo', name: 'Nell Farrowby', roles: ['trainee'], crews: [0] },
  { email: 'trainee2@glint.demo', name: 'Jory Penhallow', roles: ['trainee'], crews: [0] },
  { email: 'trainee3@glint.demo', name: 'Ailsa Drummore', roles: ['trainee'], crews: [0] },
  { email: 'trainee4@glint.demo', name: 'Caspar Wendle', roles: ['trainee'], crews: [0] },
  { email: 'trainee5@glint.demo', name: 'Priya Oakhurst', roles: ['trainee'], crews: [1] },
  { email: 'trainee6@glint.demo', name: 'Rafe Tollemy', roles: ['trainee'], crews: [1] },
  { email: 'trainee7@glint.demo', name: 'Sunniva Kell', roles: ['trainee'], crews: [1] },
  { email: 'trainee8@glint.demo', name: 'Oskar Brightling', roles: ['trainee', 'lead'], crews: [1] },
]

// Creates what is missing; running it again changes nothing.
export async function seedPeople(db: GlintDb) {
  const crewIds: string[] = []
  for (const name of DEMO_CREWS) {
    const found = db.select().from(t.crews).where(eq(t.crews.name, name)).get()
    if (found) crewIds.push(found.id)
    else {
      const id = newId()
      db.insert(t.crews).values({ id, name, ...DEMO_STANDARDS[name] }).run()
      crewIds.push(id)
    }
  }
  const hash = await new Scrypt({}).make(DEMO_PASSWORD)
  let created = 0
  for (const p of DEMO_PEOPLE) {
    if (db.select({ id: t.users.id }).from(t.users).where(eq(t.users.email, p.email)).get()) continue
    const id = newId()
    db.transaction((tx) => {
      tx.insert(t.users).values({ id, email: p.email, name: p.name, passwordHash: hash }).run()
      for (const role of p.roles) tx.insert(t.userRoles).values({ userId: id, role }).run()
      for (const c of p.crews) tx.insert(t.memberships).values({ crewId: crewIds[c]!, userId: id }).run()
    })
    created++
  }
  return { crewIds, created }
}
