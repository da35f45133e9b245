// Admin lists (people, the audit log) and the crews of a person, through drizzle's query builder.
import { and, asc, count, desc, eq, inArray, or, sql } from 'drizzle-orm'
import type { SQL } from 'drizzle-orm'
import { alias } from 'drizzle-orm/sqlite-core'
import type { Role } from '#shared/types/roles'
import type { Actor } from '../utils/gate'
import { createError } from 'h3'
import { audit } from '../utils/audit'
import { tables, useDb } from '../utils/db'

// LIKE with the search's own % and _ taken literally.
export function likePattern(q: string) {
  return `%${q.toLowerCase().replace(/[\\%_]/g, c => `\\${c}`)}%`
}

// `text LIKE pattern`, with the backslash of likePattern as the escape.
const likeEscaped = (text: SQL, pattern: string) => sql`${text} LIKE ${pattern} ESCAPE '\\'`

export interface PersonRow {
  id: string
  email: string
  name: string
  disabled: boolean
  createdAt: number
  roles: Role[]
  crewIds: string[]
  crews: { id: string, name: string }[]
}

export function listPeople(q: string, page: number, size: number): { total: number, people: PersonRow[] } {
  const db = useDb()
  const u = tables.users
  const like = likePattern(q)
  const where = q ? or(likeEscaped(sql`lower(${u.name})`, like), likeEscaped(sql`lower(${u.email})`, like)) : undefined
  const total = db.select({ n: count() }).from(u).where(where).get()!.n
  const rows = db.select({ id: u.id, email: u.email, name: u.name, disabled: u.disabled, createdAt: u.createdAt }).from(u).where(where)
    .orderBy(sql`${u.name} COLLATE NOCASE`, asc(u.id)).limit(size).offset((page - 1) * size).all()
  const ids = rows.map(r => r.id)
  const roles = ids.length
    ? db.select().from(tables.userRoles).where(inArray(tables.userRoles.userId, ids)).orderBy(asc(tables.userRoles.role)).all()
    : []
  const crews = ids.length
    ? db.select({ userId: tables.memberships.userId, id: tables.crews.id, name: tables.crews.name }).from(tables.memberships)
        .innerJoin(tables.crews, eq(tables.crews.id, tables.memberships.crewId))
        .where(inArray(tables.memberships.userId, ids)).orderBy(asc(tables.crews.name)).all()
    : []
  return {
    total,
    people: rows.map((r) => {
      const own = crews.filter(c => c.userId === r.id).map(c => ({ id: c.id, name: c.name }))
      return { ...r, roles: roles.filter(x => x.userId === r.id).map(x => x.role), crews: own, crewIds: own.map(c => c.id) }
    }),
  }
}

// Sets a person's crews to exactly `crewIds`: joins and leaves in one transaction, one audit row each.
export function setPersonCrews(actor: Actor, userId: string, crewIds: string[]) {
  const db = useDb()
  const m = tables.memberships
  const wanted = [...new Set(crewIds)]
  const known = wanted.length ? db.select({ id: tables.crews.id }).from(tables.crews).where(inArray(tables.crews.id, wanted)).all().map(r => r.id) : []
  const unknown = wanted.filter(id => !known.includes(id))
  if (unknown.length) throw createError({ statusCode: 404, message: 'One of the chosen crews no longer exists. Reload the page and choose again.' })
  const current = db.select({ crewId: m.crewId }).from(m).where(eq(m.userId, userId)).all().map(r => r.crewId)
  const added = wanted.filter(id => !current.includes(id))
  const removed = current.filter(id => !wanted.includes(id))
  db.transaction((tx) => {
    for (const id of added) tx.insert(m).values({ crewId: id, userId, createdAt: Date.now() }).onConflictDoNothing().run()
    for (const id of removed) tx.delete(m).where(and(eq(m.crewId, id), eq(m.userId, userId))).run()
    for (const id of added) audit(actor, 'crew.member.add', 'crew', id, { userId })
    for (const id of removed) audit(actor, 'crew.member.remove', 'crew', id, { userId })
  })
  return { added, removed }
}

