// Schemas of the deck builder's API: decks, their drill settings, target types, uploads.
import { z } from 'zod'
import { ASPECTS } from '../utils/conditions'
import { countOf } from '../utils/count-of'
import { Id } from './auth'

export const DECK_CATEGORIES = ['aircraft', 'vessel', 'mixed'] as const
export const TYPE_CATEGORIES = ['aircraft', 'vessel'] as const
export const AFFILIATIONS = ['friendly', 'hostile', 'neutral'] as const
export const DECK_STATUSES = ['draft', 'published', 'archived'] as const
export const ANSWER_MODES = ['choices', 'typed'] as const
export type AnswerMode = typeof ANSWER_MODES[number]

export type DeckCategory = typeof DECK_CATEGORIES[number]
export type TypeCategory = typeof TYPE_CATEGORIES[number]
export type Affiliation = typeof AFFILIATIONS[number]
export type DeckStatus = typeof DECK_STATUSES[number]

// The features the trade teaches for each category (product.md, "The trade, in short").
export const FEATURE_KEYS = {
  aircraft: ['wings', 'engines', 'fuselage', 'tail'],
  vessel: ['hull', 'superstructure', 'masts', 'armament'],
} as const satisfies Record<TypeCategory, readonly string[]>

export const FEATURE_LABELS: Record<string, string> = {
  wings: 'Wings', engines: 'Engines', fuselage: 'Fuselage', tail: 'Tail',
  hull: 'Hull', superstructure: 'Superstructure', masts: 'Masts', armament: 'Armament',
}

// Bounds of the drill settings; the watch reads these values from the deck.
export const SETTING_BOUNDS = {
  hesitationMs: { min: 300, max: 10_000 },
  windowMs: { min: 1000, max: 30_000 },
  newPerDay: { min: 1, max: 100 },
  retention: { min: 0.7, max: 0.99 },
  choiceCount: { min: 2, max: 6 },
  minExposureMs: { min: 100, max: 4000 },
} as const

const int = (key: keyof typeof SETTING_BOUNDS, unit: string, singular: string) => {
  const { min, max } = SETTING_BOUNDS[key]
  return z.number({ error: `Give a number of ${unit}.` }).int(`Give a whole number of ${unit}.`)
    .min(min, `Use at least ${countOf(min, singular, unit)}.`).max(max, `Use at most ${countOf(max, singular, unit)}.`)
}

export const DeckSettingsPatch = z.object({
  hesitationMs: int('hesitationMs', 'milliseconds', 'millisecond').optional(),
  windowMs: int('windowMs', 'milliseconds', 'millisecond').optional(),
  newPerDay: int('newPerDay', 'introductions a day', 'introduction a day').optional(),
  // The recall target is FSRS's desired retention; people see it as a share, 70 to 99 %.
  retention: z.number({ error: 'Give the recall target as a number between 0.7 and 0.99 (70 to 99 %).' })
    .min(SETTING_BOUNDS.retention.min, 'Use a recall target of at least 0.7 (70 %).')
    .max(SETTING_BOUNDS.retention.max, 'Use a recall target of at most 0.99 (99 %).').optional(),
  choiceCount: int('choiceCount', 'choices', 'choice').optional(),
  answerMode: z.enum(ANSWER_MODES, { error: 'Choose answer buttons (choices) or typed answers (typed).' }).optional(),
  minExposureMs: int('minExposureMs', 'milliseconds', 'millisecond').optional(),
}).strict()
export type DeckSettingsPatch = z.infer<typeof DeckSettingsPatch>

export interface DeckSettings {
  hesitationMs: number
  windowMs: number
  newPerDay: number
  retention: number
  choiceCount: number
  answerMode: typeof ANSWER_MODES[number]
  minExposureMs: number
}

const Title = z.string({ error: 'Give the deck a title.' }).trim().min(2, 'Use at least 2 characters for the title.').max(80, 'Use at most 80 characters for the title.')
const Description = z.string({ error: 'The description must be text.' }).trim().max(1000, 'Use at most 1000 characters for the description.')
const Category = z.enum(DECK_CATEGORIES, { error: 'Choose aircraft, vessel or mixed.' })

export const DeckBody = z.object({
  title: Title,
  description: Description.optional(),
  category: Category,
  settings: DeckSettingsPatch.optional(),
}).strict()

export const DeckPatch = z.object({
  title: Title.optional(),
  description: Description.optional(),
  category: Category.optional(),
  settings: DeckSettingsPatch.optional(),
  status: z.enum(DECK_STATUSES, { error: 'Choose draft, published or archived.' }).optional(),
}).strict()
export type DeckPatch = z.infer<typeof DeckPatch>

export const DeckCrewsBody = z.object({
  crewIds: z.array(Id, { error: 'Give crewIds as a list of crew ids.' }).max(50, 'Assign at most 50 crews.'),
}).strict()

const FeatureText = z.string({ error: 'Describe each feature in words.' }).trim().max(200, 'Use at most 200 characters for a feature.')

