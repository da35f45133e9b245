import { z } from 'zod'
import { ASPECTS, CONDITIONS } from '../utils/conditions'
import type { CallGrade } from '../utils/grade'
import { Id } from './auth'

export const CHECK_SIGHTINGS_MIN = 5
export const CHECK_SIGHTINGS_MAX = 60
export const CHECK_EXPOSURE_MIN_MS = 100
export const CHECK_EXPOSURE_MAX_MS = 4000

function unique<T>(values: T[]) {
  return new Set(values).size === values.length
}

const checkFields = {
  title: z.string({ message: 'Give the check a title.' }).trim().min(1, 'Give the check a title.').max(120, 'Use at most 120 characters.'),
  sightingCount: z.number({ message: 'Enter the number of sightings.' }).int('Use a whole number of sightings.')
    .min(CHECK_SIGHTINGS_MIN, `Use ${CHECK_SIGHTINGS_MIN} to ${CHECK_SIGHTINGS_MAX} sightings.`)
    .max(CHECK_SIGHTINGS_MAX, `Use ${CHECK_SIGHTINGS_MIN} to ${CHECK_SIGHTINGS_MAX} sightings.`),
  exposureMs: z.number({ message: 'Enter the exposure in milliseconds.' }).int('Use whole milliseconds.')
    .min(CHECK_EXPOSURE_MIN_MS, `Use an exposure of ${CHECK_EXPOSURE_MIN_MS} to ${CHECK_EXPOSURE_MAX_MS} ms.`)
    .max(CHECK_EXPOSURE_MAX_MS, `Use an exposure of ${CHECK_EXPOSURE_MIN_MS} to ${CHECK_EXPOSURE_MAX_MS} ms.`),
  conditions: z.array(z.enum(CONDITIONS, { message: 'Not a known condition.' }), { message: 'Choose at least one condition.' })
    .min(1, 'Choose at least one condition.').max(CONDITIONS.length).refine(unique, 'Name each condition once.'),
  aspects: z.array(z.enum(ASPECTS, { message: 'Not a known aspect.' }), { message: 'Choose at least one aspect.' })
    .min(1, 'Choose at least one aspect.').max(ASPECTS.length).refine(unique, 'Name each aspect once.'),
  passMark: z.number({ message: 'Enter the pass mark as a share from 0.5 to 1.' })
    .min(0.5, 'Use a pass mark from 0.5 to 1 (50 to 100 %).').max(1, 'Use a pass mark from 0.5 to 1 (50 to 100 %).'),
}

// The day by which a crew should have taken the check (a calendar date, ISO 8601), or null for none.
const DueDate = z.iso.date({ message: 'Give the due date as a date (YYYY-MM-DD), or leave it empty.' }).nullable()

// A check may show only some of the deck's target types (e.g. the crew's worst look-alike pairs).
const TargetTypeIds = z.array(Id, { message: 'Give targetTypeIds as a list of target type ids.' }).min(2, 'Choose at least two target types.').max(20, 'Choose at most 20 target types.')

export const CheckBody = z.object({ deckId: Id, ...checkFields, dueDate: DueDate.optional(), targetTypeIds: TargetTypeIds.optional() }).strict()
export const CheckPatch = z.object({ ...checkFields, dueDate: DueDate }).partial().strict()

// A lead's sign-off may carry a remark; withdrawing one needs a reason (issue 17, item 11).
export const SignOffBody = z.object({
  remark: z.string().trim().max(500, 'Keep the remark to 500 characters.').optional(),
}).strict()
export const WithdrawSignOffBody = z.object({
  reason: z.string({ message: 'Give the reason for withdrawing the sign-off.' }).trim()
    .min(3, 'Give the reason for withdrawing the sign-off (at least 3 characters).').max(500, 'Keep the reason to 500 characters.'),
}).strict()
  .refine(b => Object.keys(b).length > 0, { message: 'Send at least one field to change.' })

export type CheckInput = z.infer<typeof CheckBody>
export type CheckPatchInput = z.infer<typeof CheckPatch>

export type AttemptStatus = 'running' | 'finished' | 'reset'

export interface CheckView {
  id: string
  deckId: string
  deckTitle: string
  title: string
  sightingCount: number
  exposureMs: number
  conditions: string[]
  aspects: string[]
  passMark: number
  createdBy: string
  createdAt: number
  attempts: number
  // YYYY-MM-DD (due by the end of that UTC day), or null
  dueDate: string | null
  // set once retired: no longer offered, kept with its results
  retiredAt: number | null
  // only these target types of the deck are shown, or null for all
  targetTypeIds: string[] | null
}

export interface AttemptSummary {
  id: string
  checkId: string
  userId: string
  personName: string
  status: AttemptStatus
  score: number | null
  passed: boolean | null
  startedAt: number
  finishedAt: number | null
  signedOffBy: string | null
  signedOffAt: number | null
  signerName: string | null
  signOffRemark: string | null
  // the last withdrawn sign-off, if any
  withdrawn: { name: string, at: number, reason: string } | null
}

// A trainee's view of a check: the newest attempt's status ('none' before the first one).
export interface CheckToTake extends CheckView {
  status: AttemptStatus | 'none'
  attemptId: string | null
  score: number | null
  passed: boolean | null
}

// notTaken: the crew's trainees with no running or finished attempt (never taken, or reset).
export interface CrewChecks { crewId: string, crewName: string, checks: (CheckView & { attemptsOfCrew: AttemptSummary[], notTaken: { userId: string, name: string }[] })[] }

export interface CheckLists {
  // the checks the instructor defined (an admin: every check)
  defined: CheckView[]
  // the trainee's checks, from decks assigned to own crews
  toTake: CheckToTake[]
  // the lead's crews, with their trainees' attempts
  crews: CrewChecks[]
}

export interface CheckCallRecorded {
  recorded: true
  sightingId: string
  // a check call never re-shows a sighting
  appended?: never
}

export interface CheckResultItem {
  position: number
  targetTypeName: string
  aspect: string
  condition: string
  calledName: string | null
  correct: boolean
  latencyMs: number | null
  grade: CallGrade
}

export interface CheckResult {
  attemptId: string
  checkId: string
  title: string
  deckTitle: string
  exposureMs: number
  passMark: number
  sightingCount: number
  person: { id: string, name: string }
  crews: string[]
  status: AttemptStatus
  startedAt: number
  finishedAt: number | null
  right: number
  score: number | null
  passed: boolean | null
  signedOff: { by: string, name: string, at: number, remark: string | null } | null
  withdrawn: { name: string, at: number, reason: string } | null
  items: CheckResultItem[]
}
