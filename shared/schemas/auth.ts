import { z } from 'zod'
import { ROLES } from '../types/roles'

// Password length per NIST SP 800-63B §5.1.1: at least 8 characters, no composition rules.
// The common-password list is checked on the server (it is too large for the phone).
export const PASSWORD_MIN = 8
export const PASSWORD_MAX = 128

export const Email = z.string().trim().toLowerCase().max(254).email('Enter a valid e-mail address.')
export const NewPassword = z.string()
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters.`)
  .max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`)
export const PersonName = z.string().trim().min(1, 'Enter a name.').max(80, 'Use at most 80 characters.')
export const Token = z.string().min(20).max(200).regex(/^[\w-]+$/, 'This link is not valid.')
export const Id = z.string().min(8).max(40).regex(/^[\w-]+$/, 'Not a valid id.')

export const LoginBody = z.object({
  email: z.string().trim().toLowerCase().min(1, 'Enter your e-mail address.').max(254),
  password: z.string().min(1, 'Enter your password.').max(PASSWORD_MAX),
}).strict()

export const ResetRequestBody = z.object({ email: Email }).strict()
export const ResetBody = z.object({ token: Token, password: NewPassword }).strict()

export const InviteBody = z.object({
  email: Email,
  role: z.enum(ROLES),
  crewId: Id.nullable().optional(),
}).strict()

export const AcceptInviteBody = z.object({ token: Token, name: PersonName, password: NewPassword }).strict()

export const CrewBody = z.object({ name: z.string().trim().min(2, 'Use at least 2 characters.').max(60) }).strict()
export const CrewPatch = z.object({
  name: z.string().trim().min(2).max(60).optional(),
  minAccuracy: z.number().min(0.5).max(1).optional(),
  minCallsPerTrack: z.number().int().min(1).max(20).optional(),
  windowDays: z.number().int().min(1).max(90).optional(),
  offlineCounts: z.boolean().optional(),
}).strict()

export const MemberBody = z.object({ userId: Id }).strict()

export const UserPatch = z.object({
  name: PersonName.optional(),
  roles: z.array(z.enum(ROLES)).min(1, 'Give at least one role.').max(4).optional(),
  disabled: z.boolean().optional(),
}).strict()

export const PrefsPatch = z.object({
  name: PersonName.optional(),
  digestOptOut: z.boolean().optional(),
  nightMode: z.enum(['auto', 'day', 'night']).optional(),
  remindersOptOut: z.boolean().optional(),
}).strict()
