import { randomInt } from 'node:crypto'
import { and, desc, eq, inArray, isNull } from 'drizzle-orm'
import { PRACTICE_SCAN_SETTINGS } from '#shared/schemas/scan'
import type { ScanDrillSettingsT, ScanPassBodyT, ScanPassStartBodyT } from '#shared/schemas/scan'
import { median } from '#shared/utils/statistics'
import { placeScanContacts, scoreScanPass } from '#shared/utils/scan-scene'
import { scanPassProblem } from '#shared/utils/scan-checks'
import type { ScanPassSummary } from '#shared/utils/scan-scene'
import type { Actor } from '../utils/gate'
import { createError } from 'h3'
import { audit } from '../utils/audit'
import { tables, useDb } from '../utils/db'
import { hasRole } from '../utils/gate'
import { newId } from '../utils/ids'

export interface ScanDrillView {
  id: string
  title: string
  settings: ScanDrillSettingsT
  crewIds: string[]
  mine: boolean
  createdAt: number
  updatedAt: number
}

const noScanDrill = () => createError({ statusCode: 404, message: 'No such scan drill, or it is not assigned to your crews.' })

function scanDrillCrewsOf(scanDrillIds: string[]) {
  if (!scanDrillIds.length) return new Map<string, string[]>()
  const rows = useDb().select().from(tables.scanDrillCrews).where(inArray(tables.scanDrillCrews.drillId, scanDrillIds)).all()
  const map = new Map<string, string[]>()
  for (const r of rows) map.set(r.drillId, [...(map.get(r.drillId) ?? []), r.crewId])
  return map
}

// Admins see every drill; everyone else the drills assigned to their crews, and instructors their own.
export function listScanDrills(actor: Actor): ScanDrillView[] {
  const db = useDb()
  const admin = hasRole(actor, 'admin')
  let rows = db.select().from(tables.scanDrills).orderBy(desc(tables.scanDrills.updatedAt)).all()
  const crews = scanDrillCrewsOf(rows.map(r => r.id))
  if (!admin) {
    rows = rows.filter(r => (r.createdBy === actor.id && hasRole(actor, 'instructor'))
      || (crews.get(r.id) ?? []).some(c => actor.crewIds.includes(c)))
  }
  return rows.map(r => ({
    id: r.id,
    title: r.title,
    settings: r.settings as ScanDrillSettingsT,
    // Only the crews the person may see.
    crewIds: (crews.get(r.id) ?? []).filter(c => admin || actor.crewIds.includes(c)),
    mine: r.createdBy === actor.id,
    createdAt: r.createdAt,
    updatedAt: r.updatedAt,
  }))
}

export function visibleScanDrill(actor: Actor, id: string): ScanDrillView | null {
  return listScanDrills(actor).find(d => d.id === id) ?? null
}

// A drill the actor may change: their own, or any for an admin.
function ownScanDrill(actor: Actor, id: string) {
  const scanDrill = useDb().select().from(tables.scanDrills).where(eq(tables.scanDrills.id, id)).get()
  const visible = scanDrill && (hasRole(actor, 'admin') || scanDrill.createdBy === actor.id || visibleScanDrill(actor, id))
  if (!scanDrill || !visible) throw noScanDrill()
  if (!hasRole(actor, 'admin') && scanDrill.createdBy !== actor.id) {
    throw createError({ statusCode: 403, message: 'Only the instructor who made this drill (or an admin) can change it.' })
  }
  return scanDrill
}

export function createScanDrill(actor: Actor, title: string, settings: ScanDrillSettingsT): ScanDrillView {
  const id = newId()
  useDb().insert(tables.scanDrills).values({ id, title, settings, createdBy: actor.id }).run()
  audit(actor, 'scan-drill.create', 'scan_drill', id, { title })
  return visibleScanDrill(actor, id)!
}

export function updateScanDrill(actor: Actor, id: string, patch: { title?: string, settings?: ScanDrillSettingsT }): ScanDrillView {
  ownScanDrill(actor, id)
  useDb().update(tables.scanDrills).set({ ...patch, updatedAt: Date.now() }).where(eq(tables.scanDrills.id, id)).run()
  audit(actor, 'scan-drill.update', 'scan_drill', id, { fields: Object.keys(patch) })
  return visibleScanDrill(actor, id)!
}

