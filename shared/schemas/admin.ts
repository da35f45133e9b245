import { z } from 'zod'
import { Id, NewPassword } from './auth'

// Paging for admin lists: page from 1; size defaults to the whole of what the list held before paging.
const Page = z.coerce.number({ message: 'page: Give a page number.' }).int('Give a whole page number.').min(1, 'Pages start at 1.').max(10_000, 'Use a page of at most 10000.')
const Search = z.string().trim().max(100, 'Search for at most 100 characters.')

export const PeopleQuery = z.object({
  q: Search.optional(),
  page: Page.optional(),
  size: z.coerce.number().int().min(1, 'Show at least 1 person a page.').max(500, 'Show at most 500 people a page.').optional(),
}).strict()

export const AuditQuery = z.object({
  q: Search.optional(),
  action: z.string().trim().max(60, 'An action name has at most 60 characters.').regex(/^[\w.-]*$/, 'An action name holds letters, digits, dots and dashes.').optional(),
  page: Page.optional(),
  size: z.coerce.number().int().min(1, 'Show at least 1 entry a page.').max(500, 'Show at most 500 entries a page.').optional(),
}).strict()

// The whole set of a person's crews: adding, removing and moving in one change.
export const PersonCrewsBody = z.object({
  crewIds: z.array(Id).max(50, 'A person can be in at most 50 crews.'),
}).strict()

export const PasswordChangeBody = z.object({
  current: z.string().min(1, 'Enter your current password.').max(128),
  password: NewPassword,
}).strict()