export const TargetTypeFields = {
  name: z.string({ error: 'Give the target type a name.' }).trim().min(2, 'Use at least 2 characters for the name.').max(60, 'Use at most 60 characters for the name.'),
  category: z.enum(TYPE_CATEGORIES, { error: 'Choose aircraft or vessel.' }),
  affiliation: z.enum(AFFILIATIONS, { error: 'Choose friendly, hostile or neutral.' }),
  sizeM: z.number({ error: 'Give the size in metres as a number.' }).min(0.5, 'Use a size of at least 0.5 m.').max(500, 'Use a size of at most 500 m.'),
  features: z.record(z.string(), FeatureText, { error: 'Give the features as an object of words.' }),
  lookAlikes: z.array(Id, { error: 'Give look-alikes as a list of target type ids.' }).max(20, 'Name at most 20 look-alikes.'),
}

export const TargetTypeBody = z.object({
  name: TargetTypeFields.name,
  category: TargetTypeFields.category.optional(),
  affiliation: TargetTypeFields.affiliation,
  sizeM: TargetTypeFields.sizeM,
  features: TargetTypeFields.features.optional(),
  lookAlikes: TargetTypeFields.lookAlikes.optional(),
}).strict()
export type TargetTypeBody = z.infer<typeof TargetTypeBody>

export const TargetTypePatch = z.object({
  name: TargetTypeFields.name.optional(),
  category: TargetTypeFields.category.optional(),
  affiliation: TargetTypeFields.affiliation.optional(),
  sizeM: TargetTypeFields.sizeM.optional(),
  features: TargetTypeFields.features.optional(),
  lookAlikes: TargetTypeFields.lookAlikes.optional(),
}).strict()
export type TargetTypePatch = z.infer<typeof TargetTypePatch>

// Using one of the instructor's shared target types in a deck: the deck gets its own row of the
// type's definition, linked to the others (same fields, views uploaded once).
export const TypeLinkBody = z.object({
  targetTypeId: Id,
}).strict()

// Removing a view of a shared target type: from this deck only (the default) or from every deck
// that shares the type.
export const ViewRemoveQuery = z.object({
  everywhere: z.enum(['true', 'false'], { error: 'everywhere: Use true or false.' }).optional(),
}).strict()

/** One shared definition in the instructor's library: the decks that use it, and a row to link from. */
export interface LibraryType {
  id: string
  definitionId: string
  name: string
  category: TypeCategory
  views: number
  decks: { id: string, title: string }[]
}

/** A sentence for a feature record that does not fit its category, or null when it fits. */
export function featuresProblem(category: TypeCategory, features: Record<string, string>): string | null {
  const allowed: readonly string[] = FEATURE_KEYS[category]
  const wrong = Object.keys(features).find(k => !allowed.includes(k))
  return wrong ? `features.${wrong}: For ${category === 'aircraft' ? 'an aircraft' : 'a vessel'} describe ${allowed.join(', ')}.` : null
}

// Fields of the multipart upload besides the files themselves.
export const UploadFields = z.object({
  targetTypeId: Id,
  aspect: z.enum(ASPECTS, { error: `Choose the aspect: ${ASPECTS.join(', ')}.` }),
})

export const UPLOAD_LIMITS = {
  maxFiles: 20,
  maxFileBytes: 15 * 1024 * 1024,
  // All files at their largest plus room for the multipart framing and fields.
  maxRequestBytes: 20 * 15 * 1024 * 1024 + 1024 * 1024,
} as const

export const ImageFileParam = z.object({
  file: z.string().regex(/^[a-f0-9]{64}\.webp$/, 'Not an image name.'),
})

// What the deck builder reads (GET /api/decks/[id]/builder).
export interface BuilderVariant { condition: string, width: number, height: number, bytes: number, contrast: number, url: string }
export interface BuilderView { id: string, aspect: string, width: number, height: number, variants: BuilderVariant[] }
export interface BuilderTargetType {
  id: string
  name: string
  category: TypeCategory
  affiliation: Affiliation
  sizeM: number
  features: Record<string, string>
  lookAlikes: string[]
  views: BuilderView[]
  // The other decks that use the same shared definition (empty when it is this deck's own).
  sharedWith: { id: string, title: string }[]
}
export interface BuilderDeck {
  id: string
  title: string
  description: string
  category: DeckCategory
  status: DeckStatus
  settings: DeckSettings
  drilled: boolean
  crews: { id: string, name: string }[]
  targetTypes: BuilderTargetType[]
}

/** The rule across settings: the hesitation limit must fit inside the answer window. */
export function settingsConflict(s: { hesitationMs?: number, windowMs?: number }): { field: string, message: string } | null {
  if (s.hesitationMs !== undefined && s.windowMs !== undefined && s.hesitationMs >= s.windowMs) {
    return { field: 'settings.hesitationMs', message: 'The hesitation limit must be shorter than the answer window.' }
  }
  return null
}

/** Splits a server message "settings.retention: Use ..." into its field and sentence, for inline errors. */
export function splitFieldError(text: string): { field: string | null, message: string } {
  const m = text.match(/^([\w.]+): (.+)$/s)
  return m ? { field: m[1]!, message: m[2]! } : { field: null, message: text }
}

/** A deck's URL, typed as a plain string so the typed fetch does not take it for /api/decks/builder. */
export function deckUrl(deckId: string): string {
  return `/api/decks/${deckId}`
}
