// Who may do what: one rule per noun, each written once, used by the routes and the domain alike
// (the gate in server/utils/gate.ts only says who is signed in and with which roles). Covered by
// the access matrix (tests/e2e/access-matrix.ts, run by tests/e2e/access.test.ts).
//
// What an admin may do: an admin oversees everything. Every crew, person, deck and report is open
// to an admin, and an admin manages the accounts, crews, memberships and invitations and assigns
// decks to crews. Two kinds of act stay with the person they belong to, and an admin is refused
// them unless the admin also holds that role and relation: authoring (a deck's content, settings
// and views, and its checks, are changed by the instructor who owns the deck) and leading (a sign-off
// or a reset of a check attempt is the act of a lead of the trainee's crew).
// The pages follow the same split: the deck builder is an instructor's page, a deck's confusions
// (app/pages/confusions/[deckId].vue) an instructor's or an admin's.
import { and, eq, exists, inArray } from 'drizzle-orm'
import type { H3Event } from 'h3'
import type { Actor } from '../utils/gate'
import { requireCrew } from './crews'
import { requirePerson } from './people'
import { createError } from 'h3'
import { tables, useDb } from '../utils/db'
import { hasRole, requireActor, requireRole } from '../utils/gate'

// ---------------------------------------------------------------- crews

/** Leads the crew: holds the lead role and is a member of the crew. */
export function leadsCrew(actor: Actor, crewId: string): boolean {
  return hasRole(actor, 'lead') && actor.crewIds.includes(crewId)
}

/** Teaches the crew: an instructor one of whose decks is assigned to the crew. */
export function teachesCrew(actor: Actor, crewId: string): boolean {
  if (!hasRole(actor, 'instructor')) return false
  const db = useDb()
  return !!db.select({ one: tables.deckCrews.crewId }).from(tables.deckCrews)
    .innerJoin(tables.decks, eq(tables.decks.id, tables.deckCrews.deckId))
    .where(and(eq(tables.deckCrews.crewId, crewId), eq(tables.decks.ownerId, actor.id))).limit(1).get()
}

/** Reads the crew's reports (table, confusions, fitted parameters): an admin, a lead of the crew, an instructor who teaches it. */
export function readsCrewReports(actor: Actor, crewId: string): boolean {
  return hasRole(actor, 'admin') || leadsCrew(actor, crewId) || teachesCrew(actor, crewId)
}

/** The gate of crew reports: 404 for an unknown crew only to an admin, the same 403 as another crew's to everyone else. */
export async function requireCrewReports(event: H3Event, crewId: string): Promise<Actor> {
  const actor = await requireActor(event)
  if (hasRole(actor, 'admin')) {
    requireCrew(crewId)
    return actor
  }
  if (!readsCrewReports(actor, crewId)) throw createError({ statusCode: 403, message: 'You do not have access to this crew.' })
  return actor
}

// ---------------------------------------------------------------- people

/**
 * Leads this person: the crews the actor leads (lead role, member) that the person is in. A
 * lead's powers over a person (reports, check results, reset, sign-off) stop at these crews.
 */
export function crewsLedOver(actor: Actor, userId: string): string[] {
  if (!hasRole(actor, 'lead')) return []
  return sharedCrews(actor, userId)
}

/** The crews the actor and the person are both members of. */
function sharedCrews(actor: Actor, userId: string): string[] {
  if (!actor.crewIds.length) return []
  return useDb().select({ crewId: tables.memberships.crewId }).from(tables.memberships)
    .where(and(eq(tables.memberships.userId, userId), inArray(tables.memberships.crewId, actor.crewIds))).all().map(r => r.crewId)
}

/** Teaches this person: an instructor one of whose decks is assigned to one of the person's crews. */
export function teachesPerson(actor: Actor, userId: string): boolean {
  if (!hasRole(actor, 'instructor')) return false
  const db = useDb()
  const ownDeckInCrew = db.select({ one: tables.deckCrews.crewId }).from(tables.deckCrews)
    .innerJoin(tables.decks, eq(tables.decks.id, tables.deckCrews.deckId))
    .where(and(eq(tables.deckCrews.crewId, tables.memberships.crewId), eq(tables.decks.ownerId, actor.id)))
  return !!db.select({ one: tables.memberships.crewId }).from(tables.memberships)
    .where(and(eq(tables.memberships.userId, userId), exists(ownDeckInCrew))).limit(1).get()
}

/** Whose progress the actor sees, and of which crews: null for all of the person's crews. */
export interface PersonAccess { actor: Actor, crewIds: string[] | null }

/**
 * A person's progress (the person page): the person themself, an admin, and an instructor who
 * teaches the person see all of the person's crews; a lead only the crews the lead leads.
 */
export async function requirePersonAccess(event: H3Event, userId: string): Promise<PersonAccess> {
  const actor = await requireActor(event)
  if (actor.id === userId) return { actor, crewIds: null }
  if (hasRole(actor, 'admin')) {
    requirePerson(userId)
    return { actor, crewIds: null }
  }
  if (teachesPerson(actor, userId)) return { actor, crewIds: null }
  const led = crewsLedOver(actor, userId)
  if (!led.length) throw createError({ statusCode: 403, message: 'You can see the progress of people in your own crews only.' })
  return { actor, crewIds: led }
}

/**
 * A person's scan passes: the person themself, an admin, a lead over the person, and an
 * instructor who is a member of one of the person's crews (scan drills are assigned to crews, not
 * to decks, so an instructor's reach here is the crew itself).
 */
export function seesScanPasses(actor: Actor, userId: string): boolean {
  if (actor.id === userId || hasRole(actor, 'admin')) return true
  if (crewsLedOver(actor, userId).length) return true
  return hasRole(actor, 'instructor') && sharedCrews(actor, userId).length > 0
}

// ---------------------------------------------------------------- decks

/** Builds the deck: its owner, holding the instructor role. Only the builder changes a deck's content, settings and views. */
export function buildsDeck(actor: Actor, deck: { ownerId: string }): boolean {
  return hasRole(actor, 'instructor') && deck.ownerId === actor.id
}

/** Oversees the deck: its builder or an admin. Sees its renderings and its confusions across crews, assigns it to crews. */
export function overseesDeck(actor: Actor, deck: { ownerId: string }): boolean {
  return hasRole(actor, 'admin') || buildsDeck(actor, deck)
}

/**
 * The deck, if the actor oversees it: 403 to any role but instructor and admin, 404 for an unknown
 * deck, 403 for another instructor's deck.
 */
export async function requireDeckOverseer(event: H3Event, deckId: string) {
  const actor = await requireRole(event, 'instructor', 'admin')
  const deck = useDb().select().from(tables.decks).where(eq(tables.decks.id, deckId)).get()
  if (!deck) throw createError({ statusCode: 404, message: 'No such deck.' })
  if (!overseesDeck(actor, deck)) throw createError({ statusCode: 403, message: 'Only the deck\'s own instructor or an admin can do this.' })
  return { actor, deck }
}