// Replaces the drill's crews among those the actor may assign (own crews; any for an admin);
// assignments to crews outside them stay as they are.
export function setScanDrillCrews(actor: Actor, id: string, crewIds: string[]): ScanDrillView {
  ownScanDrill(actor, id)
  const db = useDb()
  const admin = hasRole(actor, 'admin')
  const foreign = crewIds.filter(c => !admin && !actor.crewIds.includes(c))
  if (foreign.length) throw createError({ statusCode: 403, message: 'You can assign a drill only to your own crews.' })
  const known = crewIds.length
    ? db.select({ id: tables.crews.id }).from(tables.crews).where(inArray(tables.crews.id, crewIds)).all().map(c => c.id)
    : []
  if (known.length !== crewIds.length) throw createError({ statusCode: 404, message: 'One of those crews does not exist.' })
  db.transaction((tx) => {
    const current = tx.select().from(tables.scanDrillCrews).where(eq(tables.scanDrillCrews.drillId, id)).all()
    for (const row of current) {
      if ((admin || actor.crewIds.includes(row.crewId)) && !crewIds.includes(row.crewId)) {
        tx.delete(tables.scanDrillCrews).where(and(eq(tables.scanDrillCrews.drillId, id), eq(tables.scanDrillCrews.crewId, row.crewId))).run()
      }
    }
    for (const crewId of crewIds) {
      if (!current.some(r => r.crewId === crewId)) tx.insert(tables.scanDrillCrews).values({ drillId: id, crewId }).run()
    }
    tx.update(tables.scanDrills).set({ updatedAt: Date.now() }).where(eq(tables.scanDrills.id, id)).run()
  })
  audit(actor, 'scan-drill.crews', 'scan_drill', id, { crewIds })
  return visibleScanDrill(actor, id)!
}

// Samples closer than this to the one kept before add nothing a person can do, and would let a
// crafted pass make the stop search slow.
const MIN_SAMPLE_SPACING_MS = 10

function thinSamples(samples: ScanPassBodyT['samples']) {
  const kept: ScanPassBodyT['samples'] = []
  samples.forEach((s, i) => {
    const last = kept[kept.length - 1]
    if (!last || s.tMs - last.tMs >= MIN_SAMPLE_SPACING_MS || i === samples.length - 1) kept.push(s)
  })
  return kept
}

// The phone starts its clock when the start's answer arrives, so the server's clock runs ahead of
// it; this much slack covers timer rounding.
const CLOCK_SLACK_MS = 1000
// A started pass may be sent up to this long after its length has run (a slow network, a retry).
const SEND_WINDOW_MS = 10 * 60_000

export interface ScanPassStart {
  id: string
  drillId: string | null
  seed: number
  settings: ScanDrillSettingsT
  issuedAt: number
}

/**
 * Starts a pass: the settings it runs with (an assigned drill's, or the practice sector's, never
 * longer than their own length) and its seed, drawn here unless the practice sector is replayed
 * with a chosen one. The start is stored; its pass may be sent once.
 */
export function startScanPass(actor: Actor, body: ScanPassStartBodyT): ScanPassStart {
  let settings: ScanDrillSettingsT = PRACTICE_SCAN_SETTINGS
  if (body.drillId) {
    const scanDrill = visibleScanDrill(actor, body.drillId)
    if (!scanDrill) throw noScanDrill()
    if (body.seed !== undefined) {
      throw createError({ statusCode: 400, message: 'seed: an assigned drill takes the seed the server draws; choose a seed for the practice sector only.' })
    }
    settings = scanDrill.settings
  }
  settings = { ...settings, lengthS: Math.min(settings.lengthS, body.lengthS ?? settings.lengthS) }
  const seed = body.seed ?? randomInt(0, 2 ** 32)
  const start = { id: newId(), drillId: body.drillId, seed, settings, issuedAt: Date.now() }
  useDb().insert(tables.scanStarts).values({ ...start, userId: actor.id, seedChosen: body.seed !== undefined }).run()
  return start
}

const badPass = (message: string) => createError({ statusCode: 400, message })

export interface StoredScanPass {
  id: string
  userId: string
  drillId: string | null
  createdAt: number
  coverage: number
  contactsFound: number
  contactsShown: number
  score: ScanPassSummary & { settings: ScanDrillSettingsT, drillTitle: string | null, seed: number, seedChosen: boolean }
}

/**
 * Scores a pass on the server and stores it: the scene is rebuilt from the start's seed and
 * settings, the samples and reports must be what the drill can produce (scanPassProblem), and
 * the pass cannot claim more time than has passed since its start. Any score or scene the
 * client sent is never read. A start's pass is stored once.
 */
