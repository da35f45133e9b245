// Admin lists and the crews of a person: plain SQL on the one handle.
import type { Role } from '#shared/types/roles'
import type { Actor } from '../utils/gate'

// LIKE with the search's own % and _ taken literally.
export function likePattern(q: string) {
  return `%${q.toLowerCase().replace(/[\\%_]/g, c => `\\${c}`)}%`
}

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
  const sqlite = useSqlite()
  const where = q ? `WHERE lower(u.name) LIKE ? ESCAPE '\\' OR lower(u.email) LIKE ? ESCAPE '\\'` : ''
  const args = q ? [likePattern(q), likePattern(q)] : []
  const total = sqlite.prepare(`SELECT count(*) FROM users u ${where}`).pluck().get(...args) as number
  const rows = sqlite.prepare(`SELECT u.id, u.email, u.name, u.disabled, u.created_at AS createdAt,
    (SELECT json_group_array(role) FROM (SELECT role FROM user_roles WHERE user_id = u.id ORDER BY role)) AS roles,
    (SELECT json_group_array(json_object('id', c.id, 'name', c.name)) FROM (SELECT c.id, c.name FROM memberships m
      JOIN crews c ON c.id = m.crew_id WHERE m.user_id = u.id ORDER BY c.name) c) AS crews
    FROM users u ${where} ORDER BY u.name COLLATE NOCASE, u.id LIMIT ? OFFSET ?`)
    .all(...args, size, (page - 1) * size) as { id: string, email: string, name: string, disabled: number, createdAt: number, roles: string, crews: string }[]
  return {
    total,
    people: rows.map((r) => {
      const crews = JSON.parse(r.crews) as { id: string, name: string }[]
      return { ...r, disabled: r.disabled === 1, roles: JSON.parse(r.roles) as Role[], crews, crewIds: crews.map(c => c.id) }
    }),
  }
}

// Sets a person's crews to exactly `crewIds`: joins and leaves in one transaction, one audit row each.
export function setPersonCrews(actor: Actor, userId: string, crewIds: string[]) {
  const sqlite = useSqlite()
  const wanted = [...new Set(crewIds)]
  const known = sqlite.prepare(`SELECT id FROM crews WHERE id IN (SELECT value FROM json_each(?))`).pluck().all(JSON.stringify(wanted)) as string[]
  const unknown = wanted.filter(id => !known.includes(id))
  if (unknown.length) throw createError({ statusCode: 404, message: 'One of the chosen crews no longer exists. Reload the page and choose again.' })
  const current = sqlite.prepare('SELECT crew_id FROM memberships WHERE user_id = ?').pluck().all(userId) as string[]
  const added = wanted.filter(id => !current.includes(id))
  const removed = current.filter(id => !wanted.includes(id))
  const add = sqlite.prepare('INSERT OR IGNORE INTO memberships (crew_id, user_id, created_at) VALUES (?, ?, ?)')
  const remove = sqlite.prepare('DELETE FROM memberships WHERE crew_id = ? AND user_id = ?')
  sqlite.transaction(() => {
    for (const id of added) add.run(id, userId, Date.now())
    for (const id of removed) remove.run(id, userId)
    for (const id of added) audit(actor, 'crew.member.add', 'crew', id, { userId })
    for (const id of removed) audit(actor, 'crew.member.remove', 'crew', id, { userId })
  })()
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

const NAMED_KEYS = ['userId', 'crewId', 'crewIds', 'checkId', 'deckId', 'targetTypeId']

function idsIn(detail: Record<string, unknown> | null): string[] {
  if (!detail) return []
  return NAMED_KEYS.flatMap((k) => {
    const v = detail[k]
    return typeof v === 'string' ? [v] : Array.isArray(v) ? v.filter((x): x is string => typeof x === 'string') : []
  })
}

export function listAudit(opts: { q: string, action: string, page: number, size: number }): { total: number, entries: AuditEntry[] } {
  const sqlite = useSqlite()
  const conds: string[] = []
  const args: unknown[] = []
  if (opts.action) {
    conds.push('a.action = ?')
    args.push(opts.action)
  }
  if (opts.q) {
    const like = likePattern(opts.q)
    // Who acted, what, the detail's text, and the person or crew the entry is about.
    conds.push(`(lower(coalesce(u.name, '')) LIKE ? ESCAPE '\\' OR a.action LIKE ? ESCAPE '\\' OR lower(coalesce(a.detail, '')) LIKE ? ESCAPE '\\'
      OR lower(coalesce((SELECT name FROM users WHERE id = a.subject_id), (SELECT name FROM crews WHERE id = a.subject_id), '')) LIKE ? ESCAPE '\\'
      OR lower(coalesce((SELECT name FROM users WHERE id = json_extract(a.detail, '$.userId')), '')) LIKE ? ESCAPE '\\')`)
    args.push(like, like, like, like, like)
  }
  const where = conds.length ? `WHERE ${conds.join(' AND ')}` : ''
  const from = 'FROM audit_log a LEFT JOIN users u ON u.id = a.actor_id'
  const total = sqlite.prepare(`SELECT count(*) ${from} ${where}`).pluck().get(...args) as number
  const rows = sqlite.prepare(`SELECT a.id, a.action, a.subject_type AS subjectType, a.subject_id AS subjectId, a.detail,
    a.created_at AS createdAt, u.name AS actorName ${from} ${where} ORDER BY a.created_at DESC, a.id LIMIT ? OFFSET ?`)
    .all(...args, opts.size, (opts.page - 1) * opts.size) as (Omit<AuditEntry, 'detail' | 'names'> & { detail: string | null })[]
  const entries = rows.map(r => ({ ...r, detail: r.detail ? JSON.parse(r.detail) as Record<string, unknown> : null, names: {} as Record<string, string> }))
  const ids = [...new Set(entries.flatMap(e => [...(e.subjectId ? [e.subjectId] : []), ...idsIn(e.detail)]))]
  if (ids.length) {
    const found = new Map((sqlite.prepare(`SELECT id, name FROM users WHERE id IN (SELECT value FROM json_each(@ids))
      UNION ALL SELECT id, name FROM crews WHERE id IN (SELECT value FROM json_each(@ids))
      UNION ALL SELECT id, title FROM decks WHERE id IN (SELECT value FROM json_each(@ids))
      UNION ALL SELECT id, title FROM checks WHERE id IN (SELECT value FROM json_each(@ids))
      UNION ALL SELECT id, name FROM target_types WHERE id IN (SELECT value FROM json_each(@ids))`)
      .all({ ids: JSON.stringify(ids) }) as { id: string, name: string }[]).map(r => [r.id, r.name]))
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
  return useSqlite().prepare('SELECT action AS name, count(*) AS count FROM audit_log GROUP BY action ORDER BY action').all() as { name: string, count: number }[]
}
