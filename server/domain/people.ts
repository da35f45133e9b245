import { eq } from 'drizzle-orm'
import type { Me } from '#shared/types/roles'
import type { Actor } from '../utils/gate'

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
    nightMode: (user?.nightMode ?? 'auto') as Me['nightMode'],
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
