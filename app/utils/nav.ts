import type { Role } from '#shared/types/roles'

export interface NavItem { to: string, label: string }

// The main menu for a person's roles; each entry is a page that exists.
export function navFor(roles: Role[], has: (...r: Role[]) => boolean, crews: { id: string, name: string }[] = []): NavItem[] {
  const items: NavItem[] = [{ to: '/', label: 'Home' }]
  if (has('trainee')) items.push({ to: '/watch', label: 'Watch' })
  if (has('trainee')) items.push({ to: '/scan', label: 'Scan' })
  if (has('trainee')) items.push({ to: '/people/me', label: 'Progress' })
  if (has('instructor')) items.push({ to: '/decks', label: 'Decks' })
  if (has('instructor', 'admin')) items.push({ to: '/scan/drills', label: 'Scan drills' })
  // A lead's crew table is one tap away: one entry for one crew, an entry a crew (by name) for several.
  if (has('lead')) items.push(...crews.map(c => ({ to: `/crews/${c.id}`, label: crews.length === 1 ? 'Crew' : c.name })))
  if (has('trainee', 'instructor', 'lead')) items.push({ to: '/checks', label: 'Checks' })
  if (has('admin')) items.push({ to: '/admin', label: 'People' }, { to: '/admin/outbox', label: 'Outbox' }, { to: '/admin/audit', label: 'Audit' })
  items.push({ to: '/settings', label: 'Settings' })
  return roles.length ? items : []
}
