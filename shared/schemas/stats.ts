import { z } from 'zod'
import { isTimeZone } from '../utils/format'
import { ASPECTS, CONDITIONS } from '../utils/conditions'
import { Id } from './auth'

// Query strings arrive as text: an empty value means "no filter".
const blankToUndefined = (v: unknown) => (v === '' || v === null ? undefined : v)

export const STATS_DEFAULT_DAYS = 30
export const STATS_MAX_DAYS = 366

export const StatsDays = z.preprocess(blankToUndefined, z.coerce.number({ message: 'days: Give a whole number of days.' })
  .int('Give a whole number of days.')
  .min(1, 'Give at least 1 day.')
  .max(STATS_MAX_DAYS, `Give at most ${STATS_MAX_DAYS} days.`)
  .default(STATS_DEFAULT_DAYS))

export const StatsQuery = z.object({
  deckId: z.preprocess(blankToUndefined, Id.optional()),
  days: StatsDays,
  aspect: z.preprocess(blankToUndefined, z.enum(ASPECTS, { message: `Choose an aspect: ${ASPECTS.join(', ')}.` }).optional()),
  condition: z.preprocess(blankToUndefined, z.enum(CONDITIONS, { message: `Choose a condition: ${CONDITIONS.join(', ')}.` }).optional()),
})

// The CSV adds the reader's time zone (IANA name, e.g. Europe/Lisbon) for its times; UTC when left out.
export const StatsCsvQuery = StatsQuery.extend({
  tz: z.preprocess(blankToUndefined, z.string().max(64, 'A time zone name has at most 64 characters.')
    .refine(isTimeZone, 'Unknown time zone: give an IANA name such as Europe/Lisbon.').optional()),
})

export const ConfusionsQuery = z.object({
  deckId: z.preprocess(blankToUndefined, Id.optional()),
  days: StatsDays,
})

export const PersonQuery = z.object({
  deckId: z.preprocess(blankToUndefined, Id.optional()),
  days: StatsDays,
})

export const PersonParam = z.object({ userId: Id })
export const DeckParam = z.object({ id: Id })

export const DIGEST_KINDS = ['weekly', 'daily'] as const
export type DigestKind = typeof DIGEST_KINDS[number]

export const DigestRunBody = z.object({
  kind: z.enum(DIGEST_KINDS, { message: 'kind: Choose weekly or daily.' }),
  // A fixed "now" (ISO 8601), so a past week can be sent or a test can pin its week.
  now: z.string().datetime({ offset: true, message: 'now: Give an ISO 8601 date and time, e.g. 2026-03-02T07:00:00Z.' }).optional(),
}).strict()
