import type { H3Event } from 'h3'
import { eq } from 'drizzle-orm'
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

const SESSION_COOKIE = 'nuxt-session'
// Unsealing a session cookie costs about a millisecond; the same sealed value always unseals to
// the same data, so it is kept here until the session's own lifetime ends. The account is still
// read from the database on every request, so sign-out and disable take effect at once.
const unsealed = new Map<string, { userId: string, sv: number, until: number }>()
const UNSEALED_MAX = 10_000

async function sessionOf(event: H3Event): Promise<{ userId: string, sv: number } | null> {
  const sealed = parseCookies(event)[SESSION_COOKIE]
  const hit = sealed ? unsealed.get(sealed) : undefined
  if (hit && hit.until > Date.now()) return hit
  const session = await getUserSession(event)
  if (!session.user?.id) return null
  const value = { userId: session.user.id, sv: session.sv, until: (session.loggedInAt ?? 0) + useRuntimeConfig().session.maxAge! * 1000 }
  if (sealed) {
    if (unsealed.size >= UNSEALED_MAX) unsealed.clear()
    unsealed.set(sealed, value)
  }
  return value
}

interface ActorRow { id: string, email: string, name: string, disabled: number, session_version: number, roles: string, crews: string }
let actorRow: ReturnType<typeof prepareActorRow> | undefined
// The account with its roles and crews in one statement (JSON arrays), read on every request.
function prepareActorRow() {
  return useSqlite().prepare<[string], ActorRow>(`SELECT u.id, u.email, u.name, u.disabled, u.session_version,
    (SELECT json_group_array(role) FROM user_roles WHERE user_id = u.id) AS roles,
    (SELECT json_group_array(crew_id) FROM memberships WHERE user_id = u.id) AS crews
    FROM users u WHERE u.id = ?`)
}

// The one gate of every route: a sealed session whose account still exists, is enabled and
// carries the current session version (raised at sign-out and disable). Roles and crews are
// read from the database on every request, so a change takes effect on the next one.
export async function requireActor(event: H3Event): Promise<Actor> {
  if (event.context.actor) return event.context.actor
  const session = await sessionOf(event)
  if (!session) throw signedOut()
  actorRow ??= prepareActorRow()
  const user = actorRow.get(session.userId)
  if (!user || user.disabled || user.session_version !== session.sv) {
    await clearUserSession(event)
    throw signedOut()
  }
  const actor: Actor = {
    id: user.id,
    email: user.email,
    name: user.name,
    roles: JSON.parse(user.roles) as Role[],
    crewIds: JSON.parse(user.crews) as string[],
  }
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
