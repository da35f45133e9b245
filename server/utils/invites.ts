import type { Role } from '#shared/types/roles'
import type { Actor } from './gate'

export const INVITE_TTL_MS = 7 * 24 * 60 * 60 * 1000

// Who may invite whom: admin anyone anywhere; a lead trainees and instructors into own crews;
// an instructor trainees into own crews.
export function inviteProblem(actor: Actor, role: Role, crewId: string | null | undefined): string | null {
  if (actor.roles.includes('admin')) return null
  const allowed: Role[] = actor.roles.includes('lead') ? ['trainee', 'instructor'] : actor.roles.includes('instructor') ? ['trainee'] : []
  if (!allowed.length) return 'Only admins, leads and instructors can invite people.'
  if (!allowed.includes(role)) return `You can invite only as ${allowed.join(' or ')}.`
  if (!crewId) return 'Choose one of your crews for the invitation.'
  if (!actor.crewIds.includes(crewId)) return 'You can invite only into your own crews.'
  return null
}
