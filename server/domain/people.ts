// People: accounts, their sessions, their own settings and password, and an admin's changes to them.
import { eq, sql } from 'drizzle-orm'
import type { z } from 'zod'
import type { Me } from '#shared/types/roles'
import type { PrefsPatch, UserPatch } from '#shared/schemas/auth'
import type { Actor } from '../utils/gate'
import { createError } from 'h3'
import { audit } from '../utils/audit'
import { tables, useDb } from '../utils/db'
import { requireActor } from '../utils/gate'
// hashPassword, verifyPassword and replaceUserSession are nuxt-auth-utils' (Nitro auto-imports: the module
// declares no importable path for them).

export function findUserByEmail(email: string) {
  return useDb().select().from(tables.users).where(eq(tables.users.email, email.toLowerCase())).get()
}

export function crewsOf(userId: string) {
  return useDb().select({ id: tables.crews.id, name: tables.crews.name })
    .from(tables.memberships).innerJoin(tables.crews, eq(tables.crews.id, tables.memberships.crewId))
    .where(eq(tables.memberships.userId, userId)).orderBy(tables.crews.name).all()
}

export function meOf(actor: Actor): Me {
  const user = useDb().select({ nightMode: tables.users.nightMode }).from(tables.users).where(eq(tables.users.id, actor.id)).get()
  return {
    id: actor.id,
    email: actor.email,
    name: actor.name,
    roles: actor.roles,
    crews: crewsOf(actor.id),
    nightMode: user?.nightMode ?? 'auto',
  }
}

export function startSession(event: import('h3').H3Event, user: { id: string, sessionVersion: number }) {
  return replaceUserSession(event, { user: { id: user.id }, sv: user.sessionVersion, loggedInAt: Date.now() })
}

// A valid scrypt hash of a random string, used when the account does not exist.
export const DUMMY_HASH = '$scrypt$n=16384,r=8,p=1$xYETPff4jB3740zE9qxOFA$GLxIqZtOv6cUSfS+gpblC0voSFMAHdTVHXR7uPEDJXc8ZE+Ye5QUMlaqLW+9pN1JW5L/Mjl79B5ViRJ4pfs6nw'

// The actor right after sign-in, read from the session just stored on this event.
export async function requireActorFor(event: import('h3').H3Event) {
  event.context.actor = undefined
  return requireActor(event)
}

/** A person by id, or 404. */
export function requirePerson(userId: string) {
  const user = useDb().select().from(tables.users).where(eq(tables.users.id, userId)).get()
  if (!user) throw createError({ statusCode: 404, message: 'No such person.' })
  return user
}

// Raising the session version ends every session sealed with an older one (gate.ts).
export const nextSessionVersion = () => sql`${tables.users.sessionVersion} + 1`

/** Ends every session of the person (sign-out). */
export function endSessions(userId: string) {
  useDb().update(tables.users).set({ sessionVersion: nextSessionVersion(), updatedAt: Date.now() })
    .where(eq(tables.users.id, userId)).run()
}

/** The signed-in person's own name and preferences. */
export function setOwnPrefs(actor: Actor, patch: z.infer<typeof PrefsPatch>) {
  if (!Object.keys(patch).length) return
  useDb().update(tables.users).set({ ...patch, updatedAt: Date.now() }).where(eq(tables.users.id, actor.id)).run()
}

/** Is this the person's current password? */
export async function isCurrentPassword(userId: string, password: string) {
  return verifyPassword(requirePerson(userId).passwordHash, password)
}

/** Stores a new password and ends every session; answers the new session version (the caller reseals its own). */
export async function setOwnPassword(actor: Actor, password: string): Promise<number> {
  const passwordHash = await hashPassword(password)
  const updated = useDb().update(tables.users).set({ passwordHash, sessionVersion: nextSessionVersion(), updatedAt: Date.now() })
    .where(eq(tables.users.id, actor.id)).returning({ sessionVersion: tables.users.sessionVersion }).get()
  audit(actor, 'password.change', 'user', actor.id)
  return updated!.sessionVersion
}

/**
 * An admin's change to a person: name, roles, disabled (disabling ends the person's sessions).
 * An admin cannot disable themself or drop their own admin role.
 */
export function updatePerson(actor: Actor, userId: string, patch: z.infer<typeof UserPatch>) {
  requirePerson(userId)
  if (userId === actor.id && (patch.disabled || (patch.roles && !patch.roles.includes('admin')))) {
    throw createError({ statusCode: 400, message: 'You cannot disable yourself or remove your own admin role.' })
  }
  useDb().transaction((tx) => {
    const set: Partial<typeof tables.users.$inferInsert> = { updatedAt: Date.now() }
    if (patch.name !== undefined) set.name = patch.name
    if (patch.disabled !== undefined) set.disabled = patch.disabled
    tx.update(tables.users).set(patch.disabled ? { ...set, sessionVersion: nextSessionVersion() } : set)
      .where(eq(tables.users.id, userId)).run()
    if (patch.roles) {
      tx.delete(tables.userRoles).where(eq(tables.userRoles.userId, userId)).run()
      for (const role of new Set(patch.roles)) tx.insert(tables.userRoles).values({ userId, role }).run()
    }
  })
  audit(actor, 'user.update', 'user', userId, patch)
}