export function recordScanPass(actor: Actor, body: ScanPassBodyT): StoredScanPass {
  const db = useDb()
  const start = db.select().from(tables.scanStarts)
    .where(and(eq(tables.scanStarts.id, body.startId), eq(tables.scanStarts.userId, actor.id))).get()
  if (!start) throw badPass('startId: this pass was never started for you; start a pass and send its own samples.')
  if (start.usedAt !== null) {
    throw createError({ statusCode: 409, message: 'This pass was already sent and scored; start a new pass.' })
  }
  const settings = start.settings as ScanDrillSettingsT
  const now = Date.now()
  const since = now - start.issuedAt
  if (since > settings.lengthS * 1000 + SEND_WINDOW_MS) {
    throw badPass(`This pass was started ${Math.round(since / 60_000)} minutes ago, too long ago to be scored; start a new pass.`)
  }
  const contacts = placeScanContacts(settings, start.seed)
  const problem = scanPassProblem({ config: settings, contacts, samples: body.samples, reports: body.reports })
  if (problem) throw badPass(problem)
  const lastMs = body.samples[body.samples.length - 1]!.tMs
  if (lastMs > since + CLOCK_SLACK_MS) {
    throw badPass(`samples: the pass runs ${(lastMs / 1000).toFixed(1)} s, but it was started only ${(since / 1000).toFixed(1)} s ago.`)
  }

  const summary = scoreScanPass({ config: settings, samples: thinSamples(body.samples), contacts, reports: body.reports })
  let drillTitle: string | null = null
  if (start.drillId) drillTitle = db.select({ title: tables.scanDrills.title }).from(tables.scanDrills).where(eq(tables.scanDrills.id, start.drillId)).get()?.title ?? null
  const id = newId()
  const score = { ...summary, settings, drillTitle, seed: start.seed, seedChosen: start.seedChosen }
  db.transaction((tx) => {
    // The start is spent in the same transaction, so two sends of one pass store it once.
    const spent = tx.update(tables.scanStarts).set({ usedAt: now })
      .where(and(eq(tables.scanStarts.id, start.id), isNull(tables.scanStarts.usedAt))).run()
    if (spent.changes !== 1) throw createError({ statusCode: 409, message: 'This pass was already sent and scored; start a new pass.' })
    tx.insert(tables.scanPasses).values({
      id,
      userId: actor.id,
      drillId: start.drillId,
      score,
      coverage: summary.coverage,
      contactsFound: summary.contactsFound,
      contactsShown: summary.contactsShown,
      createdAt: now,
    }).run()
  })
  return { id, userId: actor.id, drillId: start.drillId, createdAt: now, coverage: summary.coverage, contactsFound: summary.contactsFound, contactsShown: summary.contactsShown, score }
}

export function listScanPasses(userId: string, limit = 50): StoredScanPass[] {
  return useDb().select().from(tables.scanPasses).where(eq(tables.scanPasses.userId, userId))
    .orderBy(desc(tables.scanPasses.createdAt)).limit(limit).all()
    .map(p => ({ ...p, score: p.score as unknown as StoredScanPass['score'] }))
}

export interface CrewScanRow {
  userId: string
  name: string
  passes: number
  latest: { at: number, coverage: number, gaps: number, sweeping: boolean, contactsFound: number, contactsShown: number } | null
  medianCoverage: number | null
  medianGaps: number | null
  sweepingShare: number | null
  contactsFoundShare: number | null
  medianDetectMs: number | null
}

// Per member of the crew: the latest pass and the medians over all their passes.
export function crewScanSummary(crewId: string): CrewScanRow[] {
  const db = useDb()
  const members = db.select({ id: tables.users.id, name: tables.users.name })
    .from(tables.memberships).innerJoin(tables.users, eq(tables.users.id, tables.memberships.userId))
    .where(eq(tables.memberships.crewId, crewId)).orderBy(tables.users.name).all()
  if (!members.length) return []
  const passes = db.select().from(tables.scanPasses).where(inArray(tables.scanPasses.userId, members.map(m => m.id)))
    .orderBy(desc(tables.scanPasses.createdAt)).all()
  return members.map((m) => {
    const own = passes.filter(p => p.userId === m.id)
    const scores = own.map(p => p.score as unknown as ScanPassSummary)
    const shown = own.reduce((n, p) => n + p.contactsShown, 0)
    const found = own.reduce((n, p) => n + p.contactsFound, 0)
    const detects = scores.flatMap(s => s.contacts.filter(c => c.found && c.detectMs !== null).map(c => c.detectMs!))
    const first = own[0]
    return {
      userId: m.id,
      name: m.name,
      passes: own.length,
      latest: first
        ? {
            at: first.createdAt,
            coverage: first.coverage,
            gaps: scores[0]!.gaps.length,
            sweeping: scores[0]!.sweeping,
            contactsFound: first.contactsFound,
            contactsShown: first.contactsShown,
          }
        : null,
      medianCoverage: own.length ? median(own.map(p => p.coverage)) : null,
      medianGaps: own.length ? median(scores.map(s => s.gaps.length)) : null,
      sweepingShare: own.length ? scores.filter(s => s.sweeping).length / own.length : null,
      contactsFoundShare: shown ? found / shown : null,
      medianDetectMs: detects.length ? median(detects) : null,
    }
  })
}
