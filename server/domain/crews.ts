// Crews and their memberships: listing, the crew page, the lead's standard, members in and out,
// and the crew's fitted scheduling parameters (crew-fits.ts) on the server's one handle.
import { and, asc, count, eq, inArray } from 'drizzle-orm'
import type { CrewPatch } from '#shared/schemas/auth'
import type { z } from 'zod'
import type { Actor } from '../utils/gate'
import { crewFitView, startCrewFit } from './crew-fits'
import { createError } from 'h3'
import { audit } from '../utils/audit'
import { tables, useDb, useSqlite } from '../utils/db'
import { hasRole } from '../utils/gate'
import { newId } from '../utils/ids'

const nameTaken = (e: unknown) => {
  if (String(e).includes('UNIQUE')) throw createError({ statusCode: 409, message: 'A crew with that name exists.' })
  throw e
}

/** The crew, or 404. */
export function requireCrew(crewId: string) {
  const crew = useDb().select().from(tables.crews).where(eq(tables.crews.id, crewId)).get()
  if (!crew) throw createError({ statusCode: 404, message: 'No such crew.' })
  return crew
}

/** Every crew for an admin; everyone else the crews they belong to. With the number of members. */
export function listCrews(actor: Actor) {
  if (!hasRole(actor, 'admin') && !actor.crewIds.length) return []
  return useDb().select({ id: tables.crews.id, name: tables.crews.name, members: count(tables.memberships.userId) })
    .from(tables.crews).leftJoin(tables.memberships, eq(tables.memberships.crewId, tables.crews.id))
    .where(hasRole(actor, 'admin') ? undefined : inArray(tables.crews.id, actor.crewIds))
    .groupBy(tables.crews.id).orderBy(asc(tables.crews.name)).all()
}

/** The crew page: its standard and its members with their roles (the gate has checked the crew exists). */
export function crewDetail(crewId: string) {
  const db = useDb()
  const crew = requireCrew(crewId)
  const members = db.select({ id: tables.users.id, name: tables.users.name, email: tables.users.email, disabled: tables.users.disabled })
    .from(tables.memberships).innerJoin(tables.users, eq(tables.users.id, tables.memberships.userId))
    .where(eq(tables.memberships.crewId, crewId)).orderBy(asc(tables.users.name)).all()
  const roles = members.length
    ? db.select().from(tables.userRoles).where(inArray(tables.userRoles.userId, members.map(m => m.id))).all()
    : []
  return {
    id: crew.id,
    name: crew.name,
    standard: { minAccuracy: crew.minAccuracy, minCallsPerTrack: crew.minCallsPerTrack, windowDays: crew.windowDays, offlineCounts: crew.offlineCounts },
    members: members.map(m => ({ ...m, roles: roles.filter(r => r.userId === m.id).map(r => r.role) })),
  }
}

/** A new crew (an admin's act); 409 when the name is taken. */
export function createCrew(actor: Actor, name: string) {
  const id = newId()
  try {
    useDb().insert(tables.crews).values({ id, name }).run()
  }
  catch (e) { nameTaken(e) }
  audit(actor, 'crew.create', 'crew', id, { name })
  return { id, name }
}

/** The crew's name and readiness standard (its lead's act); 409 when the name is taken. */
export function patchCrew(actor: Actor, crewId: string, patch: z.infer<typeof CrewPatch>) {
  if (!Object.keys(patch).length) return
  try {
    useDb().update(tables.crews).set({ ...patch, updatedAt: Date.now() }).where(eq(tables.crews.id, crewId)).run()
  }
  catch (e) { nameTaken(e) }
  audit(actor, 'crew.update', 'crew', crewId, patch)
}

/** An existing account joins the crew (an admin's act); 404 for an unknown person. */
export function addMember(actor: Actor, crewId: string, userId: string) {
  const db = useDb()
  if (!db.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.id, userId)).get()) {
    throw createError({ statusCode: 404, message: 'No such person.' })
  }
  db.insert(tables.memberships).values({ crewId, userId }).onConflictDoNothing().run()
  audit(actor, 'crew.member.add', 'crew', crewId, { userId })
}

/** A member leaves the crew; 404 when the person is not in it. */
export function removeMember(actor: Actor, crewId: string, userId: string) {
  const r = useDb().delete(tables.memberships)
    .where(and(eq(tables.memberships.crewId, crewId), eq(tables.memberships.userId, userId))).run()
  if (!r.changes) throw createError({ statusCode: 404, message: 'That person is not in this crew.' })
  audit(actor, 'crew.member.remove', 'crew', crewId, { userId })
}

/** The crew's fitted scheduling parameters (crew-fits.ts) on the server's handle. */
export const crewFit = (crewId: string) => crewFitView(useSqlite(), crewId)

/** Starts (or joins) a fit of the crew's parameters off the request thread; answers the state at once. */
export function startFit(crewId: string, actorId: string) {
  const sqlite = useSqlite()
  void startCrewFit(sqlite, crewId, actorId)
  return crewFitView(sqlite, crewId)
}
