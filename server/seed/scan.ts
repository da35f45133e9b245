// Two invented scan drills made by the demo instructor and assigned to both demo crews.
import { eq } from 'drizzle-orm'
import type { ScanDrillSettingsT } from '../../shared/schemas/scan'
import type { GlintDb } from '../database/client'
import * as t from '../database/schema'
import { newId } from '../utils/ids'
import type { SeedContext } from './decks'

export const DEMO_SCAN_DRILLS: { title: string, settings: ScanDrillSettingsT }[] = [
  {
    title: 'Harbour approach, surface sweep',
    settings: {
      startBearing: 300, endBearing: 30, mode: 'surface', field: 'binoculars', stepDeg: 5, dwellMs: 1000,
      contactsPerMinute: 2, conditions: ['sunlit', 'haze', 'white-cloud'], categories: ['vessel', 'aircraft'], lengthS: 180,
    },
  },
  {
    title: 'Low sky search, eastern arc',
    settings: {
      startBearing: 60, endBearing: 120, mode: 'sky', field: 'binoculars', stepDeg: 5, dwellMs: 1000,
      contactsPerMinute: 3, conditions: ['backlit', 'dark-cloud', 'goggles'], categories: ['aircraft'], lengthS: 240,
    },
  },
]

// Creates what is missing (drills are found by title); running it again changes nothing.
export async function seedScan(db: GlintDb, ctx: SeedContext) {
  const instructor = db.select({ id: t.users.id }).from(t.users).where(eq(t.users.email, 'instructor@glint.demo')).get()
  if (!instructor) return { created: 0 }
  let created = 0
  for (const d of DEMO_SCAN_DRILLS) {
    if (db.select({ id: t.scanDrills.id }).from(t.scanDrills).where(eq(t.scanDrills.title, d.title)).get()) continue
    const id = newId()
    db.transaction((tx) => {
      tx.insert(t.scanDrills).values({ id, title: d.title, settings: d.settings, createdBy: instructor.id }).run()
      for (const crewId of ctx.crewIds) tx.insert(t.scanDrillCrews).values({ drillId: id, crewId }).run()
    })
    created++
  }
  return { created }
}
