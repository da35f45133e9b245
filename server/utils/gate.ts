import type { H3Event } from 'h3'
import { and, eq, inArray } from 'drizzle-orm'
import type { Role } from '#shared/types/roles'

export interface Actor {
  id: string
  email: string
  name: string
  roles: Role[]
  crewIds: string[]
}

declare module 'h3' {
  interface H3EventContext {
    actor?: Actor
  }
}

const signedOut = () => createError({ statusCode: 401, message: 'Sign in to continue.' })

// The one gate of every route: a sealed session whose account still exists, is enabled and
// carries the current session version (raised at sign-out and disable). Roles and crews are
// read from the database on every request, so a change takes effect on the next one.
export async function requireActor(event: H3Event): Promise<Actor> {
  if (event.context.actor) return event.context.actor
  const session = await getUserSession(event)
  if (!session.user?.id) throw signedOut()
  const db = useDb()
  const user = db.select().from(tables.users).where(eq(tables.users.id, session.user.id)).get()
  if (!user || user.disabled || user.sessionVersion !== session.sv) {
    await clearUserSession(event)
    throw signedOut()
  }
  const roles = db.select({ role: tables.userRoles.role }).from(tables.userRoles)
    .where(eq(tables.userRoles.userId, user.id)).all().map(r => r.role as Role)
  const crewIds = db.select({ crewId: tables.memberships.crewId }).from(tables.memberships)
    .where(eq(tables.memberships.userId, user.id)).all().map(r => r.crewId)
  const actor: Actor = { id: user.id, email: user.email, name: user.name, roles, crewIds }
  event.context.actor = actor
  return actor
}

export function hasRole(actor: Actor, ...roles: Role[]) {
  return roles.some(r => actor.roles.includes(r))
}

// Signed in and holding one of the roles, else 403.
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<Actor> {
  const actor = await requireActor(event)
  if (!hasRole(actor, ...roles)) {
    throw createError({ statusCode: 403, message: `This needs the ${roles.join(' or ')} role.` })
  }
  return actor
}

// One of the roles in this crew (its member), or admin of the unit. Unknown crews answer 404
// only to those who could see them; others get the same 403 as for another crew.
export async function requireCrewRole(event: H3Event, crewId: string, ...roles: Role[]): Promise<Actor> {
  const actor = await requireActor(event)
  if (actor.roles.includes('admin')) {
    const crew = useDb().select({ id: tables.crews.id }).from(tables.crews).where(eq(tables.crews.id, crewId)).get()
    if (!crew) throw createError({ statusCode: 404, message: 'No such crew.' })
    return actor
  }
  if (!hasRole(actor, ...roles) || !actor.crewIds.includes(crewId)) {
    throw createError({ statusCode: 403, message: 'You do not have access to this crew.' })
  }
  return actor
}

// Is the user a member of one of the crews the actor leads (or instructs)?
export function sharesCrew(actor: Actor, userId: string) {
  if (!actor.crewIds.length) return false
  return !!useDb().select({ u: tables.memberships.userId }).from(tables.memberships)
    .where(and(eq(tables.memberships.userId, userId), inArray(tables.memberships.crewId, actor.crewIds))).get()
}