export interface AuditEntry {
  id: string
  action: string
  subjectType: string
  subjectId: string | null
  detail: Record<string, unknown> | null
  createdAt: number
  actorName: string | null
  // Names of the people, crews, decks and checks the entry points at by id.
  names: Record<string, string>
}

const NAMED_KEYS = ['userId', 'crewId', 'crewIds', 'checkId', 'deckId', 'deckIds', 'targetTypeId', 'definitionId', 'from']

function idsIn(detail: Record<string, unknown> | null): string[] {
  if (!detail) return []
  return NAMED_KEYS.flatMap((k) => {
    const v = detail[k]
    return typeof v === 'string' ? [v] : Array.isArray(v) ? v.filter((x): x is string => typeof x === 'string') : []
  })
}

export function listAudit(opts: { q: string, action: string, page: number, size: number }): { total: number, entries: AuditEntry[] } {
  const db = useDb()
  const a = tables.auditLog
  // The actor, under its own name: the search's subqueries read the users table again.
  const actor = alias(tables.users, 'actor')
  const conds: SQL[] = []
  if (opts.action) conds.push(eq(a.action, opts.action))
  if (opts.q) {
    const like = likePattern(opts.q)
    // Who acted, what, the detail's text, and the person or crew the entry is about.
    conds.push(or(
      likeEscaped(sql`lower(coalesce(${actor.name}, ''))`, like),
      likeEscaped(sql`${a.action}`, like),
      likeEscaped(sql`lower(coalesce(${a.detail}, ''))`, like),
      likeEscaped(sql`lower(coalesce((SELECT name FROM users WHERE id = ${a.subjectId}), (SELECT name FROM crews WHERE id = ${a.subjectId}), ''))`, like),
      likeEscaped(sql`lower(coalesce((SELECT name FROM users WHERE id = json_extract(${a.detail}, '$.userId')), ''))`, like),
    )!)
  }
  const where = conds.length ? and(...conds) : undefined
  const total = db.select({ n: count() }).from(a).leftJoin(actor, eq(actor.id, a.actorId)).where(where).get()!.n
  const rows = db.select({
    id: a.id, action: a.action, subjectType: a.subjectType, subjectId: a.subjectId, detail: a.detail, createdAt: a.createdAt, actorName: actor.name,
  }).from(a).leftJoin(actor, eq(actor.id, a.actorId)).where(where)
    .orderBy(desc(a.createdAt), asc(a.id)).limit(opts.size).offset((opts.page - 1) * opts.size).all()
  const entries: AuditEntry[] = rows.map(r => ({ ...r, detail: r.detail ?? null, names: {} }))
  const ids = [...new Set(entries.flatMap(e => [...(e.subjectId ? [e.subjectId] : []), ...idsIn(e.detail)]))]
  if (ids.length) {
    const found = new Map([
      ...db.select({ id: tables.users.id, name: tables.users.name }).from(tables.users).where(inArray(tables.users.id, ids)).all(),
      ...db.select({ id: tables.crews.id, name: tables.crews.name }).from(tables.crews).where(inArray(tables.crews.id, ids)).all(),
      ...db.select({ id: tables.decks.id, name: tables.decks.title }).from(tables.decks).where(inArray(tables.decks.id, ids)).all(),
      ...db.select({ id: tables.checks.id, name: tables.checks.title }).from(tables.checks).where(inArray(tables.checks.id, ids)).all(),
      ...db.select({ id: tables.targetTypes.id, name: tables.targetTypes.name }).from(tables.targetTypes).where(inArray(tables.targetTypes.id, ids)).all(),
    ].map(r => [r.id, r.name]))
    for (const e of entries) {
      for (const id of [...(e.subjectId ? [e.subjectId] : []), ...idsIn(e.detail)]) {
        const name = found.get(id)
        if (name) e.names[id] = name
      }
    }
  }
  return { total, entries }
}

export function auditActions(): { name: string, count: number }[] {
  const a = tables.auditLog
  return useDb().select({ name: a.action, count: count() }).from(a).groupBy(a.action).orderBy(asc(a.action)).all()
}
