import { z } from 'zod'
import { CONDITIONS } from '../utils/conditions'
import { maxScanSamples } from '../utils/scan-checks'
import { Id } from './auth'

export const SCAN_CATEGORIES = ['aircraft', 'vessel'] as const
export const SCAN_CLOSING = ['closing', 'opening', 'unknown'] as const
export const SCAN_LENGTH_MIN_S = 30
export const SCAN_LENGTH_MAX_S = 600
// The most samples a pass of the longest drill may hold (maxScanSamples: 25 a second).
export const SCAN_MAX_SAMPLES = maxScanSamples(SCAN_LENGTH_MAX_S)
export const SCAN_MAX_REPORTS = 200

const Bearing = z.number({ message: 'Enter a bearing in degrees.' })
  .min(0, 'A bearing runs from 0 to 359°.').lt(360, 'A bearing runs from 0 to 359°.')
const PositionAngle = z.number({ message: 'Enter a position angle in degrees.' })
  .min(-90, 'A position angle runs from -90 to 90°.').max(90, 'A position angle runs from -90 to 90°.')

function unique<T>(values: T[]) {
  return new Set(values).size === values.length
}

// A scan drill's settings, as the instructor saves them and the pass carries them.
export const ScanDrillSettings = z.object({
  startBearing: Bearing,
  endBearing: Bearing,
  mode: z.enum(['surface', 'sky'], { message: 'Choose surface or sky.' }),
  field: z.enum(['binoculars', 'naked-eye'], { message: 'Choose binoculars or naked eye.' }),
  stepDeg: z.number({ message: 'Enter a step in degrees.' }).min(1, 'Use a step of 1 to 20°.').max(20, 'Use a step of 1 to 20°.'),
  dwellMs: z.number({ message: 'Enter a dwell in milliseconds.' }).int('Use whole milliseconds.')
    .min(300, 'Use a dwell of 0.3 to 3 s.').max(3000, 'Use a dwell of 0.3 to 3 s.'),
  contactsPerMinute: z.number({ message: 'Enter contacts per minute.' })
    .min(0.5, 'Use 0.5 to 10 contacts a minute.').max(10, 'Use 0.5 to 10 contacts a minute.'),
  conditions: z.array(z.enum(CONDITIONS, { message: 'Not a known condition.' }))
    .min(1, 'Choose at least one condition.').max(CONDITIONS.length)
    .refine(unique, 'Name each condition once.'),
  categories: z.array(z.enum(SCAN_CATEGORIES, { message: 'Choose aircraft or vessel.' }))
    .min(1, 'Choose at least one category.').max(SCAN_CATEGORIES.length)
    .refine(unique, 'Name each category once.'),
  lengthS: z.number({ message: 'Enter the drill length in seconds.' }).int('Use whole seconds.')
    .min(SCAN_LENGTH_MIN_S, `Use a length of ${SCAN_LENGTH_MIN_S} to ${SCAN_LENGTH_MAX_S} s.`)
    .max(SCAN_LENGTH_MAX_S, `Use a length of ${SCAN_LENGTH_MIN_S} to ${SCAN_LENGTH_MAX_S} s.`),
}).strict()
export type ScanDrillSettingsT = z.infer<typeof ScanDrillSettings>

export const DrillTitle = z.string({ message: 'Enter a title.' }).trim()
  .min(2, 'Use at least 2 characters.').max(80, 'Use at most 80 characters.')

export const ScanDrillBody = z.object({ title: DrillTitle, settings: ScanDrillSettings }).strict()
export const ScanDrillPatch = z.object({ title: DrillTitle.optional(), settings: ScanDrillSettings.optional() }).strict()
export const ScanDrillCrewsBody = z.object({
  crewIds: z.array(Id).max(50).refine(unique, 'Name each crew once.'),
}).strict()

const Ms = z.number().min(0, 'Times count from the start of the pass.').max(SCAN_LENGTH_MAX_S * 1000 + 60_000)

export const ScanSampleInput = z.object({ tMs: Ms, bearing: Bearing, positionAngle: PositionAngle }).strict()

export const ScanReportInput = z.object({
  contactId: z.string().min(1).max(40).nullable(),
  tapAtMs: Ms,
  reportedAtMs: Ms,
  category: z.enum(SCAN_CATEGORIES, { message: 'Choose aircraft or vessel.' }),
  typeName: z.string().trim().max(60, 'Use at most 60 characters.').optional(),
  bearing: Bearing,
  positionAngle: PositionAngle,
  closing: z.enum(SCAN_CLOSING, { message: 'Choose closing, opening or unknown.' }),
}).strict().refine(r => r.reportedAtMs >= r.tapAtMs, 'A report is sent after its tap.')

// Starting a pass: the server draws the seed (a chosen seed only for the practice sector, to
// replay a scene) and keeps the settings the pass runs with.
export const ScanPassStartBody = z.object({
  drillId: z.string({ message: 'Choose a drill, or null for the practice sector.' })
    .min(8, 'Not a valid id.').max(40, 'Not a valid id.').regex(/^[\w-]+$/, 'Not a valid id.').nullable(),
  lengthS: z.number({ message: 'Enter the pass length in seconds.' }).int('Use whole seconds.')
    .min(SCAN_LENGTH_MIN_S, `Use a length of ${SCAN_LENGTH_MIN_S} to ${SCAN_LENGTH_MAX_S} s.`)
    .max(SCAN_LENGTH_MAX_S, `Use a length of ${SCAN_LENGTH_MIN_S} to ${SCAN_LENGTH_MAX_S} s.`).optional(),
  seed: z.number({ message: 'A seed is a whole number.' }).int('A seed is a whole number.')
    .min(0, 'A seed runs from 0 to 4294967295.').max(2 ** 32 - 1, 'A seed runs from 0 to 4294967295.').optional(),
}).strict()
export type ScanPassStartBodyT = z.infer<typeof ScanPassStartBody>

// A pass as the phone sends it: the start it belongs to, the field's samples and the reports.
// The scene, settings and score are the server's; anything else sent along is dropped unread.
export const ScanPassBody = z.object({
  startId: z.string({ message: 'Start the pass first: the server issues each pass its scene and seed.' })
    .min(8, 'Not a valid pass start.').max(40, 'Not a valid pass start.').regex(/^[\w-]+$/, 'Not a valid pass start.'),
  samples: z.array(ScanSampleInput).min(2, 'A pass needs at least two samples of the field.')
    .max(SCAN_MAX_SAMPLES, `A pass holds at most ${SCAN_MAX_SAMPLES} samples.`),
  reports: z.array(ScanReportInput).max(SCAN_MAX_REPORTS, `A pass holds at most ${SCAN_MAX_REPORTS} reports.`),
})
export type ScanPassBodyT = z.infer<typeof ScanPassBody>

export const ScanPassesQuery = z.object({
  userId: Id.optional(),
  limit: z.coerce.number().int().min(1).max(200).optional(),
})

// The free practice sector offered when no drill is assigned (the trade's defaults: 7° field,
// 5° steps, about 1 s a pause; common practice, no source).
export const PRACTICE_SCAN_SETTINGS: ScanDrillSettingsT = {
  startBearing: 0,
  endBearing: 90,
  mode: 'surface',
  field: 'binoculars',
  stepDeg: 5,
  dwellMs: 1000,
  contactsPerMinute: 2,
  conditions: ['sunlit', 'white-cloud', 'haze'],
  categories: ['aircraft', 'vessel'],
  lengthS: 120,
}
